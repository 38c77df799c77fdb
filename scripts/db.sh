#!/usr/bin/env bash
# The project's own MariaDB (Debian's mariadb-server), on loopback, without systemd.
#
#   scripts/db.sh start     install mariadb-server if missing, initialise $DATA_DIR/mariadb, start
#                           mariadbd on 127.0.0.1:$DB_PORT, ensure database and app user (idempotent)
#   scripts/db.sh stop      shut it down and wait until the process is gone
#   scripts/db.sh status    "running ..." (exit 0) or "stopped" (exit 3)
#   scripts/db.sh reset     stop, wipe $DATA_DIR/mariadb, start
#   scripts/db.sh recreate  drop and recreate the app database (empty schema; server keeps running)
#   scripts/db.sh url       print the DATABASE_URL for the app user
#   scripts/db.sh sql       a root mariadb shell on the socket (extra args are passed on)
#
# Environment: DATA_DIR (default .data), DB_PORT (default 3307), DB_NAME (default thermotally),
# DB_USER (default thermotally), DB_EXTRA_GRANTS=1 also grants ALL on `DB_NAME\_%`.* (test and
# bench instances: lets tests create throwaway databases), DB_FAST=1 relaxes durability (test and
# bench instances only). When DATABASE_URL is set, every command prints it and does nothing else.
set -euo pipefail
# shellcheck source=lib.sh
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"

cmd="${1:-status}"
shift || true

if [ -n "${DATABASE_URL:-}" ]; then
  log "DATABASE_URL is set: the project starts no MariaDB (scripts/db.sh $cmd does nothing)"
  printf '%s\n' "$DATABASE_URL"
  exit 0
fi

DATA_DIR="$(abspath "${DATA_DIR:-.data}")"
DB_PORT="${DB_PORT:-3307}"
DB_NAME="${DB_NAME:-thermotally}"
DB_USER="${DB_USER:-thermotally}"
DATADIR="$DATA_DIR/mariadb"
PIDFILE="$DATA_DIR/mariadb.pid"
LOGFILE="$DATA_DIR/mariadb.log"
PWFILE="$DATA_DIR/db-password"
SOCK="$DATA_DIR/mariadb.sock"
# A unix socket path must stay under 108 bytes: fall back to /tmp for a deep checkout.
if [ "${#SOCK}" -gt 100 ]; then
  SOCK="/tmp/thermotally-$(printf '%s' "$DATA_DIR" | md5sum | cut -c1-12).sock"
fi

MARIADBD=/usr/sbin/mariadbd

ensure_installed() {
  if [ ! -x "$MARIADBD" ] && ! command -v mariadbd >/dev/null 2>&1; then
    apt_install mariadb-server
  fi
  [ -x "$MARIADBD" ] || MARIADBD="$(command -v mariadbd)"
}

admin() { mariadb-admin --no-defaults --socket="$SOCK" -uroot "$@"; }
sql() { mariadb --no-defaults --socket="$SOCK" -uroot "$@"; }

is_running() {
  pid_alive "$PIDFILE" && admin --connect-timeout=2 ping >/dev/null 2>&1
}

password() {
  if [ ! -s "$PWFILE" ]; then
    mkdir -p "$DATA_DIR"
    (umask 077 && head -c 32 /dev/urandom | base64 | tr -dc 'A-Za-z0-9' | head -c 32 >"$PWFILE")
  fi
  cat "$PWFILE"
}

url() {
  printf 'mariadb://%s:%s@127.0.0.1:%s/%s\n' "$DB_USER" "$(password)" "$DB_PORT" "$DB_NAME"
}

