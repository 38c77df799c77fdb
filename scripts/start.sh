#!/usr/bin/env bash
# npm start: install what is missing, start MariaDB and the local fakes, migrate, seed the demo,
# build when the sources changed, and serve on http://localhost:$PORT (default 3000).
#
# MariaDB (DATA_DIR=.data, port DB_PORT=3307) is left running on Ctrl-C so the next start is
# quick: `scripts/db.sh stop` stops it. The SMTP and S3 fakes stop with the server.
# Set DATABASE_URL, SMTP_HOST or S3_ENDPOINT to use real servers instead (nothing is started then).
set -euo pipefail
# shellcheck source=lib.sh
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
cd "$ROOT"

T0=$SECONDS
export DATA_DIR="${DATA_DIR:-.data}"
init_env # DB_PORT 3307, SMTP fake 2525, S3 fake 4569, PORT 3000, THERMOTALLY_ENV development

if port_open 127.0.0.1 "$PORT"; then
  die "port $PORT is in use (is the app already running?); set PORT to use another"
fi

ensure_node_modules
# After `exec` below this shell's pid is the server's: the fakes exit when it does.
export FAKES_PARENT_PID=$$
start_services
log "migrating"
npx tsx scripts/migrate.ts up >&2
log "seeding the demo"
npx tsx scripts/seed.ts >&2
ensure_build

cat <<EOF

  Thermotally is starting on $APP_URL   (ready in $((SECONDS - T0)) s; Ctrl-C stops it)

  Demo accounts, all with the password  thermotally-demo
    admin@demo.test       site admin
    chemist@demo.test     owner of the demo project
    supervisor@demo.test  auditor
    coauthor@demo.test    viewer

  MariaDB keeps running after Ctrl-C (scripts/db.sh stop stops it); e-mail sent by the app is
  in the outbox page (admin) and in ${MAILBOX_DIR:-the SMTP server at $SMTP_HOST}.
  Environment for other commands: source ${DATA_DIR#"$ROOT/"}/env.sh

EOF

export NODE_ENV=production
server_cmd
exec "${SERVER_CMD[@]}"
