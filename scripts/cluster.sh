#!/usr/bin/env bash
# npm run cluster [-- --nodes N]: the demo as several server processes on loopback — Redis for
# socket.io's adapter, N Faultline processes (default 2) and HAProxy in front of them with
# sticky sessions and websockets. Installs redis-server and haproxy from Debian's packages
# when missing. Ctrl-C stops everything.
set -euo pipefail
source "$(dirname "$0")/lib/bootstrap.sh"

ensure_node_modules
load_local_env
export DB_NAME=faultline NODE_ENV=production DEMO=true
export PORT="${PORT:-3000}" SMTP_PORT="${SMTP_PORT:-2525}" LOG_LEVEL="${LOG_LEVEL:-info}"
export PUBLIC_URL="${PUBLIC_URL:-http://localhost:$PORT}"

node --import tsx scripts/migrate.ts
node --import tsx scripts/seed.ts
echo "• Building the client…"
node_modules/.bin/vite build --logLevel error
exec node --import tsx scripts/cluster.ts "$@"
