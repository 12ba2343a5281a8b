#!/usr/bin/env bash
# The whole suite: starts its own PostgreSQL, builds the client for the browser tests, runs every vitest project,
# and ends with one line "N passed, N failed" for CI.
set -uo pipefail
cd "$(dirname "$0")/.."
bash server/cli/pg.sh ensure-installed || exit 1
echo "[test] building the client"
npx vite build --logLevel warn || exit 1
mkdir -p tests/artifacts
npx vitest run --reporter=default --reporter=json --outputFile=.vitest-results.json "$@"
status=$?
# A non-zero exit with no failed test means an error outside any test (e.g. an uncaught exception):
# count it as one failure so the closing line never reads clean when the run was not.
VITEST_STATUS=$status node -e '
const fs = require("fs")
try {
  const r = JSON.parse(fs.readFileSync(".vitest-results.json", "utf8"))
  const outside = process.env.VITEST_STATUS !== "0" && r.numFailedTests === 0 ? 1 : 0
  if (outside) console.log("[test] vitest failed outside any test (unhandled error above)")
  console.log(`${r.numPassedTests} passed, ${r.numFailedTests + outside} failed`)
} catch { console.log("0 passed, 1 failed"); process.exitCode = 1 }
'
exit $status
