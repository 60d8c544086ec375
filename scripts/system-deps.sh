#!/usr/bin/env bash
# Installs the Debian libraries that the openseespy Linux build links against (BLAS, LAPACK),
# only when they are missing. Needs root or sudo; otherwise says what to run and fails.
set -euo pipefail
[ "$(uname -s)" = "Linux" ] || exit 0
missing=()
for lib in libblas.so.3 liblapack.so.3; do
    ldconfig -p 2>/dev/null | grep -q "$lib" || missing+=("$lib")
done
[ ${#missing[@]} -eq 0 ] && exit 0
command -v apt-get >/dev/null 2>&1 || {
    echo "framesweep set-up: missing ${missing[*]} (needed by openseespy); install BLAS and LAPACK with your system's package manager." >&2
    exit 1
}
if [ "$(id -u)" -eq 0 ]; then SUDO=""; elif command -v sudo >/dev/null 2>&1; then SUDO="sudo"; else
    echo "framesweep set-up: missing ${missing[*]} (needed by openseespy). Run as root: apt-get install libblas3 liblapack3" >&2
    exit 1
fi
echo "framesweep set-up: installing libblas3 and liblapack3 (needed by openseespy)"
$SUDO apt-get update -qq
DEBIAN_FRONTEND=noninteractive $SUDO apt-get install -y -qq libblas3 liblapack3 >/dev/null
