#!/usr/bin/env bash
# npm test: the whole suite (unit, integration against a real MariaDB, browser tests in Debian's
# Chromium) against services of its own, never the demo data:
#   DATA_DIR=.data/test, MariaDB on 127.0.0.1:3317 (fresh database each run), SMTP fake on 2535
#   (mailbox emptied each run), S3 fake on 4579 (emptied each run), the built app on 127.0.0.1:3100.
# Extra arguments go to vitest (e.g. `npm test -- tests/unit/energy.test.ts`).
# Ports: TEST_DB_PORT, TEST_SMTP_PORT, TEST_S3_PORT, TEST_PORT. With DATABASE_URL / SMTP_HOST /
# S3_ENDPOINT set, those servers are used instead (the database is then NOT dropped: it is migrated
# and seeded as it is).
# The last line on stdout is always "N passed, N failed" (a setup failure counts as one failure).
set -euo pipefail
# shellcheck source=lib.sh
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
cd "$ROOT"

T0=$SECONDS
RESULTS="$ROOT/test-results"
mkdir -p "$RESULTS"
find "$RESULTS" -mindepth 1 -delete 2>/dev/null || rm -rf "${RESULTS:?}"/*
SERVICES_LOG="$RESULTS/services.log"
SERVER_LOG="$RESULTS/server.log"
: >"$SERVICES_LOG"

# Isolation from the demo instance: ignore the demo's DATA_DIR, ports and mailbox.
export DATA_DIR="$ROOT/.data/test"
export DB_PORT="${TEST_DB_PORT:-3317}"
export SMTP_FAKE_PORT="${TEST_SMTP_PORT:-2535}"
export S3_FAKE_PORT="${TEST_S3_PORT:-4579}"
export PORT="${TEST_PORT:-3100}"
export HOST=127.0.0.1
export APP_URL="http://localhost:$PORT"
export TEST_BASE_URL="$APP_URL"
export COOKIE_SECURE=false
export THERMOTALLY_ENV=test
export SIGNIN_RATE_LIMIT_PER_ADDRESS=100000
export DB_EXTRA_GRANTS=1 DB_FAST=1
unset MAILBOX_DIR NODE_ENV
USER_DATABASE_URL="${DATABASE_URL:-}"
init_env

SERVER_PID=""
SUMMARY_DONE=0

cleanup() {
  if [ -n "$SERVER_PID" ] && kill -0 "$SERVER_PID" 2>/dev/null; then
    kill -TERM "$SERVER_PID" 2>/dev/null || true
    wait "$SERVER_PID" 2>/dev/null || true
  fi
  SERVER_PID=""
  stop_fakes
  if [ -z "$USER_DATABASE_URL" ]; then dbsh stop || true; fi
}

on_exit() {
  local rc=$?
  trap - EXIT INT TERM
  cleanup >>"$SERVICES_LOG" 2>&1
  if [ "$SUMMARY_DONE" = 0 ]; then
    log "test setup failed or was interrupted (exit $rc); logs in test-results/"
    echo "0 passed, 1 failed"
    [ "$rc" = 0 ] && rc=1
  fi
  exit "$rc"
}
trap on_exit EXIT
trap 'exit 130' INT
trap 'exit 143' TERM

step() { log "$* ($((SECONDS - T0)) s)"; }

if port_open 127.0.0.1 "$PORT"; then
  die "port $PORT is in use (another npm test?); set TEST_PORT"
fi

step "npm packages"
ensure_node_modules
step "chromium"
ensure_chromium

step "services"
# The fakes also exit by themselves if this script is killed hard.
export FAKES_PARENT_PID=$$
rm -rf "$DATA_DIR/mailbox" "$DATA_DIR/s3"
start_db
if [ -z "$USER_DATABASE_URL" ]; then
  dbsh recreate >&2
fi
start_fakes
write_env_file

step "typegen"
npx react-router typegen >&2
step "build"
ensure_build
step "migrate"
npx tsx scripts/migrate.ts up >&2
step "seed"
npx tsx scripts/seed.ts >&2

step "server on $HOST:$PORT"
server_cmd
(NODE_ENV=production exec "${SERVER_CMD[@]}" >"$SERVER_LOG" 2>&1 </dev/null) &
SERVER_PID=$!
if ! wait_http "http://127.0.0.1:$PORT/healthz" 60 "$SERVER_PID"; then
  tail -n 40 "$SERVER_LOG" >&2 || true
  die "the app did not answer on /healthz (log: test-results/server.log)"
fi

step "vitest"
mkdir -p "$RESULTS/tmp"
set +e
TMPDIR="$RESULTS/tmp" npx vitest run --reporter=default --reporter=json \
  --outputFile=test-results/vitest.json "$@"
VITEST_RC=$?
set -e

cleanup >>"$SERVICES_LOG" 2>&1
log "done in $((SECONDS - T0)) s (services stopped; logs in test-results/)"
set +e
SUMMARY="$(node scripts/lib/vitest-summary.mjs test-results/vitest.json "$VITEST_RC")"
SUMMARY_RC=$?
set -e
SUMMARY_DONE=1
printf '%s\n' "$SUMMARY"
exit "$SUMMARY_RC"