ensure_db_and_user() {
  local pw extra=""
  pw="$(password)"
  if [ "${DB_EXTRA_GRANTS:-0}" = 1 ]; then
    extra="GRANT ALL PRIVILEGES ON \`${DB_NAME//_/\\_}\\_%\`.* TO '$DB_USER'@'127.0.0.1';"
  fi
  sql <<SQL
CREATE DATABASE IF NOT EXISTS \`$DB_NAME\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;
CREATE USER IF NOT EXISTS '$DB_USER'@'127.0.0.1' IDENTIFIED BY '$pw';
ALTER USER '$DB_USER'@'127.0.0.1' IDENTIFIED BY '$pw';
GRANT ALL PRIVILEGES ON \`$DB_NAME\`.* TO '$DB_USER'@'127.0.0.1';
$extra
FLUSH PRIVILEGES;
SQL
}

start() {
  if is_running; then
    log "MariaDB already running (pid $(cat "$PIDFILE"), port $DB_PORT)"
    ensure_db_and_user
    return 0
  fi
  ensure_installed
  if pid_alive "$PIDFILE"; then
    # The process exists but does not answer yet (still starting or shutting down): wait for it.
    log "MariaDB process $(cat "$PIDFILE") exists but does not answer; waiting"
    local i
    for ((i = 0; i < 100; i++)); do is_running && break; sleep 0.2; done
    if is_running; then ensure_db_and_user; return 0; fi
    die "MariaDB (pid $(cat "$PIDFILE")) does not answer; see $LOGFILE or run scripts/db.sh stop"
  fi
  rm -f "$PIDFILE"
  if port_open 127.0.0.1 "$DB_PORT"; then
    die "port $DB_PORT is in use by another server; set DB_PORT, or DATABASE_URL to use that server"
  fi
  mkdir -p "$DATA_DIR"
  if [ ! -d "$DATADIR/mysql" ]; then
    log "initialising $DATADIR"
    rm -rf "$DATADIR"
    mkdir -p "$DATADIR"
    mariadb-install-db --no-defaults --user=root --datadir="$DATADIR" \
      --auth-root-authentication-method=socket --skip-test-db --innodb-log-file-size=16M \
      >"$DATA_DIR/mariadb-install.log" 2>&1 ||
      { tail -n 30 "$DATA_DIR/mariadb-install.log" >&2; die "mariadb-install-db failed"; }
  fi
  local args=(--no-defaults --user=root --datadir="$DATADIR" --port="$DB_PORT"
    --bind-address=127.0.0.1 --skip-name-resolve --socket="$SOCK" --pid-file="$PIDFILE"
    --log-error="$LOGFILE" --innodb-log-file-size=16M
    --character-set-server=utf8mb4 --collation-server=utf8mb4_unicode_ci)
  if [ "${DB_FAST:-0}" = 1 ]; then
    args+=(--innodb-flush-log-at-trx-commit=0 --innodb-doublewrite=0 --sync-binlog=0)
  fi
  log "starting MariaDB on 127.0.0.1:$DB_PORT (data $DATADIR, log $LOGFILE)"
  # setsid: its own session, so Ctrl-C on `npm start` does not reach it.
  setsid "$MARIADBD" "${args[@]}" </dev/null >/dev/null 2>&1 &
  local pid=$! i
  for ((i = 0; i < 300; i++)); do
    if admin --connect-timeout=1 ping >/dev/null 2>&1; then break; fi
    if ! kill -0 "$pid" 2>/dev/null; then
      tail -n 30 "$LOGFILE" >&2 || true
      die "mariadbd exited during start-up (log above, $LOGFILE)"
    fi
    sleep 0.1
  done
  admin --connect-timeout=1 ping >/dev/null 2>&1 || die "MariaDB did not answer within 30 s; see $LOGFILE"
  [ -f "$PIDFILE" ] || echo "$pid" >"$PIDFILE"
  ensure_db_and_user
  log "MariaDB ready (pid $(cat "$PIDFILE"))"
}

stop() {
  if ! pid_alive "$PIDFILE"; then
    rm -f "$PIDFILE"
    log "MariaDB ($DATA_DIR) is not running"
    return 0
  fi
  local pid i
  pid="$(cat "$PIDFILE")"
  log "stopping MariaDB (pid $pid)"
  admin --connect-timeout=2 shutdown >/dev/null 2>&1 || kill -TERM "$pid" 2>/dev/null || true
  # shutdown returns a moment before the process ends: wait until the pid is gone
  for ((i = 0; i < 600; i++)); do
    kill -0 "$pid" 2>/dev/null || break
    sleep 0.1
  done
  if kill -0 "$pid" 2>/dev/null; then
    log "MariaDB did not stop within 60 s; sending SIGKILL"
    kill -KILL "$pid" 2>/dev/null || true
  fi
  rm -f "$PIDFILE"
}

case "$cmd" in
  start) start ;;
  stop) stop ;;
  status)
    if is_running; then
      echo "running (pid $(cat "$PIDFILE"), 127.0.0.1:$DB_PORT, data $DATADIR)"
    else
      echo "stopped"
      exit 3
    fi
    ;;
  reset)
    stop
    log "wiping $DATADIR"
    rm -rf "$DATADIR"
    start
    ;;
  recreate)
    is_running || die "MariaDB is not running; run scripts/db.sh start first"
    sql -e "DROP DATABASE IF EXISTS \`$DB_NAME\`;"
    ensure_db_and_user
    log "database $DB_NAME recreated (empty)"
    ;;
  url) url ;;
  sql) sql "$@" ;;
  *)
    echo "usage: scripts/db.sh start|stop|status|reset|recreate|url|sql" >&2
    exit 2
    ;;
esac
