#!/usr/bin/env bash
# npm test: every suite — calc, API (real PostgreSQL), web unit tests, browser end-to-end —
# against a private PostgreSQL cluster of its own that this script starts and stops.
# Ends with the line `tests: N passed, N failed`; exits non-zero on any failure.
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
cd "$repo"

ensure_node_modules
ensure_chromium

export FL_PG_PORT="${FL_TEST_PG_PORT:-54339}"
export FL_PG_DATA="${FL_TEST_PG_DATA:-$repo/.data/pg-test}"
export FL_PG_DB=flueledger_test
export FL_PG_FRESH=1 FL_PG_FSYNC=off
trap 'bash infra/pg.sh stop >/dev/null 2>&1 || true' EXIT
bash infra/pg.sh start
export_db_urls
export NODE_ENV=test LOG_LEVEL=silent TZ=UTC

node --import tsx apps/api/src/cli/migrate.ts
node --import tsx apps/api/src/cli/seed.ts
build_web_if_stale

export FL_TEST_SUMMARY="$repo/.tmp/test-summary.txt"
mkdir -p "$repo/.tmp"; rm -f "$FL_TEST_SUMMARY"
set +e
npx jest -c jest.config.cjs --ci --maxWorkers=2 "$@"
status=$?
set -e
echo
if [ -s "$FL_TEST_SUMMARY" ]; then cat "$FL_TEST_SUMMARY"; else echo "tests: 0 passed, 1 failed"; status=1; fi
exit $status
