#!/usr/bin/env bash
# The first-load benchmark against the real stack: PostgreSQL (the development cluster, started here when needed and
# stopped again) with a database of its own holding the demo scenario, the payments stand-in (the demo's payouts go
# through it), the api, and both apps' production builds under `vite preview` as `npm start` serves them.
# Everything started here is stopped at the end, and the database dropped.
source "$(cd "$(dirname "${BASH_SOURCE[0]}")/../.." && pwd)/.stack/lib.sh"

PG_PORT="${PG_PORT:-55432}"
BENCH_DB_NAME="${BENCH_FIRST_LOAD_DB:-evenhand_first_load}"
BENCH_API_PORT="${BENCH_API_PORT:-3190}"
BENCH_PAYMENTS_PORT="${BENCH_PAYMENTS_PORT:-3290}"
BENCH_PORTAL_PORT="${BENCH_PORTAL_PORT:-5297}"
BENCH_ADMIN_PORT="${BENCH_ADMIN_PORT:-5298}"
LOG_DIR="$LOCAL_DIR/bench-logs"

finish() {
  stop_services
  "$PG_BIN/psql" -h 127.0.0.1 -p "$PG_PORT" -U postgres -d postgres -qtA \
    -c "DROP DATABASE IF EXISTS \"$BENCH_DB_NAME\" WITH (FORCE)" >/dev/null 2>&1 || true
  stop_postgres
}
trap finish EXIT
trap 'exit 130' INT TERM

ensure_dependencies
ensure_postgres_binaries
ensure_chromium
PG_PARENT="$(choose_pg_parent "$LOCAL_DIR/postgres")"
start_postgres "$PG_PARENT" "$PG_PORT"
ensure_database "$PG_PORT" "$BENCH_DB_NAME" fresh
build_servers

export NODE_ENV=development
export DATABASE_URL="postgres://postgres@127.0.0.1:$PG_PORT/$BENCH_DB_NAME"
export API_PORT="$BENCH_API_PORT" STRIPE_PORT="$BENCH_PAYMENTS_PORT" PAYMENTS_FAKE_PORT="$BENCH_PAYMENTS_PORT"
export PAYMENTS_FAKE_WEBHOOK_URL="http://127.0.0.1:$BENCH_API_PORT/api/webhooks/payments"
export PORTAL_URL="http://127.0.0.1:$BENCH_PORTAL_PORT" ADMIN_URL="http://127.0.0.1:$BENCH_ADMIN_PORT"
export EVENHAND_API_ORIGIN="http://127.0.0.1:$BENCH_API_PORT" BENCH_PORTAL_PORT BENCH_ADMIN_PORT

(cd "$ROOT/api" && node dist/database/run-migrations.js)
start_service first-load-payments "$ROOT/payments-fake" node dist/main.js
wait_for_url "http://127.0.0.1:$BENCH_PAYMENTS_PORT/health" 60
say "Loading the demo scenario for the first-load benchmark"
(cd "$ROOT/api" && node dist/database/seed/run-seed.js) >"$LOG_DIR/first-load-seed.log" 2>&1 \
  || { tail -20 "$LOG_DIR/first-load-seed.log" >&2; fail "the demo scenario did not load"; }
start_service first-load-api "$ROOT/api" node dist/main.js
wait_for_url "http://127.0.0.1:$BENCH_API_PORT/api/health" 60

for app in portal admin; do
  # NODE_ENV=development (the api's) would make Vite bundle React's development build.
  (cd "$ROOT/$app" && NODE_ENV=production npm run build --silent)
done
start_service first-load-portal "$ROOT/portal" "$ROOT/node_modules/.bin/vite" preview --port "$BENCH_PORTAL_PORT" --strictPort --host 127.0.0.1
start_service first-load-admin "$ROOT/admin" "$ROOT/node_modules/.bin/vite" preview --port "$BENCH_ADMIN_PORT" --strictPort --host 127.0.0.1
wait_for_url "http://127.0.0.1:$BENCH_PORTAL_PORT/" 60
wait_for_url "http://127.0.0.1:$BENCH_ADMIN_PORT/" 60

say "First-load benchmark (portal on $BENCH_PORTAL_PORT, admin on $BENCH_ADMIN_PORT)"
node "$ROOT/portal/bench/first-load.mjs"
