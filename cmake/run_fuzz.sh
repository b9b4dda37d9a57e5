#!/usr/bin/env bash
# Builds the libFuzzer harness tests/fuzz/notation_fuzz.cpp into build-fuzz/ and
# runs it for SECONDS seconds on a seed corpus of the notation examples.
#
#     cmake/run_fuzz.sh 30
#
# Exits non-zero if the build fails or the fuzzer finds a crash, a sanitizer
# report, an unexpected exception or a broken round trip (crash inputs are kept
# in build-fuzz/artifacts/). Environment: CXX_FUZZ (default clang++), FUZZ_JOBS
# (unset: one process).
set -euo pipefail

if [[ $# -ne 1 || ! "$1" =~ ^[0-9]+$ || "$1" -eq 0 ]]; then
  echo "usage: $0 SECONDS   (a whole number of seconds > 0)" >&2
  exit 2
fi
seconds=$1
root=$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)
cd "$root"

out=build-fuzz
cxx=${CXX_FUZZ:-clang++}
mkdir -p "$out/corpus" "$out/seeds" "$out/artifacts"

echo "building $out/notation_fuzz with $cxx"
"$cxx" -std=c++20 -O1 -g -fsanitize=fuzzer,address,undefined -fno-sanitize-recover=all -Iinclude \
  tests/fuzz/notation_fuzz.cpp -o "$out/notation_fuzz"

# Seed corpus: every example of the notation, one file each (the first is empty).
rm -f "$out"/seeds/seed-*
i=0
while IFS= read -r line; do
  printf '%s' "$line" > "$out/seeds/seed-$(printf '%03d' "$i")"
  i=$((i + 1))
done <<'SEEDS'

4.7k
4k7
4K7
470R
4R7
0R1
1M5
2n2
100n
0.1u
0.1uF
100 nF
4.7 kΩ
4.7 kΩ
4.7kohm
10 µs
10 μs
10us
1.5 ms
2.2 V
-12 V
−5 V
38 kHz
38k
4700
4.7e3
R47
47K3
4M7
10p
4n7
1µ0
1u0
2N2
p47
1F5
4k7 ohm
470 ohms
4.7 kOhm
k
4k7k
1..2
4.7k3
-1k
1e999
1e-999
1e-320
nan
inf
4.7p
4.7 xΩ
50 %
0.5
5%
±5 %
+/-5 %
+80/-20%
-20/+80 %
0.5%
B
C
D
F
G
J
K
M
Z
+5 %
100 %
SEEDS

# Tokens the grammar knows, so mutations find them.
cat > "$out/notation.dict" <<'DICT'
"\xce\xa9"
"\xe2\x84\xa6"
"\xc2\xb5"
"\xce\xbc"
"\xc2\xb1"
"\xe2\x88\x92"
"\xc2\xa0"
"\xe2\x80\xaf"
"ohm"
"Ohm"
"ohms"
"Hz"
"e-"
"e+"
"+/-"
"%"
"/"
DICT

echo "fuzzing for $seconds s"
"$out/notation_fuzz" -max_total_time="$seconds" -timeout=10 -print_final_stats=1 \
  -dict="$out/notation.dict" -artifact_prefix="$out/artifacts/" ${FUZZ_JOBS:+-jobs="$FUZZ_JOBS" -workers="$FUZZ_JOBS"} \
  "$out/corpus" "$out/seeds"
