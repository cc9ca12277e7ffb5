#!/usr/bin/env bash
# Keeps the app running for `npm start`: when the app process dies (a crash, an out-of-memory
# kill, a stray kill -9) it is started again and the log says so; the database and mail catcher
# are left alone. Only SIGTERM stops it, and the app with it; SIGUSR1 means "Ctrl-C was
# pressed" (a background script cannot trap SIGINT; the app got the Ctrl-C itself).
# Usage: scripts/supervise.sh PIDFILE COMMAND [ARGS...]   (PIDFILE holds the app's pid;
# PIDFILE.supervisor this script's own, for npm stop).
set -uo pipefail
pidfile="$1"
shift
log() { printf '\033[1;33m[duskline]\033[0m %s\n' "$*"; }
alive() { kill -0 "$1" 2>/dev/null; }

stopping=false
child=""
stop() {
  stopping=true
  [ -n "$child" ] && alive "$child" || return 0
  # Ctrl-C reaches the app through the process group; give it a moment to stop on its own
  # before a SIGTERM, then 10 s to finish its requests before SIGKILL.
  if [ "$1" = INT ]; then
    for _ in $(seq 1 20); do alive "$child" || return 0; sleep 0.1; done
  fi
  kill -TERM "$child" 2>/dev/null
  for _ in $(seq 1 100); do alive "$child" || return 0; sleep 0.1; done
  log "the app did not stop within 10 s; killing it"
  kill -KILL "$child" 2>/dev/null
}
trap 'stop INT' INT USR1
trap 'stop TERM' TERM
echo $$ >"$pidfile.supervisor"

delay=1
while ! $stopping; do
  started=$SECONDS
  "$@" &
  child=$!
  echo "$child" >"$pidfile.new" && mv "$pidfile.new" "$pidfile" # never seen half-written
  wait "$child"
  status=$?
  # A trapped signal ends `wait` early: wait until the app has really gone.
  while alive "$child"; do
    wait "$child"
    status=$?
  done
  $stopping && break
  # Back off when it keeps dying at once (1, 2, 4 … 30 s); a run of a minute resets the delay.
  if ((SECONDS - started >= 60)); then delay=1; fi
  log "the app stopped unexpectedly (exit status $status); restarting it in $delay s (the database and mail catcher keep running)"
  sleep "$delay" &
  wait $! 2>/dev/null
  delay=$((delay * 2 > 30 ? 30 : delay * 2))
done
rm -f "$pidfile" "$pidfile.supervisor"
