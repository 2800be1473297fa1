#!/usr/bin/env bash
# A full disk: lccsim runs a demo into a 192 kB tmpfs, far too small for its
# waveforms. It must fail with a non-zero exit code and a message that names
# the cause (ENOSPC: "No space left on device"), and leave no half file:
# no temporary file, and every analysis.json present must be whole JSON.
# Needs root to mount the tmpfs; exits 77 (skipped) where mounting is not
# allowed.
#
# Usage: full_disk_test.sh LCCSIM SOURCE_DIR
set -uo pipefail
lccsim=$1
src=$2
work=$(mktemp -d)
cleanup() { umount "$work/disk" 2>/dev/null; rm -rf "$work"; }
trap cleanup EXIT
mkdir -p "$work/disk"
if ! mount -t tmpfs -o size=192k tmpfs "$work/disk" 2>/dev/null; then
  echo "full_disk_test: cannot mount a tmpfs here (needs root); skipped"
  exit 77
fi

"$lccsim" run "$src/circuits/plating_rectifier.lcc" --out "$work/disk/out" >"$work/stdout" 2>"$work/stderr"
code=$?
cat "$work/stdout" "$work/stderr"
fail() { echo "full_disk_test: FAILED: $*"; exit 1; }

[ "$code" -ne 0 ] || fail "exit code 0 on a full disk"
grep -q "No space left on device" "$work/stdout" "$work/stderr" || fail "no message naming the full disk"
partial=$(find "$work/disk" -name '*.partial-*' | wc -l)
[ "$partial" -eq 0 ] || fail "$partial temporary file(s) left"
for f in $(find "$work/disk" -name analysis.json); do
  python3 -c "import json,sys; json.load(open(sys.argv[1]))" "$f" || fail "$f is not whole"
done
for f in $(find "$work/disk" -name 'summary*.json'); do
  python3 -c "import json,sys; json.load(open(sys.argv[1]))" "$f" || fail "$f is not whole"
done
echo "full_disk_test: passed (exit code $code)"
