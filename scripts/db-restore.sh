#!/usr/bin/env bash
# npm run db:restore -- FILE [--force]: loads a dump written by `npm run db:backup` (.sql.gz or
# .sql) into the database named by the environment (same variables as db:backup). Refuses a
# database that already has tables unless --force, which drops them first. Stop the app first.
set -euo pipefail
cd "$(dirname "$0")/.."
export PATH="$PATH:/usr/sbin"
file="" force=false
for arg in "$@"; do
  case "$arg" in
    --force) force=true ;;
    -*) echo "unknown option $arg; usage: npm run db:restore -- FILE [--force]" >&2; exit 2 ;;
    *) file="$arg" ;;
  esac
done
if [ -z "$file" ] || [ ! -f "$file" ]; then
  echo "usage: npm run db:restore -- FILE [--force]   (FILE: a dump from npm run db:backup)" >&2
  exit 2
fi
DB_HOST="${DB_HOST:-127.0.0.1}" DB_PORT="${DB_PORT:-3307}" DB_NAME="${DB_NAME:-duskline}"
export MYSQL_PWD="${DB_PASSWORD:-duskline-local}"
sql() { mariadb --no-defaults --host="$DB_HOST" --port="$DB_PORT" --user="${DB_USER:-duskline}" --default-character-set=utf8mb4 "$@"; }

tables=$(sql -N -B -e "SELECT GROUP_CONCAT(CONCAT('\`', table_name, '\`')) FROM information_schema.tables WHERE table_schema = DATABASE()" "$DB_NAME")
if [ -n "$tables" ] && [ "$tables" != "NULL" ]; then
  if ! $force; then
    echo "[db] $DB_NAME is not empty; restore into an empty database, or pass --force to drop its tables first." >&2
    exit 1
  fi
  echo "[db] --force: dropping the tables of $DB_NAME"
  sql -e "SET FOREIGN_KEY_CHECKS = 0; DROP TABLE $tables;" "$DB_NAME"
fi
case "$file" in
  *.gz) gzip -dc "$file" ;;
  *) cat "$file" ;;
esac | sql "$DB_NAME"
echo "[db] $file restored into $DB_NAME"
