#!/usr/bin/env bash
# `npm test`: type check, unit + API suites on a throwaway PostgreSQL, then the browser suite.
# Each vitest run starts and stops its own cluster (tests/setup/global-setup.ts), failing or not.
set -uo pipefail
cd "$(dirname "$0")/.."
mkdir -p test-results

if [ ! -x /usr/bin/chromium ]; then
  echo "[test] installing Debian's chromium for the browser tests (apt-get) …"
  (apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium fonts-dejavu-core) >/tmp/lightkeel-chromium-install.log 2>&1 \
    || { echo "[test] chromium install failed; see /tmp/lightkeel-chromium-install.log"; exit 1; }
fi

if [ ! -x /usr/bin/pdftoppm ]; then
  echo "[test] installing Debian's poppler-utils for the receipt PDF check (apt-get) …"
  (apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq poppler-utils) >/tmp/lightkeel-poppler-install.log 2>&1 \
    || { echo "[test] poppler-utils install failed; see /tmp/lightkeel-poppler-install.log"; exit 1; }
fi

status=0
echo "[test] type check (tsc --noEmit, strict)"
node_modules/.bin/tsc --noEmit -p tsconfig.json || status=1

echo "[test] lint (ESLint with type information, import directions) and format (Prettier)"
node_modules/.bin/eslint . || status=1
node_modules/.bin/prettier --check . || status=1

echo "[test] unit, reference and API suites"
node_modules/.bin/vitest run --reporter=default --reporter=json --outputFile.json=test-results/unit.json || status=1

echo "[test] browser suite (Debian chromium via playwright-core)"
node_modules/.bin/vitest run --config tests/e2e/vitest.config.ts --reporter=default --reporter=json --outputFile.json=test-results/e2e.json || status=1

node -e '
const fs = require("fs");
let passed = 0, failed = 0, skipped = 0;
for (const f of ["test-results/unit.json", "test-results/e2e.json"]) {
  if (!fs.existsSync(f)) { failed++; continue; }
  const r = JSON.parse(fs.readFileSync(f, "utf8"));
  passed += r.numPassedTests; failed += r.numFailedTests + (r.numFailedTestSuites || 0); skipped += r.numPendingTests + (r.numTodoTests || 0);
}
console.log(`\n${passed} passed, ${failed} failed` + (skipped ? `, ${skipped} skipped` : ""));
'
exit $status
