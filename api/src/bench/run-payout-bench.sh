#!/usr/bin/env bash
# The payout benchmark with everything it talks to: PostgreSQL (DATABASE_URL if set, otherwise the development
# cluster, started here when needed and stopped again), a fresh payments stand-in whose webhooks reach the
# benchmark's api, and a local mailbox for the receipts. Both services are stopped at the end.
# BENCH_NODE_ARGS adds flags to the benchmark's node, e.g. "--cpu-prof --cpu-prof-dir=/tmp/prof" to see where it spends.
source "$(cd "$(dirname "${BASH_SOURCE[0]}")/../../.." && pwd)/.stack/lib.sh"

PG_PORT="${PG_PORT:-55432}"
BENCH_PAYMENTS_PORT="${BENCH_PAYMENTS_PORT:-3290}"
BENCH_API_PORT="${BENCH_API_PORT:-3190}"
BENCH_SMTP_PORT="${BENCH_SMTP_PORT:-1095}"
BENCH_MAILBOX_PORT="${BENCH_MAILBOX_PORT:-1096}"
LOG_DIR="$LOCAL_DIR/bench-logs"
RUN_DIR="$(mktemp -d "$LOCAL_DIR/payout-bench.XXXXXX")"

started_postgres=""
finish() {
  stop_services
  [ -n "$started_postgres" ] && stop_postgres
  rm -rf "$RUN_DIR"
}
trap finish EXIT
trap 'exit 130' INT TERM

ensure_dependencies
if [ -z "${DATABASE_URL:-}" ]; then
  ensure_postgres_binaries
  PG_PARENT="$(choose_pg_parent "$LOCAL_DIR/postgres")"
  start_postgres "$PG_PARENT" "$PG_PORT"
  started_postgres=yes
  export DATABASE_URL="postgres://postgres@127.0.0.1:$PG_PORT/postgres"
fi
build_servers

start_service bench-mailbox "$ROOT" "$ROOT/node_modules/.bin/maildev" -s "$BENCH_SMTP_PORT" --ip 127.0.0.1 \
  -w "$BENCH_MAILBOX_PORT" --web-ip 127.0.0.1 --mail-directory "$RUN_DIR/mailbox"
PAYMENTS_FAKE_PORT="$BENCH_PAYMENTS_PORT" PAYMENTS_FAKE_WEBHOOK_URL="http://127.0.0.1:$BENCH_API_PORT/api/webhooks/payments" \
  start_service bench-payments "$ROOT/payments-fake" node dist/main.js
wait_for_url "http://127.0.0.1:$BENCH_MAILBOX_PORT/api/email" 60
wait_for_url "http://127.0.0.1:$BENCH_PAYMENTS_PORT/health" 60

say "Payout benchmark (stand-in on $BENCH_PAYMENTS_PORT, logs in $LOG_DIR)"
cd "$ROOT/api"
STRIPE_PORT="$BENCH_PAYMENTS_PORT" SMTP_PORT="$BENCH_SMTP_PORT" BENCH_API_PORT="$BENCH_API_PORT" NODE_ENV=development \
  node --enable-source-maps ${BENCH_NODE_ARGS:-} dist/bench/run-payout-bench.js
