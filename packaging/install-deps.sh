#!/usr/bin/env bash
# Installs the Debian packages brinewatch needs, only those missing.
#   install-deps.sh build   compiler, CMake and the libraries
#   install-deps.sh test    the above, plus what the tests use as outside references
# Needs root (or sudo) only when something is missing.
set -euo pipefail

build_packages=(g++ cmake ninja-build pkg-config libboost-dev libspdlog-dev libyaml-cpp-dev
  libpaho-mqttpp-dev libhowardhinnant-date-dev libsqlite3-dev tzdata nlohmann-json3-dev
  libprotobuf-dev protobuf-compiler)
test_packages=(googletest libgtest-dev libgmock-dev libbenchmark-dev python3 python3-numpy
  python3-statsmodels r-cran-spc mosquitto mosquitto-clients openssl)

wanted=("${build_packages[@]}")
if [[ "${1:-build}" == test ]]; then wanted+=("${test_packages[@]}"); fi

missing=()
for package in "${wanted[@]}"; do
  if ! dpkg-query -W -f='${Status}' "$package" 2>/dev/null | grep -q "install ok installed"; then
    missing+=("$package")
  fi
done
if ((${#missing[@]} == 0)); then exit 0; fi

echo "installing Debian packages: ${missing[*]}"
sudo_cmd=()
if [[ $(id -u) -ne 0 ]]; then sudo_cmd=(sudo); fi
export DEBIAN_FRONTEND=noninteractive
"${sudo_cmd[@]}" apt-get update -qq
"${sudo_cmd[@]}" apt-get install -y -qq --no-install-recommends "${missing[@]}" >/dev/null
