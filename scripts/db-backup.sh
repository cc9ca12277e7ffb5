#!/usr/bin/env bash
# npm run db:backup: a consistent dump of the database (one snapshot, taken without locking
# writers: --single-transaction) to backups/<database>-<UTC time>.sql.gz.
# Connection from the environment, with the defaults of `npm start`'s database:
# DB_HOST, DB_PORT (3307), DB_NAME (duskline), DB_USER, DB_PASSWORD; BACKUP_DIR (backups).
set -euo pipefail
cd "$(dirname "$0")/.."
export PATH="$PATH:/usr/sbin"
DB_HOST="${DB_HOST:-127.0.0.1}" DB_PORT="${DB_PORT:-3307}" DB_NAME="${DB_NAME:-duskline}"
DB_USER="${DB_USER:-duskline}"
dir="${BACKUP_DIR:-backups}"
mkdir -p "$dir"
file="$dir/$DB_NAME-$(date -u +%Y%m%d-%H%M%S)Z.sql.gz"
n=1
while [ -e "$file" ]; do file="$dir/$DB_NAME-$(date -u +%Y%m%d-%H%M%S)Z-$n.sql.gz"; n=$((n + 1)); done
# Written under a temporary name, renamed when complete: a file in backups/ is always whole.
# The password travels in the environment (MYSQL_PWD), not on the command line.
MYSQL_PWD="${DB_PASSWORD:-duskline-local}" mariadb-dump --no-defaults --host="$DB_HOST" --port="$DB_PORT" \
  --user="$DB_USER" --single-transaction --quick --hex-blob --skip-lock-tables --default-character-set=utf8mb4 \
  "$DB_NAME" | gzip >"$file.partial"
mv "$file.partial" "$file"
echo "[db] backup of $DB_NAME written to $file ($(du -h "$file" | cut -f1))"
