#!/usr/bin/env bash
# scripts/with-services.sh CMD [ARGS...]: run CMD (a bench, a one-off script) with a database and
# the fakes of its own, migrated, then stop them again.
#   DATA_DIR=.data/bench, MariaDB on 127.0.0.1:3327 (BENCH_DB_PORT), SMTP fake 2545
#   (BENCH_SMTP_PORT), S3 fake 4589 (BENCH_S3_PORT). WITH_SEED=1 also seeds the demo data.
# A bench MariaDB that was already running is reused and left running. The env CMD sees is also in
# .data/bench/env.sh. DATABASE_URL / SMTP_HOST / S3_ENDPOINT set: those are used, nothing started.
set -euo pipefail
# shellcheck source=lib.sh
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
cd "$ROOT"

[ "$#" -gt 0 ] || die "usage: scripts/with-services.sh CMD [ARGS...]"

export DATA_DIR="$ROOT/.data/bench"
export DB_PORT="${BENCH_DB_PORT:-3327}"
export SMTP_FAKE_PORT="${BENCH_SMTP_PORT:-2545}"
export S3_FAKE_PORT="${BENCH_S3_PORT:-4589}"
export THERMOTALLY_ENV="${THERMOTALLY_ENV:-test}"
export DB_EXTRA_GRANTS=1 DB_FAST=1
unset MAILBOX_DIR
init_env

trap 'stop_services >/dev/null 2>&1 || true' EXIT
trap 'exit 130' INT
trap 'exit 143' TERM

ensure_node_modules
export FAKES_PARENT_PID=$$
start_services
npx tsx scripts/migrate.ts up >&2
if [ "${WITH_SEED:-0}" = 1 ]; then npx tsx scripts/seed.ts >&2; fi

set +e
"$@"
rc=$?
set -e
exit "$rc"
