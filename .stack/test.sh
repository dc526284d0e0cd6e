#!/usr/bin/env bash
# `npm test`: on a fresh machine, install what is needed, start throwaway services, run every workspace's
# tests (unit, api end-to-end against PostgreSQL, browser journeys), and stop everything it started.
source "$(dirname "$0")/lib.sh"

TEST_PG_PORT="${TEST_PG_PORT:-55433}"
T_API_PORT="${TEST_API_PORT:-3110}"
T_PORTAL_PORT="${TEST_PORTAL_PORT:-5183}"
T_ADMIN_PORT="${TEST_ADMIN_PORT:-5184}"
T_PAYMENTS_PORT="${TEST_PAYMENTS_PORT:-3210}"
T_SMTP_PORT="${TEST_SMTP_PORT:-1035}"
T_MAILBOX_PORT="${TEST_MAILBOX_PORT:-1090}"
T_DEMO_TASK_PORT="${TEST_DEMO_TASK_PORT:-3310}"

started_at=$SECONDS
RUN_DIR="$(mktemp -d "$LOCAL_DIR/test-run.XXXXXX")"
# mktemp makes it private; the postgres account must be able to reach the cluster inside it.
chmod 755 "$RUN_DIR"
REPORT_DIR="$RUN_DIR/reports"
LOG_DIR="${TEST_LOG_DIR:-$LOCAL_DIR/test-logs}"
mkdir -p "$REPORT_DIR" "$LOG_DIR"
rm -f "$LOG_DIR"/*.log
FAILED_STEPS=()

cleanup() {
  stop_services
  stop_postgres
  rm -rf "$RUN_DIR"
  # A fallback cluster folder outside the project (see choose_pg_parent) goes too.
  case "${PG_PARENT:-}" in /var/tmp/evenhand-*) rm -rf "$PG_PARENT" ;; esac
}
trap cleanup EXIT
trap 'exit 130' INT TERM

# step NAME COMMAND...: runs one group of tests; a failure is recorded and the remaining groups still run.
step() {
  local name="$1"
  shift
  # TEST_ONLY="admin build,admin browser journeys" runs just those groups (for working on one part); CI sets nothing.
  if [ -n "${TEST_ONLY:-}" ] && [[ ",$TEST_ONLY," != *",$name,"* ]]; then
    say "── $name skipped (TEST_ONLY)"
    return 0
  fi
  say "── $name"
  local step_started=$SECONDS
  if "$@"; then
    say "   $name passed ($((SECONDS - step_started)) s)"
  else
    FAILED_STEPS+=("$name")
    say "   $name FAILED ($((SECONDS - step_started)) s)"
  fi
}

vitest_in() {
  local workspace="$1" report="$2"
  shift 2
  (cd "$ROOT/$workspace" && "$ROOT/node_modules/.bin/vitest" run "$@" --reporter=default --reporter=json \
    --outputFile.json="$REPORT_DIR/$report.json")
}

ensure_dependencies
# Lint first: ESLint on every workspace and the import boundaries (.dependency-cruiser.cjs); no services needed.
step "lint" bash -c "cd '$ROOT' && npm run lint --silent && npm run format:check --silent"
ensure_postgres_binaries
ensure_chromium
ensure_pdfsig
PG_PARENT="$(choose_pg_parent "$RUN_DIR/postgres")"
say "Throwaway PostgreSQL in $PG_PARENT"
PG_FSYNC=off start_postgres "$PG_PARENT" "$TEST_PG_PORT"
ensure_database "$TEST_PG_PORT" evenhand_e2e fresh
ensure_database "$TEST_PG_PORT" evenhand_browser fresh
build_servers

export NODE_ENV=test
export SMTP_PORT="$T_SMTP_PORT" STRIPE_PORT="$T_PAYMENTS_PORT"
export MAILBOX_URL="http://127.0.0.1:$T_MAILBOX_PORT"
export PORTAL_URL="http://127.0.0.1:$T_PORTAL_PORT" ADMIN_URL="http://127.0.0.1:$T_ADMIN_PORT"
export SIGN_IN_LIMIT=500 JOB_RETRY_DELAY_SECONDS=1
# The api end-to-end tests listen where the payments stand-in delivers webhooks.
export PAYMENTS_WEBHOOK_PORT="$T_API_PORT"
# The provider's browser script, as the admin build and the api hand it out.
export VITE_PAYMENTS_SCRIPT_URL="http://127.0.0.1:$T_PAYMENTS_PORT/v1/stripe.js" STRIPE_SCRIPT_URL="http://127.0.0.1:$T_PAYMENTS_PORT/v1/stripe.js"

step "legal templates tests" bash -c "cd '$ROOT/legal-templates' && node --test"
step "stack script tests" node --test "$ROOT/.stack/test/"
step "contract tests" vitest_in api/contract contract
step "contract matches the api" bash "$ROOT/api/contract/check-current.sh"
# Tests are code too: the api's and the stand-in's tests are type-checked with the code they test.
step "type checks" bash -c "cd '$ROOT/api' && npm run typecheck --silent && cd '$ROOT/api/contract' && npm run typecheck --silent && cd '$ROOT/payments-fake' && npm run typecheck --silent"
step "api unit tests" vitest_in api api-unit --project unit
step "payments stand-in tests" vitest_in payments-fake payments-fake
step "portal component tests" vitest_in portal portal-unit
step "admin component tests" vitest_in admin admin-unit

say "Starting the local mailbox and the payments stand-in"
start_service mailbox "$ROOT" "$ROOT/node_modules/.bin/maildev" -s "$T_SMTP_PORT" --ip 127.0.0.1 -w "$T_MAILBOX_PORT" \
  --web-ip 127.0.0.1 --mail-directory "$RUN_DIR/mailbox"
PAYMENTS_FAKE_PORT="$T_PAYMENTS_PORT" PAYMENTS_FAKE_WEBHOOK_URL="http://127.0.0.1:$T_API_PORT/api/webhooks/payments" \
  start_service payments "$ROOT/payments-fake" node --enable-source-maps dist/main.js
wait_for_url "$MAILBOX_URL/api/email" 60
wait_for_url "http://127.0.0.1:$T_PAYMENTS_PORT/health" 60

DATABASE_URL="postgres://postgres@127.0.0.1:$TEST_PG_PORT/evenhand_e2e" step "api end-to-end tests" vitest_in api api-e2e --project e2e ${API_E2E_FILTER:-}

say "Starting the demo task stand-in, api, portal and admin for the browser journeys"
# The seeded demo steps send participants to the task stand-in; journeys find it at DEMO_TASK_URL.
export DEMO_TASK_URL="http://127.0.0.1:$T_DEMO_TASK_PORT"
DEMO_TASK_PORT="$T_DEMO_TASK_PORT" start_service demo-tasks "$ROOT/api" node --enable-source-maps dist/database/seed/demo-task-server.js
wait_for_url "$DEMO_TASK_URL/health" 30
BROWSER_DB="postgres://postgres@127.0.0.1:$TEST_PG_PORT/evenhand_browser"
(cd "$ROOT/api" && DATABASE_URL="$BROWSER_DB" node dist/database/run-migrations.js && DATABASE_URL="$BROWSER_DB" node dist/database/seed/run-seed.js) 2>&1 |
  tee "$LOG_DIR/seed.log"
# No scheduled reminder sweep: a reminder landing in a journey's mailbox would be read as the mail it waits for.
DATABASE_URL="$BROWSER_DB" API_PORT="$T_API_PORT" REMINDER_SWEEP_CRON="" AUDIT_RECEIPT_CRON="" start_service api "$ROOT/api" node --enable-source-maps dist/main.js
for app in portal admin; do
  step "$app build" bash -c "cd '$ROOT/$app' && npm run build --silent"
done
EVENHAND_API_ORIGIN="http://127.0.0.1:$T_API_PORT" start_service portal "$ROOT/portal" \
  "$ROOT/node_modules/.bin/vite" preview --port "$T_PORTAL_PORT" --strictPort --host 127.0.0.1
EVENHAND_API_ORIGIN="http://127.0.0.1:$T_API_PORT" start_service admin "$ROOT/admin" \
  "$ROOT/node_modules/.bin/vite" preview --port "$T_ADMIN_PORT" --strictPort --host 127.0.0.1
wait_for_url "http://127.0.0.1:$T_API_PORT/api/health" 90
wait_for_url "$PORTAL_URL" 60
wait_for_url "$ADMIN_URL" 60

# Journeys that also call the api or the stand-in directly (to set a code, fund, approve) use the test stack.
export EVENHAND_API_ORIGIN="http://127.0.0.1:$T_API_PORT" PAYMENTS_FAKE_URL="http://127.0.0.1:$T_PAYMENTS_PORT"
for app in portal admin; do
  SCREENSHOT_DIR="$LOCAL_DIR/screenshots/$app" step "$app browser journeys" vitest_in "$app" "$app-e2e" --config vitest.e2e.config.ts ${JOURNEY_FILTER:-}
done

node "$ROOT/.stack/summarize-reports.mjs" "$REPORT_DIR"
say "npm test took $((SECONDS - started_at)) s; service logs in $LOG_DIR, screenshots in $LOCAL_DIR/screenshots"
if [ "${#FAILED_STEPS[@]}" -gt 0 ]; then
  printf '\033[1;31m[evenhand]\033[0m failed: %s\n' "${FAILED_STEPS[*]}" >&2
  exit 1
fi
