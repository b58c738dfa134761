#!/usr/bin/env bash
# npm start: bootstrap what is missing, start PostgreSQL, migrate, seed the demo when empty,
# build the web app, and serve web + API on http://127.0.0.1:${PORT:-3000}. Ctrl-C stops all.
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
cd "$repo"

ensure_node_modules
bash infra/pg.sh start
export_db_urls
trap 'bash infra/pg.sh stop || true' EXIT
node --import tsx apps/api/src/cli/migrate.ts
node --import tsx apps/api/src/cli/seed.ts
build_web_if_stale

export PORT="${PORT:-3000}" HOST="${HOST:-127.0.0.1}" LOG_LEVEL="${LOG_LEVEL:-warn}"
cat <<TXT

FlueLedger is running at http://$HOST:$PORT  (Ctrl-C stops it)
Demo accounts (password: flueledger-demo):
  admin@northmoor.example    admin    — Northmoor Paper Mill Ltd
  officer@northmoor.example  officer  — also auditor at Red Mesa Power Cooperative
  manager@northmoor.example  manager
  auditor@northmoor.example  auditor
  admin@redmesa.example      admin    — Red Mesa Power Cooperative

TXT
node --import tsx apps/api/src/server.ts &
server=$!
trap 'kill $server 2>/dev/null; wait $server 2>/dev/null; bash infra/pg.sh stop || true' EXIT INT TERM
wait $server
