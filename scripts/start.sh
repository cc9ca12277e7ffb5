#!/usr/bin/env bash
# npm start: everything from a fresh machine to a served app; Ctrl-C stops the app and its database.
set -euo pipefail
source "$(dirname "$0")/setup.sh"
setup_instance dev

log "building the app"
npm run --silent build >.data/build.log 2>&1 || { cat .data/build.log >&2; exit 1; }

# The app runs under a supervisor that restarts it if it dies; the database and the mail
# catcher stay up meanwhile. Ctrl-C or SIGTERM stops all three.
cleanup() {
  trap - EXIT INT TERM
  log "stopping"
  if [ -n "${supervisor_pid:-}" ] && kill -0 "$supervisor_pid" 2>/dev/null; then
    # After Ctrl-C (which the app got too) USR1 tells the supervisor not to signal it again.
    if [ "$1" = INT ]; then kill -USR1 "$supervisor_pid" 2>/dev/null || true; else kill -TERM "$supervisor_pid" 2>/dev/null || true; fi
    wait "$supervisor_pid" 2>/dev/null || true
  fi
  rm -f "$PROJECT_ROOT/.data/app-dev.pid"
  stop_fake_smtp dev
  bash "$PROJECT_ROOT/db/instance.sh" stop dev || true
}
trap 'cleanup EXIT' EXIT
trap 'cleanup INT' INT
trap 'cleanup TERM' TERM

# By absolute path: the command line names this checkout, so nothing aimed at another one hits
# it. The supervisor writes the app's pid to .data/app-dev.pid (npm stop finds it there) and its
# own to .data/app-dev.pid.supervisor.
bash "$PROJECT_ROOT/scripts/supervise.sh" "$PROJECT_ROOT/.data/app-dev.pid" node "$PROJECT_ROOT/build/http-server.js" &
supervisor_pid=$!
for _ in $(seq 1 600); do
  (exec 3<>"/dev/tcp/127.0.0.1/$PORT") 2>/dev/null && break
  sleep 0.1
done
cat <<MSG

  Duskline is serving at  http://127.0.0.1:$PORT
  Demo accounts (password: duskline-demo):
    admin@example.com  engineer@example.com  consultant@example.com  manager@example.com
  Local mailbox (invitations, resets; sign in as admin): http://127.0.0.1:$PORT/dev/mail
  If the app process dies it is restarted. Ctrl-C stops the app and its database.

MSG
# `wait` returns when a signal arrives (the trap then runs) or when the supervisor ends.
wait "$supervisor_pid"
