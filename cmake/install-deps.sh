#!/bin/sh
# Installs, from Debian's packages, whatever tauforge's build, tests, benchmarks
# and examples need and this machine lacks; does nothing when all is present.
#   cmake/install-deps.sh          build, test, bench and example dependencies
#                                  (libexpat1-dev and python3 for the command-line tests;
#                                  pybind11-dev, python3-dev and python3-pytest for the
#                                  Python module and its tests)
#   cmake/install-deps.sh --fuzz   also clang and its runtime (libFuzzer)
set -eu

packages="g++ cmake libboost-dev doctest-dev libbenchmark-dev nlohmann-json3-dev libcli11-dev libexpat1-dev python3
  time python3-dev pybind11-dev python3-pytest"
if [ "${1:-}" = "--fuzz" ]; then
  packages="$packages clang libclang-rt-14-dev"
fi

missing=""
for p in $packages; do
  if ! dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed"; then
    missing="$missing $p"
  fi
done
[ -z "$missing" ] && exit 0

if [ "$(id -u)" -ne 0 ]; then
  echo "install-deps: missing Debian packages:$missing; run this script as root (or: sudo apt-get install$missing)" >&2
  exit 1
fi
echo "install-deps: installing$missing" >&2
export DEBIAN_FRONTEND=noninteractive
apt-get update -qq
# shellcheck disable=SC2086
apt-get install -y -qq --no-install-recommends $missing >/dev/null
