#!/usr/bin/env bash
# The database tests run the same migrations and queries on a real PostgreSQL server as on PGlite.
set -euo pipefail
if [ -n "${AIRTALLY_TEST_DATABASE_URL:-}" ]; then exit 0; fi
if compgen -G "/usr/lib/postgresql/*/bin/initdb" >/dev/null || command -v initdb >/dev/null 2>&1; then exit 0; fi
exec bash "$(dirname "$0")/apt-install.sh" "The database tests" "Or point AIRTALLY_TEST_DATABASE_URL at an empty database you own." postgresql
