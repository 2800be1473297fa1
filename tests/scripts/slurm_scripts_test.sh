#!/usr/bin/env bash
# The Slurm array and merge scripts, run as Slurm would run them (the
# variables it sets, each task in turn), without a Slurm installation: the
# merged summary must equal that of one run of the whole batch.
set -euo pipefail
lccsim=$1
src=$2
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
netlist=$src/circuits/traction_substation_faults.lcc
for i in 0 1 2; do
  SLURM_ARRAY_TASK_COUNT=3 SLURM_ARRAY_TASK_ID=$i SLURM_CPUS_PER_TASK=2 LCCSIM=$lccsim \
    bash "$src/scripts/slurm/lccsim-array.sbatch" "$netlist" "$work/sharded" > /dev/null
done
LCCSIM=$lccsim bash "$src/scripts/slurm/lccsim-merge.sbatch" "$work/sharded" > /dev/null
"$lccsim" run "$netlist" --out "$work/single" --formats csv,json > /dev/null
cmp "$work/sharded/summary.csv" "$work/single/summary.csv"
cmp "$work/sharded/summary.json" "$work/single/summary.json"
echo "sharded and merged = single run"
