#!/usr/bin/env bash
# clang-tidy over the code that ships (parser/, models/, engine/, results/,
# app/) with the checks in .clang-tidy, documented there; any finding fails.
# Uses the compile commands of build/ (scripts/build.sh makes them). About
# five minutes on two cores.
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/setup-deps.sh --hardening
[ -f build/compile_commands.json ] || bash scripts/build.sh
# The parser's files are checked without the static analyser: its path
# search through the Spirit X3 grammar took half a minute a file, and the
# parser is what the sanitised fuzz pass (scripts/test-hardening.sh) works
# hardest, which finds the same class of fault at run time.
parser_files=$(git ls-files 'parser/*.cc')
files=$(git ls-files 'models/*.cc' 'engine/*.cc' 'results/*.cc' 'app/*.cc')
fail() {
  grep -E "warning:|error:" build/clang-tidy.log | sort -u | head -n 100
  echo "lint: clang-tidy found problems (full log: build/clang-tidy.log)"
  exit 1
}
run-clang-tidy-14 -p build -quiet -j "$(nproc)" -checks='-clang-analyzer-*' $parser_files > build/clang-tidy.log 2>&1 || fail
run-clang-tidy-14 -p build -quiet -j "$(nproc)" $files >> build/clang-tidy.log 2>&1 || fail
echo "lint: clang-tidy clean over $(echo $parser_files $files | wc -w) files (the parser's without the static analyser)"
