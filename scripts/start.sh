#!/usr/bin/env bash
# npm start: everything from a fresh machine to a served app; Ctrl-C stops the app and its database.
set -euo pipefail
source "$(dirname "$0")/setup.sh"
setup_instance dev

log "building the app"
react-router build >.data/build.log 2>&1 || { cat .data/build.log >&2; exit 1; }

cleanup() {
  trap - EXIT INT TERM
  log "stopping"
  if [ -n "${server_pid:-}" ] && kill -0 "$server_pid" 2>/dev/null; then
    # Ctrl-C already reached the server through the process group; a second signal would make
    # it try to close twice. Give it a moment, then make sure.
    [ "$1" = INT ] || kill "$server_pid" 2>/dev/null || true
    for _ in $(seq 1 50); do kill -0 "$server_pid" 2>/dev/null || break; sleep 0.1; done
    kill "$server_pid" 2>/dev/null || true
    wait "$server_pid" 2>/dev/null || true
  fi
  rm -f "$PROJECT_ROOT/.data/app-dev.pid"
  stop_fake_smtp dev
  bash "$PROJECT_ROOT/db/instance.sh" stop dev || true
}
trap 'cleanup EXIT' EXIT
trap 'cleanup INT' INT
trap 'cleanup TERM' TERM

# By absolute path: the command line names this checkout, so nothing aimed at another one hits it.
node --import tsx "$PROJECT_ROOT/server.ts" &
server_pid=$!
# npm stop finds the server by this file (never by name: other checkouts may run one too).
echo "$server_pid" >"$PROJECT_ROOT/.data/app-dev.pid"
for _ in $(seq 1 600); do
  (exec 3<>"/dev/tcp/127.0.0.1/$PORT") 2>/dev/null && break
  sleep 0.1
done
cat <<MSG

  Duskline is serving at  http://127.0.0.1:$PORT
  Demo accounts (password: duskline-demo):
    admin@example.com  engineer@example.com  consultant@example.com  manager@example.com
  Local mailbox (invitations, resets; sign in as admin): http://127.0.0.1:$PORT/dev/mail
  Ctrl-C stops the app and its database.

MSG
wait "$server_pid"
