#!/usr/bin/env bash
# npm start: everything from a fresh clone to a running demo.
set -euo pipefail
source "$(dirname "$0")/lib/bootstrap.sh"

ensure_node_modules
load_local_env
export DB_NAME=faultline NODE_ENV=production DEMO=true MAIL_CATCHER=true
export PORT="${PORT:-3000}" HOST="${HOST:-127.0.0.1}" SMTP_PORT="${SMTP_PORT:-2525}" LOG_LEVEL="${LOG_LEVEL:-info}"
export PUBLIC_URL="${PUBLIC_URL:-http://localhost:$PORT}"

node --import tsx scripts/migrate.ts
node --import tsx scripts/seed.ts
echo "• Building the client…"
node_modules/.bin/vite build --logLevel error

node --import tsx server/index.ts &
SERVER=$!
trap 'kill -TERM $SERVER 2>/dev/null; wait $SERVER 2>/dev/null; exit 0' INT TERM
for _ in $(seq 100); do
  curl -fsS "http://127.0.0.1:$PORT/api/health" >/dev/null 2>&1 && break
  kill -0 $SERVER 2>/dev/null || { echo "The server did not start." >&2; exit 1; }
  sleep 0.2
done
node --import tsx scripts/print-welcome.ts
wait $SERVER
