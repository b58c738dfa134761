# Shared shell helpers for infra scripts (sourced, not run).
repo="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"

# npm ci when node_modules is missing or older than the lock file.
ensure_node_modules() {
  if [ ! -f "$repo/node_modules/.package-lock.json" ] || [ "$repo/package-lock.json" -nt "$repo/node_modules/.package-lock.json" ]; then
    echo "[setup] installing npm packages (npm ci)…"
    (cd "$repo" && npm ci --no-audit --no-fund)
  fi
}

# Debian's Chromium for the browser tests (no browser download from elsewhere).
ensure_chromium() {
  if [ ! -x /usr/bin/chromium ]; then
    if [ "$(id -u)" = 0 ] && command -v apt-get >/dev/null; then
      echo "[setup] installing Chromium from Debian (apt-get install -y chromium)…"
      apt-get update -qq >/dev/null 2>&1 || true
      DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium >/dev/null
    else
      echo "[setup] Chromium is missing; install it with: sudo apt-get install -y chromium" >&2
      return 1
    fi
  fi
}

# Export DATABASE_URL / DATABASE_OWNER_URL for the cluster that infra/pg.sh manages.
export_db_urls() {
  eval "$(bash "$repo/infra/pg.sh" url | sed 's/^/export /')"
}

# Build the web app when its sources (or the calc package it uses) are newer than the build.
build_web_if_stale() {
  local index="$repo/dist/web/browser/index.html"
  if [ ! -f "$index" ] || [ -n "$(find "$repo/apps/web" "$repo/packages/calc/src" "$repo/angular.json" -newer "$index" -type f -not -path '*/node_modules/*' -print -quit)" ]; then
    echo "[setup] building the web app…"
    (cd "$repo" && NG_CLI_ANALYTICS=false npx ng build web --configuration production >/dev/null)
  fi
}
