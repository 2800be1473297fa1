#!/usr/bin/env bash
# The hardening stage of CI, after the test suite:
#   1. one clang build in build-hardening/ with AddressSanitizer,
#      UndefinedBehaviorSanitizer and libFuzzer's coverage instrumentation
#      (CMake options LCC_SANITIZE and LCC_FUZZ), at -O1 with line tables
#      only (the sanitizers' reports still give file and line; full -g
#      cost a sixth of the build);
#   2. the whole test suite in it (but the `cluster` test): any sanitizer
#      report fails the stage;
#   3. a fuzz pass over parsing and elaboration, LCC_FUZZ_SECONDS long
#      (default 60), seeded with the demos, the malformed-input corpus and
#      the regression corpus. A crash, leak or hang fails the stage; the input
#      is left in build-hardening/fuzz-finds/ to be minimised into
#      tests/fuzz/regressions/ (DEVELOPERS.md).
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/setup-deps.sh --hardening
cmake -S . -B build-hardening -G Ninja -DCMAKE_BUILD_TYPE=Debug -DCMAKE_CXX_COMPILER=clang++-14 \
  -DCMAKE_CXX_FLAGS="-O1" -DCMAKE_CXX_FLAGS_DEBUG="-gline-tables-only" -DLCC_FUZZ=ON >/dev/null
cmake --build build-hardening --target lccsim lccsim_tests fuzz_elaborate -j "$(nproc)"
export ASAN_OPTIONS=detect_leaks=1:abort_on_error=1
export UBSAN_OPTIONS=print_stacktrace=1:halt_on_error=1
ctest --test-dir build-hardening --output-on-failure -j "$(nproc)" -LE cluster
corpus=build-hardening/fuzz-corpus
finds=build-hardening/fuzz-finds
mkdir -p "$corpus" "$finds"
./build-hardening/fuzz_elaborate "$corpus" circuits tests/malformed tests/fuzz/regressions \
  -max_len=8192 -timeout=10 -rss_limit_mb=2048 -max_total_time="${LCC_FUZZ_SECONDS:-60}" \
  -artifact_prefix="$finds/" -print_final_stats=1 2>&1 | tail -n 25
echo "test-hardening: sanitizers clean, fuzz pass found nothing"
