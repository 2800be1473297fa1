#!/usr/bin/env bash
# Builds lccsim and runs the tests labelled `cluster`: the Slurm array job
# on a single-node Slurm installed from Debian and started on localhost
# (needs root or sudo; tests/cluster/slurm_array_test.sh says how).
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/build.sh
ctest --test-dir build --output-on-failure -L cluster
