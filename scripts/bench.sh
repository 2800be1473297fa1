#!/usr/bin/env bash
# Runs every benchmark in bench/ one after another, from the repo root (the
# steady-state benchmark reads circuits/), and ends with the performance
# targets side by side: each benchmark prints its own as a line starting
# with "target:" (bench/bench_run.h, PrintTarget). The full output also goes
# to build/bench.log. Builds first if needed. About half a minute on two
# cores and 650 MB of temporary files (the 500-case study); run it on an
# otherwise idle machine, the timings are wall time.
#
#   bash scripts/bench.sh
set -euo pipefail
cd "$(dirname "$0")/.."
[ -x build/bench_six_pulse ] || bash scripts/build.sh
cmake --build build --target bench_six_pulse bench_six_pulse_thyristor bench_twelve_pulse bench_pulse_scaling \
  bench_steady bench_memory bench_analysis bench_batch bench_study >/dev/null
log=build/bench.log
: > "$log"
status=0
for name in six_pulse six_pulse_thyristor twelve_pulse pulse_scaling steady memory analysis batch study; do
  echo "=== $name" | tee -a "$log"
  ./build/bench_"$name" 2>&1 | tee -a "$log" || { echo "bench_$name failed" | tee -a "$log"; status=1; }
done
echo
echo "performance targets, all from this run:"
grep '^target: ' "$log" | sed 's/^target: /  /'
exit "$status"
