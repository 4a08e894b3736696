#!/usr/bin/env bash
# Browser tests drive Debian's Chromium; install it when missing (no browser downloads by test tools).
set -euo pipefail
if [ -x /usr/bin/chromium ]; then exit 0; fi
if [ "$(id -u)" -ne 0 ] || ! command -v apt-get >/dev/null; then
  echo "error: /usr/bin/chromium is missing; install it with: apt-get install -y --no-install-recommends chromium" >&2
  exit 1
fi
echo "› installing chromium from Debian's packages"
export DEBIAN_FRONTEND=noninteractive
apt-get update -qq >/dev/null
apt-get install -y -qq --no-install-recommends chromium >/dev/null
