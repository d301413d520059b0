#!/bin/sh
# deps.sh - the Debian packages sinkrate builds and tests with.
#   deps.sh build    check the packages a plain build needs; never installs:
#                    one line naming `make deps` when some are missing (exit 1)
#   deps.sh install  install every missing package (build, tests, figures)
#                    with apt-get as root or through sudo, or say how
set -u
BUILD="build-essential pkg-config libyaml-dev libgsl-dev libjansson-dev libcsv-dev libproj-dev"
# python3 and its libraries: the reference checks of tests/ref/ (make check)
TEST="libcmocka-dev libudunits2-dev libudunits2-data gnuplot-nox valgrind clang libclang-rt-14-dev
      python3 python3-numpy python3-scipy python3-statsmodels python3-fluids"
mode=${1:-install}

missing_of() {
  m=""
  for p in "$@"; do
    dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed" || m="$m $p"
  done
  echo "$m"
}

if ! command -v dpkg-query >/dev/null 2>&1; then
  # not Debian: trust the compiler and pkg-config to say what is missing
  exit 0
fi

case $mode in
  build)
    # shellcheck disable=SC2086
    missing=$(missing_of $BUILD)
    [ -z "$missing" ] && exit 0
    echo "sinkrate: missing Debian packages:$missing; run \`make deps\` (installs them), then make again" >&2
    exit 1 ;;
  install) ;;
  *) echo "usage: deps.sh build|install" >&2; exit 2 ;;
esac

# shellcheck disable=SC2086
missing=$(missing_of $BUILD $TEST)
[ -z "$missing" ] && exit 0

echo "sinkrate: missing Debian packages:$missing"
if [ "$(id -u)" = 0 ]; then
  SUDO=""
elif command -v sudo >/dev/null 2>&1 && sudo -n true 2>/dev/null; then
  SUDO="sudo -n"
else
  echo "sinkrate: run this, then make again:"
  echo "  sudo apt-get update && sudo apt-get install -y$missing"
  exit 1
fi
export DEBIAN_FRONTEND=noninteractive
$SUDO apt-get update -qq >/dev/null || { echo "sinkrate: apt-get update failed"; exit 1; }
# shellcheck disable=SC2086
$SUDO apt-get install -y -qq --no-install-recommends $missing >/dev/null || {
  echo "sinkrate: apt-get install failed; run: sudo apt-get install -y$missing"; exit 1; }
echo "sinkrate: installed$missing"
