#!/usr/bin/env bash
# The database tests run the same migrations and queries on a real PostgreSQL server as on PGlite.
# Installs Debian's postgresql when its binaries are missing and we are root; otherwise says what to do.
set -euo pipefail
if [ -n "${AIRTALLY_TEST_DATABASE_URL:-}" ]; then exit 0; fi
if compgen -G "/usr/lib/postgresql/*/bin/initdb" >/dev/null || command -v initdb >/dev/null 2>&1; then exit 0; fi
if [ "$(id -u)" = "0" ] && command -v apt-get >/dev/null 2>&1; then
  echo "Installing Debian's postgresql for the database tests…"
  export DEBIAN_FRONTEND=noninteractive
  apt-get update -qq
  apt-get install -y -qq postgresql >/dev/null
  exit 0
fi
echo "The database tests need PostgreSQL server binaries (initdb, pg_ctl)." >&2
echo "Install them as root:  apt-get update && apt-get install -y postgresql" >&2
echo "or point AIRTALLY_TEST_DATABASE_URL at an empty database you own." >&2
exit 1
