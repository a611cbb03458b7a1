#!/usr/bin/env bash
# npm run bench: the same bootstrap as npm test, then every benchmark in scripts/bench/
# (or the ones named: npm run bench -- board). Data goes to the faultline_bench database.
set -euo pipefail
source "$(dirname "$0")/lib/bootstrap.sh"
ensure_node_modules
load_local_env
export NODE_ENV=production LOG_LEVEL=silent
node --import tsx scripts/bench/run.ts "$@"
