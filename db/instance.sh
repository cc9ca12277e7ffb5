#!/usr/bin/env bash
# Private MariaDB instance for Duskline: data under the project, loopback only.
# Usage: db/instance.sh start|stop|status [name]   (name: "dev" (default), "test" or "bench")
# Env: DB_PORT (dev 3307, test 3309, bench 3311), DB_NAME, DB_USER, DB_PASSWORD.
set -euo pipefail
cd "$(dirname "$0")/.."
cmd="${1:-start}"
name="${2:-dev}"
case "$name" in
  test) default_port=3309; default_db=duskline_test ;;
  bench) default_port=3311; default_db=duskline_bench ;;
  *) default_port=3307; default_db=duskline ;;
esac
port="${DB_PORT:-$default_port}"
db="${DB_NAME:-$default_db}"
user="${DB_USER:-duskline}"
password="${DB_PASSWORD:-duskline-local}"
root="$PWD/.data/mariadb-$name"
datadir="$root/data"
sock="$root/mariadb.sock"
pidfile="$root/mariadb.pid"
log="$root/mariadb.err"

admin() { mariadb-admin --no-defaults --socket="$sock" --user=root "$@"; }
client() { mariadb --no-defaults --socket="$sock" --user=root "$@"; }
running() { [ -S "$sock" ] && admin ping >/dev/null 2>&1; }

case "$cmd" in
  start)
    if ! command -v mariadbd >/dev/null 2>&1 && [ ! -x /usr/sbin/mariadbd ]; then
      echo "MariaDB server is not installed. Install Debian's package: apt-get install mariadb-server" >&2
      exit 1
    fi
    PATH="$PATH:/usr/sbin"
    mkdir -p "$root"
    if [ ! -d "$datadir/mysql" ]; then
      echo "[db] initialising a private MariaDB in $datadir"
      mariadb-install-db --no-defaults --datadir="$datadir" --auth-root-authentication-method=normal \
        --skip-test-db --user="$(id -un)" >"$root/install.log" 2>&1 || { cat "$root/install.log" >&2; exit 1; }
    fi
    if ! running; then
      userflag=()
      [ "$(id -u)" = "0" ] && userflag=(--user=root)
      setsid mariadbd --no-defaults "${userflag[@]}" --datadir="$datadir" --bind-address=127.0.0.1 \
        --port="$port" --socket="$sock" --pid-file="$pidfile" --log-error="$log" --skip-name-resolve \
        --character-set-server=utf8mb4 --collation-server=utf8mb4_unicode_ci \
        --max-allowed-packet=1G --innodb-buffer-pool-size=256M </dev/null >/dev/null 2>&1 &
      for _ in $(seq 1 100); do running && break; sleep 0.1; done
      if ! running; then echo "[db] MariaDB did not start; see $log" >&2; tail -20 "$log" >&2 || true; exit 1; fi
      echo "[db] MariaDB ($name) listening on 127.0.0.1:$port"
    fi
    client -e "CREATE DATABASE IF NOT EXISTS \`$db\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;
      CREATE USER IF NOT EXISTS '$user'@'127.0.0.1' IDENTIFIED BY '$password';
      CREATE USER IF NOT EXISTS '$user'@'localhost' IDENTIFIED BY '$password';
      GRANT ALL PRIVILEGES ON \`$db\`.* TO '$user'@'127.0.0.1';
      GRANT ALL PRIVILEGES ON \`$db\`.* TO '$user'@'localhost';"
    ;;
  stop)
    PATH="$PATH:/usr/sbin"
    if running; then admin shutdown && echo "[db] MariaDB ($name) stopped"; fi
    ;;
  status)
    PATH="$PATH:/usr/sbin"
    if running; then echo "running on 127.0.0.1:$port"; else echo "stopped"; exit 1; fi
    ;;
  *) echo "usage: $0 start|stop|status [dev|test|bench]" >&2; exit 2 ;;
esac
