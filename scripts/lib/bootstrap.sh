#!/usr/bin/env bash
# Shared first steps of `npm start`, `npm test` and `npm run dev`: dependencies, database, secrets.
# Sourced, not run.
cd "$(dirname "${BASH_SOURCE[0]}")/../.."
export PATH="$PATH:/usr/sbin:/usr/local/sbin:/sbin"

ensure_node_modules() {
  # Install when node_modules is missing or older than the lock file.
  if [ ! -f node_modules/.package-lock.json ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
    echo "• Installing npm dependencies…"
    npm ci --no-audit --no-fund --loglevel=error
  fi
}

ensure_chromium() {
  if [ -x /usr/bin/chromium ]; then return; fi
  echo "• Installing Chromium from Debian's packages for the browser tests (one time)…"
  if [ "$(id -u)" = 0 ]; then S=(); else S=(sudo); fi
  "${S[@]}" apt-get update -qq
  "${S[@]}" env DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends chromium fonts-dejavu-core >/dev/null
}

load_local_env() {
  bash scripts/db.sh ensure
  set -a
  # shellcheck disable=SC1091
  . .data/secrets.env
  set +a
  export DB_HOST=127.0.0.1 DB_PORT="${DB_PORT:-3307}" DB_USER=faultline
}
