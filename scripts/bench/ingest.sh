#!/usr/bin/env bash
# npm run bench:ingest: upload benchmark through the served app (issue 3).
# Sets up a private "bench" instance (MariaDB on 3311, fake SMTP on 2527, app on 3392),
# builds and serves the app, runs scripts/bench/ingest.ts against it, then stops it all.
# Extra arguments go to ingest.ts (e.g. --runs-year 3 --runs-decade 1).
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
for _ in $(seq 1 200); do
  (exec 3<>"/dev/tcp/127.0.0.1/$PORT") 2>/dev/null && break
  kill -0 "$server_pid" 2>/dev/null || { cat .data/serve-bench.log >&2; exit 1; }
  sleep 0.1
done

BENCH_SERVER_PID="$server_pid" tsx scripts/bench/ingest.ts "$@"
