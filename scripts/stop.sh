#!/usr/bin/env bash
# npm stop: stops anything npm start or npm test left running.
set -uo pipefail
source "$(dirname "$0")/setup.sh"
pkill -f "node --import tsx server.ts" 2>/dev/null && log "app stopped"
for name in dev test bench; do
  stop_fake_smtp "$name"
  bash "$PROJECT_ROOT/db/instance.sh" stop "$name" || true
done
exit 0
