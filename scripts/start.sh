#!/usr/bin/env bash
# npm start: everything from a fresh clone to a running demo.
set -euo pipefail
source "$(dirname "$0")/lib/bootstrap.sh"

ensure_node_modules
export PORT="${PORT:-3000}" HOST="${HOST:-127.0.0.1}" SMTP_PORT="${SMTP_PORT:-2525}" LOG_LEVEL="${LOG_LEVEL:-info}"
# Fail at once, before the slow steps, when a port we need is taken.
node --import tsx scripts/check-ports.ts PORT="$PORT" SMTP_PORT="$SMTP_PORT"
load_local_env
export DB_NAME=faultline NODE_ENV=production DEMO=true MAIL_CATCHER=true
export PUBLIC_URL="${PUBLIC_URL:-http://localhost:$PORT}"

node --import tsx scripts/migrate.ts
node --import tsx scripts/seed.ts
echo "• Building the client…"
node_modules/.bin/vite build --logLevel error

# The server writes its pid to READY_FILE once it listens: the welcome is printed only when
# this very process answers, never because some other program answers on the port.
export READY_FILE="$PWD/.data/server.ready"
rm -f "$READY_FILE"
node --import tsx server/index.ts &
SERVER=$!
trap 'kill -TERM $SERVER 2>/dev/null; wait $SERVER 2>/dev/null; exit 0' INT TERM
ready=false
for _ in $(seq 300); do
  if ! kill -0 $SERVER 2>/dev/null; then
    code=0; wait $SERVER || code=$?
    echo "The server did not start (exit $code); see the lines above." >&2
    exit $(( code == 0 ? 1 : code ))
  fi
  if [ "$(cat "$READY_FILE" 2>/dev/null)" = "$SERVER" ] && curl -fsS "http://127.0.0.1:$PORT/api/health" >/dev/null 2>&1; then
    ready=true
    break
  fi
  sleep 0.2
done
if [ "$ready" != true ]; then
  echo "The server did not answer on port $PORT within 60 s." >&2
  kill -TERM $SERVER 2>/dev/null
  exit 1
fi
node --import tsx scripts/print-welcome.ts
wait $SERVER
