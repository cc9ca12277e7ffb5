#!/usr/bin/env bash
# npm run bench:load: read throughput and latency under load through the served app (issue 8).
# Sets up a private "bench" instance (MariaDB on 3311, fake SMTP on 2527, app on 3392),
# builds and serves the app, runs scripts/bench/load.ts against it, then stops it all.
# Extra arguments go to load.ts (e.g. --duration 5 for a quick run).
# WEB_PROCESSES (default one per core but one) sets the server's app processes, e.g. 2 to compare.
# BENCH_NODE_FLAGS adds flags to the server's node, e.g. BENCH_NODE_FLAGS="--cpu-prof --cpu-prof-dir=.data/prof".
set -euo pipefail
source "$(dirname "$0")/../setup.sh"
setup_instance bench

server_pid=""
cleanup() {
  trap - EXIT INT TERM
  if [ -n "$server_pid" ] && kill -0 "$server_pid" 2>/dev/null; then
    # SIGTERM lets it close (and write a --cpu-prof profile, which can take a while); SIGKILL if it lingers.
    local grace=100
    [[ "${BENCH_NODE_FLAGS:-}" == *--cpu-prof* ]] && grace=600
    kill "$server_pid" 2>/dev/null || true
    for _ in $(seq 1 "$grace"); do kill -0 "$server_pid" 2>/dev/null || break; sleep 0.1; done
    kill -9 "$server_pid" 2>/dev/null || true
    wait "$server_pid" 2>/dev/null || true
  fi
  stop_fake_smtp bench
  bash "$PROJECT_ROOT/db/instance.sh" stop bench >/dev/null || true
}
trap cleanup EXIT INT TERM

log "build"
npm run --silent build >.data/build-bench.log 2>&1 || { cat .data/build-bench.log >&2; exit 1; }

if (exec 3<>"/dev/tcp/127.0.0.1/$PORT") 2>/dev/null; then
  echo "Port $PORT is already in use; stop whatever runs there (npm stop) and retry." >&2
  exit 1
fi
log "serving the build on port $PORT"
# node itself (not a wrapper) so its pid is the server's, for /proc/<pid>/status and CPU time.
# shellcheck disable=SC2086
node ${BENCH_NODE_FLAGS:-} build/http-server.js >.data/serve-bench.log 2>&1 &
server_pid=$!
# Starting takes a second on a quiet machine and over 20 s on a loaded one.
listening=false
for _ in $(seq 1 900); do
  (exec 3<>"/dev/tcp/127.0.0.1/$PORT") 2>/dev/null && { listening=true; break; }
  kill -0 "$server_pid" 2>/dev/null || { cat .data/serve-bench.log >&2; exit 1; }
  sleep 0.1
done
$listening || { echo "The server did not listen on port $PORT within 90 s; see .data/serve-bench.log." >&2; exit 1; }

BENCH_SERVER_PID="$server_pid" tsx scripts/bench/load.ts "$@"
