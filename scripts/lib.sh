# shellcheck shell=bash
# Shared functions for scripts/*.sh. Source it; do not run it.
#   source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
#
# Everything here logs to stderr so that stdout stays free for a command's real output
# (db.sh url, the test summary line).

ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
export ROOT

log() { printf '[thermotally] %s\n' "$*" >&2; }
die() { printf '[thermotally] error: %s\n' "$*" >&2; exit 1; }

# Absolute path for a path relative to the repository root.
abspath() {
  case "$1" in
    /*) printf '%s\n' "$1" ;;
    *) printf '%s\n' "$ROOT/$1" ;;
  esac
}

# --- apt ----------------------------------------------------------------------------------------
_APT_UPDATED=0
apt_install() {
  [ "$(id -u)" = 0 ] || die "need root to apt-get install $* (or install it yourself)"
  if [ "$_APT_UPDATED" = 0 ]; then
    log "apt-get update"
    DEBIAN_FRONTEND=noninteractive apt-get -o DPkg::Lock::Timeout=600 update -qq >&2
    _APT_UPDATED=1
  fi
  log "apt-get install -y $*"
  DEBIAN_FRONTEND=noninteractive apt-get -o DPkg::Lock::Timeout=600 install -y -qq "$@" >&2
}

# --- npm ----------------------------------------------------------------------------------------
# npm ci when node_modules is missing or package-lock.json is newer than the installed tree.
ensure_node_modules() {
  local marker="$ROOT/node_modules/.package-lock.json"
  if [ ! -f "$marker" ] || [ "$ROOT/package-lock.json" -nt "$marker" ]; then
    log "installing npm packages (npm ci)"
    (cd "$ROOT" && npm ci --no-audit --no-fund >&2)
    touch "$marker"
  fi
}

# --- chromium -----------------------------------------------------------------------------------
ensure_chromium() {
  [ -x /usr/bin/chromium ] || apt_install chromium
}

# --- ports --------------------------------------------------------------------------------------
# port_open HOST PORT: true when something accepts TCP connections there.
port_open() {
  (exec 3<>"/dev/tcp/$1/$2") 2>/dev/null
}

# wait_port HOST PORT [SECONDS] [PID]: wait until the port answers; fail early if PID dies.
wait_port() {
  local host=$1 port=$2 secs=${3:-30} pid=${4:-} i
  for ((i = 0; i < secs * 10; i++)); do
    port_open "$host" "$port" && return 0
    if [ -n "$pid" ] && ! kill -0 "$pid" 2>/dev/null; then
      return 1
    fi
    sleep 0.1
  done
  return 1
}

# wait_http URL [SECONDS] [PID]: wait until URL answers 2xx (node's fetch; curl may be absent).
wait_http() {
  local url=$1 secs=${2:-60} pid=${3:-} i
  for ((i = 0; i < secs * 4; i++)); do
    if node -e 'fetch(process.argv[1],{signal:AbortSignal.timeout(2000)}).then(r=>process.exit(r.ok?0:1),()=>process.exit(1))' "$url" 2>/dev/null; then
      return 0
    fi
    if [ -n "$pid" ] && ! kill -0 "$pid" 2>/dev/null; then
      return 1
    fi
    sleep 0.25
  done
  return 1
}

pid_alive() { [ -f "$1" ] && kill -0 "$(cat "$1" 2>/dev/null)" 2>/dev/null; }

# stop_pidfile FILE [SECONDS]: SIGTERM the process, wait until it is gone, SIGKILL as a last resort.
stop_pidfile() {
  local file=$1 secs=${2:-15} pid i
  [ -f "$file" ] || return 0
  pid=$(cat "$file" 2>/dev/null || true)
  if [ -n "$pid" ] && kill -0 "$pid" 2>/dev/null; then
    kill -TERM "$pid" 2>/dev/null || true
    for ((i = 0; i < secs * 10; i++)); do
      kill -0 "$pid" 2>/dev/null || break
      sleep 0.1
    done
    if kill -0 "$pid" 2>/dev/null; then
      log "pid $pid did not stop; sending SIGKILL"
      kill -KILL "$pid" 2>/dev/null || true
    fi
  fi
  rm -f "$file"
}

# --- environment ---------------------------------------------------------------------------------
# Defaults for one "instance" (demo, test, bench). Callers set DATA_DIR, DB_PORT, SMTP_FAKE_PORT,
# S3_FAKE_PORT, PORT, THERMOTALLY_ENV first when they want other values.
init_env() {
  DATA_DIR="$(abspath "${DATA_DIR:-.data}")"
  export DATA_DIR
  export DB_PORT="${DB_PORT:-3307}"
  export SMTP_FAKE_PORT="${SMTP_FAKE_PORT:-2525}"
  export S3_FAKE_PORT="${S3_FAKE_PORT:-4569}"
  export PORT="${PORT:-3000}"
  export HOST="${HOST:-127.0.0.1}"
  export APP_URL="${APP_URL:-http://localhost:$PORT}"
  export COOKIE_SECURE="${COOKIE_SECURE:-false}"
  export THERMOTALLY_ENV="${THERMOTALLY_ENV:-development}"
  mkdir -p "$DATA_DIR"
}

# The variables written to $DATA_DIR/env.sh (only those that are set).
ENV_VARS=(DATA_DIR DATABASE_URL DB_PORT SESSION_SECRET
  SMTP_HOST SMTP_PORT SMTP_USER SMTP_PASS SMTP_SECURE MAIL_FROM MAILBOX_DIR
  S3_ENDPOINT S3_BUCKET S3_ACCESS_KEY_ID S3_SECRET_ACCESS_KEY S3_REGION
  PORT HOST APP_URL COOKIE_SECURE THERMOTALLY_ENV NODE_ENV SIGNIN_RATE_LIMIT_PER_ADDRESS TEST_BASE_URL)

write_env_file() {
  local file="$DATA_DIR/env.sh" tmp v
  tmp="$file.tmp.$$"
  {
    echo "# Written by scripts/lib.sh on $(date -u +%FT%TZ); source it to reuse the services."
    for v in "${ENV_VARS[@]}"; do
      if [ -n "${!v+x}" ]; then printf 'export %s=%q\n' "$v" "${!v}"; fi
    done
  } >"$tmp"
  chmod 600 "$tmp"
  mv "$tmp" "$file"
}

# --- services ------------------------------------------------------------------------------------
# Set by start_services: which pieces this process started (so stop_services stops only those).
STARTED_DB=0
STARTED_FAKES=0

# scripts/db.sh for our own instance (DATABASE_URL, once exported by start_db, must not make it a
# no-op).
dbsh() { env -u DATABASE_URL bash "$ROOT/scripts/db.sh" "$@"; }

# start_db: unless DATABASE_URL is set, start our MariaDB for $DATA_DIR on $DB_PORT and export
# DATABASE_URL.
start_db() {
  if [ -n "${DATABASE_URL:-}" ]; then
    log "DATABASE_URL is set: using that server, starting no MariaDB"
    return 0
  fi
  if ! dbsh status >/dev/null 2>&1; then STARTED_DB=1; fi
  dbsh start >&2
  DATABASE_URL="$(dbsh url)"
  export DATABASE_URL
}

# start_fakes: start the SMTP fake unless SMTP_HOST is set and the S3 fake unless S3_ENDPOINT is
# set, in one background process; export the variables that point the app at them.
# FAKES_PARENT_PID (optional): the fakes exit by themselves when that process is gone.
start_fakes() {
  local want_smtp=0 want_s3=0 pidfile="$DATA_DIR/fakes.pid" logfile="$DATA_DIR/fakes.log" pid
  [ -z "${SMTP_HOST:-}" ] && want_smtp=1
  [ -z "${S3_ENDPOINT:-}" ] && want_s3=1
  if [ "$want_smtp" = 0 ] && [ "$want_s3" = 0 ]; then
    log "SMTP_HOST and S3_ENDPOINT are set: starting no fakes"
    return 0
  fi
  # A leftover fakes process for this data dir (a previous run killed hard): replace it.
  if pid_alive "$pidfile"; then
    log "stopping leftover fakes (pid $(cat "$pidfile"))"
    stop_pidfile "$pidfile"
  fi
  rm -f "$pidfile"
  local args=()
  if [ "$want_smtp" = 1 ]; then
    port_open 127.0.0.1 "$SMTP_FAKE_PORT" && die "port $SMTP_FAKE_PORT (SMTP fake) is already in use; set SMTP_FAKE_PORT or stop what listens there"
    export MAILBOX_DIR="$(abspath "${MAILBOX_DIR:-$DATA_DIR/mailbox}")"
    args+=(--smtp)
  else
    args+=(--no-smtp)
  fi
  if [ "$want_s3" = 1 ]; then
    port_open 127.0.0.1 "$S3_FAKE_PORT" && die "port $S3_FAKE_PORT (S3 fake) is already in use; set S3_FAKE_PORT or stop what listens there"
    args+=(--s3)
  else
    args+=(--no-s3)
  fi
  log "starting fakes (${args[*]}) -> $logfile"
  # node --import tsx (not the tsx wrapper) so that the pid in the pid file is the server itself.
  (cd "$ROOT" && SMTP_FAKE_PORT="$SMTP_FAKE_PORT" S3_FAKE_PORT="$S3_FAKE_PORT" \
    S3_DIR="$DATA_DIR/s3" S3_BUCKET="${S3_BUCKET:-thermotally}" FAKES_PID_FILE="$pidfile" \
    FAKES_PARENT_PID="${FAKES_PARENT_PID:-}" \
    exec node --import tsx scripts/fakes.ts "${args[@]}" >>"$logfile" 2>&1 </dev/null) &
  pid=$!
  STARTED_FAKES=1
  if [ "$want_smtp" = 1 ] && ! wait_port 127.0.0.1 "$SMTP_FAKE_PORT" 30 "$pid"; then
    tail -n 30 "$logfile" >&2 || true
    die "SMTP fake did not start"
  fi
  if [ "$want_s3" = 1 ] && ! wait_port 127.0.0.1 "$S3_FAKE_PORT" 30 "$pid"; then
    tail -n 30 "$logfile" >&2 || true
    die "S3 fake did not start"
  fi
  # The pid file is written once both servers listen; wait for it so stop_fakes can find them.
  local i
  for ((i = 0; i < 50; i++)); do [ -f "$pidfile" ] && break; sleep 0.1; done
  [ -f "$pidfile" ] || echo "$pid" >"$pidfile"
  if [ "$want_smtp" = 1 ]; then
    export SMTP_HOST=127.0.0.1 SMTP_PORT="$SMTP_FAKE_PORT" SMTP_SECURE=false
  fi
  if [ "$want_s3" = 1 ]; then
    export S3_ENDPOINT="http://127.0.0.1:$S3_FAKE_PORT" S3_BUCKET="${S3_BUCKET:-thermotally}" \
      S3_ACCESS_KEY_ID=S3RVER S3_SECRET_ACCESS_KEY=S3RVER S3_REGION="${S3_REGION:-us-east-1}"
  fi
  log "fakes ready (pid $(cat "$pidfile"))"
}

stop_fakes() {
  stop_pidfile "$DATA_DIR/fakes.pid" 10
}

# start_services: database and fakes, then $DATA_DIR/env.sh.
start_services() {
  start_db
  start_fakes
  write_env_file
}

# stop_services [--keep-db]: stop the fakes, and the MariaDB too unless --keep-db or it was
# already running before this process started it.
stop_services() {
  stop_fakes
  if [ "${1:-}" != "--keep-db" ] && [ "$STARTED_DB" = 1 ]; then
    dbsh stop >&2 || true
  fi
}

# --- build ---------------------------------------------------------------------------------------
# Build unless build/ is newer than every input (app, db, migrations, public, configs, lockfile).
BUILD_INPUTS=(app db migrations public package.json package-lock.json vite.config.ts
  react-router.config.ts tsconfig.json)

ensure_build() {
  local stamp="$ROOT/build/.thermotally-build-stamp" inputs=() f newer
  # Fonts are served from public/fonts, copied out of node_modules; only when missing (copying
  # them again would make public/ look changed and force a rebuild every time).
  if [ -f "$ROOT/scripts/copy-fonts.sh" ] && ! ls "$ROOT"/public/fonts/*.woff2 >/dev/null 2>&1; then
    log "copying fonts into public/fonts"
    bash "$ROOT/scripts/copy-fonts.sh" >&2
  fi
  for f in "${BUILD_INPUTS[@]}"; do [ -e "$ROOT/$f" ] && inputs+=("$f"); done
  if [ -f "$stamp" ] && [ -f "$ROOT/build/server/index.js" ]; then
    newer="$(cd "$ROOT" && find "${inputs[@]}" -newer "$stamp" -print -quit 2>/dev/null || true)"
    if [ -z "$newer" ]; then
      log "build is up to date"
      return 0
    fi
    log "rebuilding ($newer changed)"
  fi
  local t0=$SECONDS pending="$ROOT/.data/.build-stamp.$$"
  mkdir -p "$ROOT/.data"
  touch "$pending" # taken before the build: an edit made during the build triggers the next one
  log "building (react-router build)"
  (cd "$ROOT" && npx react-router build >&2) || { rm -f "$pending"; die "build failed"; }
  mv "$pending" "$stamp"
  log "built in $((SECONDS - t0)) s"
}

# The command that serves the built app: the project's server.js when there is one (express +
# @react-router/express; it sets x-thermotally-client from the socket address for the per-address
# sign-in limit), else react-router-serve. Both honour HOST and PORT.
server_cmd() {
  if [ -f "$ROOT/server.js" ]; then
    SERVER_CMD=(node server.js)
  else
    SERVER_CMD=(node node_modules/@react-router/serve/bin.js ./build/server/index.js)
  fi
}
