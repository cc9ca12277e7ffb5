#!/usr/bin/env bash
# npm test: the same set-up as npm start against a private test instance, then every test:
# typecheck, unit, integration (real MariaDB, served build) and browser tests (Debian Chromium).
set -euo pipefail
source "$(dirname "$0")/setup.sh"
ensure_debian_package chromium chromium
setup_instance test
# The second app instance of the fault and two-instance tests.
export PORT2="${PORT2:-$((PORT + 10))}"

cleanup() {
  stop_fake_smtp test
  bash "$PROJECT_ROOT/db/instance.sh" stop test >/dev/null || true
}
trap cleanup EXIT

log "typecheck"
npm run --silent typecheck
log "build"
npm run --silent build >.data/build-test.log 2>&1 || { cat .data/build-test.log >&2; exit 1; }
log "tests"
status=0
rm -f .data/vitest-results.json
NO_COLOR=1 vitest run --reporter=default --reporter=json --outputFile.json=.data/vitest-results.json "$@" || status=$?
# A plain closing line that any CI reader understands.
node -e 'const r = require("./.data/vitest-results.json"); console.log(`${r.numPassedTests} passed, ${r.numFailedTests} failed` + (r.numPendingTests ? `, ${r.numPendingTests} skipped` : ""))' 2>/dev/null || true
exit "$status"
