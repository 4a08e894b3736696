#!/usr/bin/env bash
# Debian packages the test suite drives: Chromium for browser tests (never a browser download by a test
# tool) and poppler-utils to render label-sheet PDFs to images. Installed with apt when missing.
set -euo pipefail
need=()
[ -x /usr/bin/chromium ] || need+=(chromium)
command -v pdftoppm >/dev/null || need+=(poppler-utils)
[ ${#need[@]} -eq 0 ] && exit 0
if [ "$(id -u)" -ne 0 ] || ! command -v apt-get >/dev/null; then
  echo "error: missing ${need[*]}; install with: apt-get install -y --no-install-recommends ${need[*]}" >&2
  exit 1
fi
echo "› installing ${need[*]} from Debian's packages"
export DEBIAN_FRONTEND=noninteractive
apt-get update -qq >/dev/null
apt-get install -y -qq --no-install-recommends "${need[@]}" >/dev/null
