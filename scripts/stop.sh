#!/usr/bin/env bash
# npm stop: stops what this checkout's npm start or npm test left running. Only processes named
# by pid files under .data/ (checked to run from this checkout), never a search by name, so
# another checkout's server on the same machine is left alone.
set -uo pipefail
source "$(dirname "$0")/setup.sh"
for pidfile in "$PROJECT_ROOT"/.data/app-*.pid; do
  [ -e "$pidfile" ] || continue
  name="$(basename "$pidfile" .pid)"
  stop_pidfile "$pidfile" "app (${name#app-})"
done
for name in dev test bench; do
  stop_fake_smtp "$name"
  bash "$PROJECT_ROOT/db/instance.sh" stop "$name" || true
done
exit 0
