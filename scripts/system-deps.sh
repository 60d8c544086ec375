#!/usr/bin/env bash
# Installs the Debian packages framesweep needs, only when they are missing:
#   libblas3, liblapack3  - the openseespy Linux build links against them;
#   chromium              - the browser tests open the report in headless chromium;
#   poppler-utils         - the print test reads the PDF chromium prints (pdftoppm, pdftotext).
# Needs root or sudo; otherwise says what to run and fails.
set -euo pipefail
[ "$(uname -s)" = "Linux" ] || exit 0
missing=()
for lib in libblas.so.3:libblas3 liblapack.so.3:liblapack3; do
    ldconfig -p 2>/dev/null | grep -q "${lib%%:*}" || missing+=("${lib##*:}")
done
command -v chromium >/dev/null 2>&1 || command -v chromium-browser >/dev/null 2>&1 \
    || missing+=(chromium)
command -v pdftotext >/dev/null 2>&1 && command -v pdftoppm >/dev/null 2>&1 \
    || missing+=(poppler-utils)
[ ${#missing[@]} -eq 0 ] && exit 0
command -v apt-get >/dev/null 2>&1 || {
    echo "framesweep set-up: missing ${missing[*]}; install them with your system's package manager." >&2
    exit 1
}
if [ "$(id -u)" -eq 0 ]; then SUDO=""; elif command -v sudo >/dev/null 2>&1; then SUDO="sudo"; else
    echo "framesweep set-up: missing ${missing[*]}. Run as root: apt-get install ${missing[*]}" >&2
    exit 1
fi
echo "framesweep set-up: installing ${missing[*]}"
$SUDO apt-get update -qq
DEBIAN_FRONTEND=noninteractive $SUDO apt-get install -y -qq --no-install-recommends "${missing[@]}" >/dev/null
