#!/usr/bin/env bash
# Playwright drives Debian's Chromium (browser downloads are not possible here).
# Installs it with apt when missing and we are root; otherwise says exactly what to install.
set -euo pipefail
if [ -n "${AIRTALLY_CHROMIUM:-}" ] && [ -x "$AIRTALLY_CHROMIUM" ]; then
  exit 0
fi
if [ -x /usr/bin/chromium ]; then
  exit 0
fi
if [ "$(id -u)" = "0" ] && command -v apt-get >/dev/null 2>&1; then
  echo "Installing Debian's chromium for the end-to-end tests…"
  export DEBIAN_FRONTEND=noninteractive
  apt-get update -qq
  apt-get install -y -qq chromium >/dev/null
  exit 0
fi
echo "The end-to-end tests need Chromium at /usr/bin/chromium." >&2
echo "Install it as root:  apt-get update && apt-get install -y chromium" >&2
echo "(or set AIRTALLY_CHROMIUM to the path of another Chromium build)" >&2
exit 1
