#!/usr/bin/env bash
# Playwright drives Debian's Chromium (browser downloads are not possible here).
set -euo pipefail
if [ -n "${AIRTALLY_CHROMIUM:-}" ] && [ -x "$AIRTALLY_CHROMIUM" ]; then exit 0; fi
if [ -x /usr/bin/chromium ]; then exit 0; fi
exec bash "$(dirname "$0")/../tests/support/apt-install.sh" "The end-to-end tests" "Or set AIRTALLY_CHROMIUM to another Chromium binary." chromium
