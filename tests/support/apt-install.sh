#!/usr/bin/env bash
# Installs Debian packages the tests need when we are root; otherwise says exactly what to run.
# Usage: apt-install.sh "what needs it" "another way, shown when we cannot install" package...
set -euo pipefail
why=$1
alternative=$2
shift 2
if [ "$(id -u)" = "0" ] && command -v apt-get >/dev/null 2>&1; then
  echo "Installing Debian's $* for ${why,}…"
  export DEBIAN_FRONTEND=noninteractive
  apt-get update -qq
  apt-get install -y -qq "$@" >/dev/null
  exit 0
fi
echo "$why need Debian's $*. Install as root:  apt-get update && apt-get install -y $*" >&2
echo "$alternative" >&2
exit 1
