#!/bin/sh
# Designs the fault-LED one-shot of the demo board from the shell: 250 ms ± 20 % on a
# 4.5 V .. 5.5 V rail from -20 °C to +70 °C, E96 resistors and E6 film capacitors
# (±5 %, ±300 ppm/K), and writes what firmware and the lab need:
#   OUTDIR/one_shot.json       the JSON report (every number in SI units with its text)
#   OUTDIR/one_shot.svg        waveform with the worst-case envelope, Monte Carlo histogram
#   OUTDIR/one_shot_timing.h   the timings as C constants (minimum rounded down, maximum up)
#
#   examples/scripts/design_one_shot.sh [OUTDIR]     TAUFORGE=path/to/tauforge (default: on PATH)
#
# Exit status: tauforge's (0 designed, 2 bad input, 3 no design holds the spec).
set -eu
tauforge=${TAUFORGE:-tauforge}
out=${1:-.}
mkdir -p "$out"

"$tauforge" design one-shot \
  --spec pulse-width=250ms,20% \
  --set supply=4.5V..5.5V --set threshold=2/3+-0.02 --temp=-20..70 \
  --resistors E96,10k..1M --capacitors E6,100n..4.7u,5% --part R=50ppm --part C=300ppm \
  --top 3 --samples 20000 \
  --json-file "$out/one_shot.json" --svg "$out/one_shot.svg" \
  --c-header "$out/one_shot_timing.h" --c-prefix FAULT_LED

echo
echo "Firmware constants in $out/one_shot_timing.h:"
grep '_PULSE_WIDTH_M.._US\|_PART_' "$out/one_shot_timing.h"
