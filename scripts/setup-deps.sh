#!/usr/bin/env bash
# Installs the Debian packages lccsim builds against, and nothing else.
# Does nothing (and asks for no network) when every package is present.
set -euo pipefail

packages=(
  cmake g++ ninja-build pkg-config
  libeigen3-dev libsundials-dev libboost-dev
  catch2 libcli11-dev libfmt-dev nlohmann-json3-dev libfftw3-dev
  librsvg2-bin libxml2-utils zlib1g-dev
)

missing=()
for p in "${packages[@]}"; do
  if ! dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed"; then
    missing+=("$p")
  fi
done

if [ ${#missing[@]} -eq 0 ]; then
  echo "setup-deps: all ${#packages[@]} packages present"
  exit 0
fi

echo "setup-deps: installing ${missing[*]}"
SUDO=""
if [ "$(id -u)" -ne 0 ]; then SUDO="sudo"; fi
export DEBIAN_FRONTEND=noninteractive
$SUDO apt-get update -qq
$SUDO apt-get install -y -qq --no-install-recommends "${missing[@]}"
