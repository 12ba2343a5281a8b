#!/usr/bin/env bash
# The whole suite: installs what a fresh Debian machine lacks (PostgreSQL, Chromium, poppler-utils), type-checks,
# checks architecture boundaries, builds the client for the browser tests, runs every vitest project, stops the
# cluster it started, and ends with one line "N passed, N failed" for CI.
set -uo pipefail
cd "$(dirname "$0")/.."
bash server/cli/pg.sh ensure-installed || exit 1
bash tests/support/ensure-browser-tools.sh || exit 1

# Leave the machine as we found it: a cluster this run started is stopped at the end; one already running stays.
cluster_was_running=0
bash server/cli/pg.sh status >/dev/null 2>&1 && cluster_was_running=1
stop_cluster() {
  if [ "$cluster_was_running" = 0 ] && [ -z "${DATABASE_URL:-}" ]; then bash server/cli/pg.sh stop >/dev/null 2>&1 || true; fi
}
trap stop_cluster EXIT

# Static checks count as one failure each in the closing line.
static_failed=0
echo "[test] type-checking (vue-tsc)"
npx vue-tsc --noEmit -p tsconfig.json || { static_failed=$((static_failed + 1)); echo "[test] type errors above count as one failure"; }
echo "[test] architecture boundaries (.dependency-cruiser.cjs)"
if deps_out=$(npx depcruise src server shared --config .dependency-cruiser.cjs --output-type err 2>&1); then
  echo "$deps_out" | tail -n 2
else
  echo "$deps_out" | grep -A4 ' error ' ; echo "$deps_out" | tail -n 2
  static_failed=$((static_failed + 1)); echo "[test] boundary errors above count as one failure"
fi
echo "[test] building the client"
npx vite build --logLevel warn || exit 1
mkdir -p tests/artifacts
npx vitest run --reporter=default --reporter=json --outputFile=.vitest-results.json "$@"
status=$?
[ "$static_failed" -gt 0 ] && status=1
# A non-zero exit with no failed test means an error outside any test (e.g. an uncaught exception):
# count it as one failure so the closing line never reads clean when the run was not.
VITEST_STATUS=$status STATIC_FAILED=$static_failed node -e '
const fs = require("fs")
try {
  const r = JSON.parse(fs.readFileSync(".vitest-results.json", "utf8"))
  const staticChecks = Number(process.env.STATIC_FAILED)
  const outside = process.env.VITEST_STATUS !== "0" && r.numFailedTests === 0 && !staticChecks ? 1 : 0
  if (outside) console.log("[test] vitest failed outside any test (unhandled error above)")
  console.log(`${r.numPassedTests} passed, ${r.numFailedTests + outside + staticChecks} failed`)
} catch { console.log("0 passed, 1 failed"); process.exitCode = 1 }
'
exit $status
