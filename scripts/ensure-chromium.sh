#!/usr/bin/env bash
# Browser tests drive Debian's chromium; never a browser download.
set -euo pipefail
if [ ! -x /usr/bin/chromium ]; then
  echo "tessera: installing Debian's chromium for the browser tests"
  apt-get update -qq
  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium
fi
