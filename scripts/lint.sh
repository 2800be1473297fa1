#!/usr/bin/env bash
# clang-tidy over the code that ships (parser/, models/, engine/, results/,
# app/) with the checks in .clang-tidy, documented there; any finding fails.
# Uses the compile commands of build/ (scripts/build.sh makes them). About
# five minutes on two cores.
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/setup-deps.sh --hardening
[ -f build/compile_commands.json ] || bash scripts/build.sh
files=$(git ls-files 'parser/*.cc' 'models/*.cc' 'engine/*.cc' 'results/*.cc' 'app/*.cc')
run-clang-tidy-14 -p build -quiet -j "$(nproc)" $files > build/clang-tidy.log 2>&1 || {
  grep -E "warning:|error:" build/clang-tidy.log | sort -u | head -n 100
  echo "lint: clang-tidy found problems (full log: build/clang-tidy.log)"
  exit 1
}
echo "lint: clang-tidy clean over $(echo "$files" | wc -w) files"
