#!/usr/bin/env bash
# npm stop: stops anything npm start or npm test left running.
set -uo pipefail
source "$(dirname "$0")/setup.sh"
# npm start's supervisor first, or it would start the app again.
supervisor_pidfile="$PROJECT_ROOT/.data/app-dev.pid.supervisor"
if [ -f "$supervisor_pidfile" ] && kill -TERM "$(cat "$supervisor_pidfile")" 2>/dev/null; then
  for _ in $(seq 1 120); do [ -f "$supervisor_pidfile" ] || break; sleep 0.1; done
  log "app supervisor stopped"
fi
pkill -f "node --import tsx server.ts" 2>/dev/null && log "app stopped"
for name in dev test bench; do
  stop_fake_smtp "$name"
  bash "$PROJECT_ROOT/db/instance.sh" stop "$name" || true
done
exit 0
