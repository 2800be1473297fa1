#!/usr/bin/env bash
# Builds lccsim (installing missing packages) and runs the whole test suite,
# but the tests labelled `cluster` (a real Slurm; scripts/test-cluster.sh).
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/build.sh
ctest --test-dir build --output-on-failure -j "$(nproc)" -LE cluster
