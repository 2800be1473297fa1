#!/usr/bin/env bash
# Everything from a fresh Debian machine: installs the packages lccsim needs,
# builds it, runs the demo batch and says where the results are.
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/build.sh
status=0
for netlist in circuits/*.lcc; do
  name=$(basename "$netlist" .lcc)
  echo "== demo: $netlist"
  ./build/lccsim run "$netlist" --out "out/$name" || status=$?
done
echo
echo "lccsim is built: ./build/lccsim --help"
echo "demo results are in $(pwd)/out/ (one folder per demo: base/report.txt, waveforms in CSV, COMTRADE and SVG, and summary.csv/json)"
exit $status
