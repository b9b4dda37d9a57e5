#!/bin/sh
# Builds the benchmarks in Release, runs each bench/*_bench.cpp binary with
# repetitions, and prints one table: for every pair "<name>/baseline" and
# "<name>/<variant>", the ratio baseline time / variant time (median over the
# repetitions, with min and max), then the user counters of every run (first
# repetition; a counter that is a rate inverted, such as time_per_design, is
# in seconds), plus the machine's core count and load; then the performance
# goals with their measured figures (Monte Carlo samples per second per core,
# the worst-case ratios) and the compile time of the umbrella header and of the
# light <tauforge/core.hpp> at -O0 (tests/budget/compile_budget.cmake, CPU time
# when GNU time is installed, 3 compiles each).
#   bench/run.sh [REPETITIONS]        default 5
# Optional environment (defaults in brackets):
#   TAUFORGE_BENCH_DIR         build directory [build/bench]
#   TAUFORGE_BENCH_CMAKE_ARGS  extra configure arguments, e.g. -DCMAKE_CXX_FLAGS_RELEASE='-O2 -DNDEBUG'
#   TAUFORGE_BENCH_JOBS        build jobs [2]
#   TAUFORGE_BENCH_ONLY        binaries to run, e.g. "units_bench scaling_bench" [all]
#   TAUFORGE_BENCH_ARGS        extra arguments for every binary, e.g. --benchmark_min_time=0.05
#   TAUFORGE_BENCH_COMPILE     set: measure the compile time also when TAUFORGE_BENCH_ONLY is set
#   TAUFORGE_BENCH_TIME        auto, cpu or real: which time the ratios use [auto: real time
#                              for runs measured on it or with threads, else CPU time]
set -eu
cd "$(dirname "$0")/.."
reps=${1:-5}
dir=${TAUFORGE_BENCH_DIR:-build/bench}
cmake/install-deps.sh
# The extra arguments may quote: TAUFORGE_BENCH_CMAKE_ARGS="-DCMAKE_CXX_FLAGS_RELEASE='-O2 -DNDEBUG'".
eval "set -- ${TAUFORGE_BENCH_CMAKE_ARGS:-}"
cmake --preset bench -B "$dir" "$@" >/dev/null
targets=""
for t in ${TAUFORGE_BENCH_ONLY:-}; do targets="$targets --target $t"; done
# shellcheck disable=SC2086
cmake --build "$dir" -j "${TAUFORGE_BENCH_JOBS:-2}" $targets >/dev/null
out=$dir/results
mkdir -p "$out"
rm -f "$out"/*.json "$out"/*.txt
for exe in "$dir"/bench/*_bench; do
  name=$(basename "$exe")
  if [ -n "${TAUFORGE_BENCH_ONLY:-}" ]; then
    case " $TAUFORGE_BENCH_ONLY " in *" $name "*) ;; *) continue ;; esac
  fi
  echo "running $name ..." >&2
  # shellcheck disable=SC2086
  "$exe" --benchmark_repetitions="$reps" --benchmark_report_aggregates_only=false \
         --benchmark_format=console --benchmark_out_format=json \
         --benchmark_out="$out/$name.json" ${TAUFORGE_BENCH_ARGS:-} >"$out/$name.txt"
done
time_kind=${TAUFORGE_BENCH_TIME:-auto}
echo "machine: $(nproc) cores, load average $(cut -d' ' -f1-3 /proc/loadavg 2>/dev/null || echo unknown);" \
     "ratio = baseline time / variant time (> 1: the variant is faster); time: $time_kind"
cmake -DRESULTS="$out" -DTIME="$time_kind" -DCOUNTERS=ON -P bench/ratios.cmake 2>&1 | awk '
  function scale(u) { return u == "ns" ? 1 : u == "us" ? 1e3 : u == "ms" ? 1e6 : 1e9 }
  { n = split($1, part, "/"); variant = part[n]; pair = substr($1, 1, length($1) - length(variant) - 1)
    k = ++count[$1]; t[$1, k] = $2 * scale($3)
    for (f = 4; f <= NF; f++) { split($f, kv, "="); if (kv[1] == "samples_per_s") sps[$1, k] = kv[2] }
    if (k == 1 && NF > 3) {
      c = ""; for (f = 4; f <= NF; f++) { split($f, kv, "="); c = c sprintf(" %s=%.4g", kv[1], kv[2]) }
      counters[$1] = c; corder[++ncount] = $1 }
    if (variant != "baseline" && !(($1) in seen)) { seen[$1] = 1; order[++runs] = $1; pairof[$1] = pair } }
  END {
    printf "%-58s %10s %10s %10s\n", "pair / variant", "median", "min", "max"
    for (i = 1; i <= runs; i++) {
      run = order[i]; base = pairof[run] "/baseline"
      if (!(base in count)) continue
      m = count[run] < count[base] ? count[run] : count[base]
      for (k = 1; k <= m; k++) r[k] = t[base, k] / t[run, k]
      for (a = 1; a <= m; a++) for (b = a + 1; b <= m; b++) if (r[b] < r[a]) { x = r[a]; r[a] = r[b]; r[b] = x }
      med = m % 2 ? r[(m + 1) / 2] : (r[m / 2] + r[m / 2 + 1]) / 2
      printf "%-58s %10.3g %10.3g %10.3g\n", pairof[run] " / " substr(run, length(pairof[run]) + 2), med, r[1], r[m]
      ratio[run] = med
    }
    if (ncount > 0) {
      printf "\ncounters (first repetition)\n"
      for (i = 1; i <= ncount; i++) printf "%-58s%s\n", corder[i], counters[corder[i]]
    }
    printf "\ngoals (medians)\n"
    goal_rate("mc_one_shot_normal/moments", "Monte Carlo one-shot, normal parameters")
    goal_rate("mc_one_shot_uniform/moments", "Monte Carlo one-shot, uniform parameters")
    goal_ratio("mc_block_normal/moments", 0.67, "Monte Carlo normal, raw block loop time / monte_carlo time (>= 0.67: within 1.5x)")
    goal_ratio("mc_block_uniform/moments", 0.67, "Monte Carlo uniform, raw block loop time / monte_carlo time (>= 0.67)")
    goal_ratio("mc_one_shot_normal/moments", 0.67, "Monte Carlo normal, raw sample-by-sample loop / monte_carlo (>= 0.67)")
    goal_ratio("one_shot_bounds/metric_bounds", 0.95, "one-shot worst case: hand-written corner loop / metric_bounds (>= 0.95)")
    goal_ratio("one_shot_worst_case/worst_case", 0, "one-shot worst_case: full search / worst_case (the scan shortcuts)")
    goal_ratio("oscillator_worst_case/worst_case", 0, "oscillator worst_case: full search / worst_case (declared monotone)")
  }
  function goal_rate(run, what,   k, n, v, a, b, x, med) {
    n = 0
    for (k = 1; k <= count[run]; k++) if ((run, k) in sps) v[++n] = sps[run, k]
    if (n == 0) return
    for (a = 1; a <= n; a++) for (b = a + 1; b <= n; b++) if (v[b] < v[a]) { x = v[a]; v[a] = v[b]; v[b] = x }
    med = n % 2 ? v[(n + 1) / 2] : (v[n / 2] + v[n / 2 + 1]) / 2
    printf "  %-88s %6.1f M samples/s/core (goal >= 50 M): %s\n", what, med / 1e6, (med >= 50e6 ? "met" : "missed")
  }
  function goal_ratio(run, goal, what) {
    if (!(run in ratio)) return
    if (goal > 0) printf "  %-88s %6.3g: %s\n", what, ratio[run], (ratio[run] >= goal ? "met" : "missed")
    else printf "  %-88s %6.3g\n", what, ratio[run]
  }'
# Compile time of the headers (only when every benchmark ran: the figure wants a quiet machine).
if [ -z "${TAUFORGE_BENCH_ONLY:-}" ] || [ -n "${TAUFORGE_BENCH_COMPILE:-}" ]; then
  cxx=$(sed -n 's/^CMAKE_CXX_COMPILER:[A-Z]*=//p' "$dir/CMakeCache.txt")
  time_exe=$(command -v /usr/bin/time || true)
  clock=wall; [ -n "$time_exe" ] && clock=cpu
  echo
  echo "compile time at -O0 ($clock clock; median of 3; machine load $(cut -d' ' -f1 /proc/loadavg 2>/dev/null || echo unknown)):"
  for h in tauforge/tauforge.hpp:1.5 tauforge/core.hpp:0.75; do
    cmake -DCXX="$cxx" -DHEADER="${h%%:*}" -DINCLUDE_DIRS="$PWD/include" -DBUDGET="${h##*:}" -DCLOCK=$clock \
          -DTIME_EXE="$time_exe" -DREPEAT=3 -DWORK_DIR="$out" -P tests/budget/compile_budget.cmake 2>&1 |
      sed -n "s/^  $clock: .*<\(.*\)> .* extra \([0-9.]*\) s\$/  <\1> adds \2 s (goal < ${h##*:} s)/p"
  done
fi
