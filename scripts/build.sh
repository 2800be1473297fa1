#!/usr/bin/env bash
# Configures and builds lccsim in build/: optimised (-O2), with line-level
# debug info only (-g1: function names and line tables, enough for a
# backtrace or a profile by line, not for stepping through locals). Full -g
# took a quarter of the compile time (CI's budget); a debugging session can
# reconfigure with -DCMAKE_CXX_FLAGS_RELWITHDEBINFO="-O2 -g -DNDEBUG".
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/setup-deps.sh
cmake -S . -B build -G Ninja -DCMAKE_BUILD_TYPE=RelWithDebInfo \
  -DCMAKE_CXX_FLAGS_RELWITHDEBINFO="-O2 -g1 -DNDEBUG" >/dev/null
cmake --build build -j "$(nproc)"
