#!/usr/bin/env bash
# Installs the Debian packages lccsim needs, at the exact versions listed in
# scripts/debian-packages.txt, and nothing else (no recommended packages).
# Does nothing, and asks for no network, when they are all present.
#
#   bash scripts/setup-deps.sh              the build and test-suite packages
#   bash scripts/setup-deps.sh --hardening  also clang, its sanitizer and
#                                           fuzzer runtime, and clang-tidy
#
# A package already installed at another version (say, by a Debian point
# release on this machine) is left as it is, with a warning naming both
# versions: the machine's own packages are not downgraded behind its back.
set -euo pipefail
cd "$(dirname "$0")/.."

stages="build"
if [ "${1:-}" = "--hardening" ]; then stages="build hardening"; fi

missing=()
count=0
while read -r name version stage; do
  case "$name" in ''|'#'*) continue ;; esac
  case " $stages " in *" $stage "*) ;; *) continue ;; esac
  count=$((count + 1))
  installed=$(dpkg-query -W -f='${Status} ${Version}' "$name" 2>/dev/null || true)
  case "$installed" in
    "install ok installed $version") ;;
    "install ok installed "*)
      echo "setup-deps: warning: $name is installed at ${installed#install ok installed }, not the listed $version" >&2 ;;
    *) missing+=("$name=$version") ;;
  esac
done < scripts/debian-packages.txt

if [ ${#missing[@]} -eq 0 ]; then
  echo "setup-deps: all $count packages present"
  exit 0
fi

echo "setup-deps: installing ${missing[*]}"
SUDO=""
if [ "$(id -u)" -ne 0 ]; then SUDO="sudo"; fi
export DEBIAN_FRONTEND=noninteractive
$SUDO apt-get update -qq
$SUDO apt-get install -y -qq --no-install-recommends "${missing[@]}"
