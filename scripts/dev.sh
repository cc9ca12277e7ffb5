#!/usr/bin/env bash
# npm run dev: the same set-up as npm start, then the Vite dev server with hot reload.
set -euo pipefail
source "$(dirname "$0")/setup.sh"
setup_instance dev
export NODE_ENV=development
cleanup() {
  trap - EXIT INT TERM
  stop_fake_smtp dev
  bash "$PROJECT_ROOT/db/instance.sh" stop dev || true
}
trap cleanup EXIT INT TERM
react-router dev --host 127.0.0.1 --port "$PORT"
