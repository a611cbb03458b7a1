#!/usr/bin/env bash
# npm test: the same bootstrap as npm start against a separate test database, then every check.
# Ends with one line "N passed, N failed" and a non-zero exit on any failure.
set -uo pipefail
source "$(dirname "$0")/lib/bootstrap.sh"
set -e
ensure_node_modules
ensure_chromium
load_local_env
set +e
export DB_NAME=faultline_test NODE_ENV=test LOG_LEVEL="${LOG_LEVEL:-silent}"
mkdir -p test-results

failed_checks=0
step() { # name, command...
  local name=$1; shift
  echo "• $name…"
  if "$@"; then echo "  $name: ok"; else echo "  $name: FAILED"; failed_checks=$((failed_checks + 1)); fi
}

step typecheck npx tsc -p tsconfig.json --noEmit
step lint npx eslint . --max-warnings=0
step format npx prettier --check . --log-level warn
step build node_modules/.bin/vite build --logLevel error

echo "• vitest (unit, reference, integration, browser)…"
node --import tsx scripts/reset-test-db.ts
npx vitest run --reporter=default --reporter=json --outputFile=test-results/vitest.json "$@"
vitest_exit=$?

node -e '
  const fs = require("fs");
  let passed = 0, failed = 0, skipped = 0;
  try {
    const r = JSON.parse(fs.readFileSync("test-results/vitest.json", "utf8"));
    passed = r.numPassedTests; failed = r.numFailedTests; skipped = r.numPendingTests + (r.numTodoTests || 0);
    // A file that failed to load has no tests but counts as a failure.
    for (const f of r.testResults) if (f.status === "failed" && f.assertionResults.length === 0) failed++;
  } catch { failed++; }
  const checksFailed = Number(process.argv[1]);
  const vitestExit = Number(process.argv[2]);
  if (vitestExit !== 0 && failed === 0) failed++;
  console.log("");
  console.log(`${passed} passed, ${failed + checksFailed} failed` + (skipped ? `, ${skipped} skipped` : ""));
  process.exit(failed + checksFailed > 0 ? 1 : 0);
' "$failed_checks" "$vitest_exit"
