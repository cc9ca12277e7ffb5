#!/usr/bin/env bash
# Shared set-up for `npm start` and `npm test` (sourced, not run):
#   setup_instance dev|test|bench  — system packages, node_modules, private MariaDB, fake SMTP, migrations, seed.
# Idempotent: a second run reuses what is there.

PROJECT_ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
export PATH="$PROJECT_ROOT/node_modules/.bin:$PATH:/usr/sbin"

log() { printf '\033[1;33m[duskline]\033[0m %s\n' "$*"; }

# Installs a Debian package when its command is missing (root only; otherwise says what to install).
ensure_debian_package() {
  local command="$1" package="$2"
  if command -v "$command" >/dev/null 2>&1; then return 0; fi
  if [ "$(id -u)" != "0" ]; then
    echo "Missing '$command'. Install Debian's package first:  sudo apt-get install $package" >&2
    exit 1
  fi
  log "installing $package from Debian's packages"
  if [ -z "${DUSKLINE_APT_UPDATED:-}" ]; then
    DEBIAN_FRONTEND=noninteractive apt-get update -qq >/dev/null
    export DUSKLINE_APT_UPDATED=1
  fi
  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends "$package" >/dev/null
}

ensure_node_modules() {
  cd "$PROJECT_ROOT"
  # npm ci when node_modules is missing or older than the lockfile.
  if [ ! -f node_modules/.package-lock.json ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
    log "installing npm packages (npm ci)"
    npm ci --no-audit --no-fund --loglevel=error
  fi
}

# Starts the fake SMTP server for this instance unless it already runs.
start_fake_smtp() {
  local name="$1" pidfile="$PROJECT_ROOT/.data/smtp-$1.pid"
  mkdir -p "$MAIL_DIR"
  if [ -f "$pidfile" ] && kill -0 "$(cat "$pidfile")" 2>/dev/null; then return 0; fi
  setsid node --import tsx "$PROJECT_ROOT/scripts/fake-smtp.ts" >"$PROJECT_ROOT/.data/smtp-$name.log" 2>&1 </dev/null &
  echo $! >"$pidfile"
  for _ in $(seq 1 50); do
    grep -q "fake SMTP" "$PROJECT_ROOT/.data/smtp-$name.log" 2>/dev/null && return 0
    sleep 0.1
  done
  echo "The fake SMTP server did not start; see .data/smtp-$name.log" >&2
  cat "$PROJECT_ROOT/.data/smtp-$name.log" >&2
  exit 1
}

# True when the process still runs from this checkout (a recycled pid belongs to something else).
started_here() {
  local pid="$1"
  kill -0 "$pid" 2>/dev/null || return 1
  [ -d /proc ] || return 0
  [ "$(readlink "/proc/$pid/cwd" 2>/dev/null)" = "$PROJECT_ROOT" ]
}

# Stops the process named by a pid file under .data/ (TERM, then KILL after 5 s) and removes the
# file. Only pid files: never a process found by name, which may be another checkout's.
stop_pidfile() {
  local pidfile="$1" what="$2" pid
  [ -f "$pidfile" ] || return 0
  pid="$(cat "$pidfile")"
  if [[ "$pid" =~ ^[0-9]+$ ]] && started_here "$pid"; then
    kill "$pid" 2>/dev/null || true
    for _ in $(seq 1 50); do kill -0 "$pid" 2>/dev/null || break; sleep 0.1; done
    kill -0 "$pid" 2>/dev/null && kill -KILL "$pid" 2>/dev/null
    log "$what stopped"
  fi
  rm -f "$pidfile"
}

stop_fake_smtp() {
  stop_pidfile "$PROJECT_ROOT/.data/smtp-$1.pid" "fake SMTP ($1)" >/dev/null
}

setup_instance() {
  local name="$1"
  cd "$PROJECT_ROOT"
  mkdir -p .data
  ensure_debian_package mariadbd mariadb-server
  ensure_node_modules

  if [ "$name" = "test" ]; then
    export NODE_ENV=production DB_PORT="${DB_PORT:-3309}" DB_NAME="${DB_NAME:-duskline_test}"
    export SMTP_PORT="${SMTP_PORT:-2526}" MAIL_DIR="$PROJECT_ROOT/.data/mail-test" PORT="${PORT:-3390}"
    # Tests send X-Forwarded-For to give each test its own address for the sign-in limits.
    export TRUST_PROXY=true
    # One app process (tests that stop or kill the app watch one pid; the cluster has its own
    # test), and webhook retries within the test's patience.
    export WEB_PROCESSES="${WEB_PROCESSES:-1}" WEBHOOK_RETRY_BASE_MS="${WEBHOOK_RETRY_BASE_MS:-300}" WEBHOOK_POLL_MS="${WEBHOOK_POLL_MS:-200}"
    # Every test file shares the demo accounts; the API limit test gives its own key a low limit.
    export API_RATE_LIMIT_PER_MINUTE="${API_RATE_LIMIT_PER_MINUTE:-1000000}"
  elif [ "$name" = "bench" ]; then
    export NODE_ENV=production DB_PORT="${DB_PORT:-3311}" DB_NAME="${DB_NAME:-duskline_bench}"
    export SMTP_PORT="${SMTP_PORT:-2527}" MAIL_DIR="$PROJECT_ROOT/.data/mail-bench" PORT="${PORT:-3392}"
    # The load benchmark measures the server, not the per-key request limit.
    export API_RATE_LIMIT_PER_MINUTE="${API_RATE_LIMIT_PER_MINUTE:-1000000}"
  else
    export NODE_ENV=production DB_PORT="${DB_PORT:-3307}" DB_NAME="${DB_NAME:-duskline}"
    export SMTP_PORT="${SMTP_PORT:-2525}" MAIL_DIR="$PROJECT_ROOT/.data/mail" PORT="${PORT:-3000}"
  fi
  export DB_HOST=127.0.0.1 DB_USER="${DB_USER:-duskline}" DB_PASSWORD="${DB_PASSWORD:-duskline-local}" DUSKLINE_LOCAL=true
  export APP_URL="${APP_URL:-http://127.0.0.1:$PORT}"
  if [ ! -f .data/session-secret ]; then head -c 32 /dev/urandom | base64 >.data/session-secret; fi
  export SESSION_SECRET="${SESSION_SECRET:-$(cat .data/session-secret)}"

  bash db/instance.sh start "$name"
  if [ "$name" = "test" ] || [ "$name" = "bench" ]; then
    # Every test or benchmark run starts from an empty database and mailbox.
    mariadb --no-defaults --socket="$PROJECT_ROOT/.data/mariadb-$name/mariadb.sock" --user=root \
      -e "DROP DATABASE IF EXISTS \`$DB_NAME\`; CREATE DATABASE \`$DB_NAME\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;"
    rm -rf "$MAIL_DIR"
  fi
  start_fake_smtp "$name"
  tsx scripts/db.ts migrate
  tsx scripts/db.ts seed
}
