#!/usr/bin/env bash
# npm run dev: Vite's dev server (http://localhost:5173) with the API behind its proxy;
# the API server restarts on change (tsx watch).
set -euo pipefail
source "$(dirname "$0")/lib/bootstrap.sh"
ensure_node_modules
export PORT="${PORT:-3000}" SMTP_PORT="${SMTP_PORT:-2525}"
node --import tsx scripts/check-ports.ts PORT="$PORT" SMTP_PORT="$SMTP_PORT"
load_local_env
export DB_NAME=faultline NODE_ENV=development DEMO=true MAIL_CATCHER=true
export PUBLIC_URL="${PUBLIC_URL:-http://localhost:5173}"
node --import tsx scripts/migrate.ts
node --import tsx scripts/seed.ts
node_modules/.bin/tsx watch --clear-screen=false server/index.ts &
API=$!
trap 'kill $API 2>/dev/null' EXIT
node_modules/.bin/vite --port 5173 --strictPort
