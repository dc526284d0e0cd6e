#!/usr/bin/env bash
# `npm start`: set up everything on a fresh machine, then run the whole product on 127.0.0.1.
source "$(dirname "$0")/lib.sh"

PG_PORT="${PG_PORT:-55432}"
API_PORT="${API_PORT:-3100}"
PORTAL_PORT="${PORTAL_PORT:-5173}"
ADMIN_PORT="${ADMIN_PORT:-5174}"
PAYMENTS_PORT="${PAYMENTS_FAKE_PORT:-3200}"
SMTP_PORT="${SMTP_PORT:-1025}"
MAILBOX_PORT="${MAILBOX_PORT:-1080}"
DEMO_TASK_PORT="${DEMO_TASK_PORT:-3300}"
DB_NAME="${DB_NAME:-evenhand}"

started_at=$SECONDS
ensure_dependencies
ensure_postgres_binaries
PG_PARENT="$(choose_pg_parent "$LOCAL_DIR/postgres")"
say "PostgreSQL data folder: $PG_PARENT/data"
start_postgres "$PG_PARENT" "$PG_PORT"
trap 'stop_postgres' EXIT
ensure_database "$PG_PORT" "$DB_NAME"

export NODE_ENV="${NODE_ENV:-development}"
export DATABASE_URL="postgres://postgres@127.0.0.1:$PG_PORT/$DB_NAME"
export API_PORT PORTAL_PORT ADMIN_PORT SMTP_PORT PAYMENTS_FAKE_PORT="$PAYMENTS_PORT"
export PORTAL_URL="${PORTAL_URL:-http://127.0.0.1:$PORTAL_PORT}"
export ADMIN_URL="${ADMIN_URL:-http://127.0.0.1:$ADMIN_PORT}"
export STRIPE_PORT="$PAYMENTS_PORT"
export STRIPE_SCRIPT_URL="http://127.0.0.1:$PAYMENTS_PORT/v1/stripe.js" VITE_PAYMENTS_SCRIPT_URL="http://127.0.0.1:$PAYMENTS_PORT/v1/stripe.js"
export EVENHAND_API_ORIGIN="http://127.0.0.1:$API_PORT"
export PAYMENTS_FAKE_WEBHOOK_URL="http://127.0.0.1:$API_PORT/api/webhooks/payments"
# The demo's stand-in for a lab's own task tool; the demo steps' task addresses point at it.
export DEMO_TASK_PORT DEMO_TASK_URL="http://127.0.0.1:$DEMO_TASK_PORT"

build_servers
say "Migrating the database"
(cd "$ROOT/api" && node dist/database/run-migrations.js)
# The stand-in keeps its state in a file, so accounts, transfers and balance match the database across restarts.
export PAYMENTS_FAKE_STATE_FILE="${PAYMENTS_FAKE_STATE_FILE:-$LOCAL_DIR/payments-fake/state.json}"
mkdir -p "$(dirname "$PAYMENTS_FAKE_STATE_FILE")"
LOG_DIR="$LOCAL_DIR/logs"
say "Loading the demo scenario (its payouts go through the payments stand-in, started for it)"
trap 'stop_services; stop_postgres' EXIT
start_service demo-payments "$ROOT/payments-fake" node dist/main.js
wait_for_url "http://127.0.0.1:$PAYMENTS_PORT/health" 60
(cd "$ROOT/api" && node dist/database/seed/run-seed.js)
stop_services
trap 'stop_postgres' EXIT
mkdir -p "$LOCAL_DIR/mailbox"

cat <<INFO

  Evenhand is starting (set-up took $((SECONDS - started_at)) s):
    participant portal   http://127.0.0.1:$PORTAL_PORT
    staff admin          http://127.0.0.1:$ADMIN_PORT
    api                  http://127.0.0.1:$API_PORT/api   (docs: /api/docs, OpenAPI: /api/openapi.json)
    local mailbox        http://127.0.0.1:$MAILBOX_PORT   (SMTP 127.0.0.1:$SMTP_PORT)
    payments stand-in    http://127.0.0.1:$PAYMENTS_PORT
    demo task stand-in   http://127.0.0.1:$DEMO_TASK_PORT   (the labs' own survey or experiment tool, played)
    PostgreSQL           127.0.0.1:$PG_PORT, database $DB_NAME

  Staff sign-in (password evenhand-demo): admin@evenhand.test, coordinator@evenhand.test,
  researcher@evenhand.test, auditor@evenhand.test. Participants sign in on the portal by e-mailed
  link with any address; the link arrives in the local mailbox.
  Press Ctrl-C to stop everything.

INFO

BIN="$ROOT/node_modules/.bin"
# `npm start` serves the apps as production builds; `npm run dev` (EVENHAND_DEV=1) keeps Vite's development servers.
if [ "${EVENHAND_DEV:-}" = "1" ]; then
  VITE_MODE=""
else
  for app in portal admin; do
    say "Building the $app app"
    # NODE_ENV is "development" for the api here; left as it is, Vite would bundle React's development build.
    (cd "$ROOT/$app" && NODE_ENV=production npm run build --silent)
  done
  VITE_MODE="preview"
fi
set +e
# A service that crashes is restarted on its own; the others, and PostgreSQL, keep running.
run_supervised "api,portal,admin,payments,mailbox,tasks" "cyan,magenta,yellow,green,blue,gray" \
  "cd '$ROOT/api' && exec node --enable-source-maps dist/main.js" \
  "cd '$ROOT/portal' && exec '$BIN/vite' $VITE_MODE --port $PORTAL_PORT --strictPort --host 127.0.0.1" \
  "cd '$ROOT/admin' && exec '$BIN/vite' $VITE_MODE --port $ADMIN_PORT --strictPort --host 127.0.0.1" \
  "cd '$ROOT/payments-fake' && exec node --enable-source-maps dist/main.js" \
  "exec '$BIN/maildev' -s $SMTP_PORT --ip 127.0.0.1 -w $MAILBOX_PORT --web-ip 127.0.0.1 --mail-directory '$LOCAL_DIR/mailbox'" \
  "cd '$ROOT/api' && exec node --enable-source-maps dist/database/seed/demo-task-server.js"
status=$?
exit $status
