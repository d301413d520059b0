#!/bin/sh
# deps.sh - make sure the Debian packages sinkrate builds and tests with are
# present; install them with apt-get (as root or through sudo) or say how.
set -u
PKGS="build-essential pkg-config libyaml-dev libgsl-dev libjansson-dev libcsv-dev libcmocka-dev libudunits2-dev libudunits2-data gnuplot-nox valgrind clang libclang-rt-14-dev"

missing=""
for p in $PKGS; do
  dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed" || missing="$missing $p"
done
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
