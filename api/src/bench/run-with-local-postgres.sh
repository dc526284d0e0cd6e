#!/usr/bin/env bash
# Runs `npm run bench -w api` with a database to work in; given script names (e.g. attrition-bench.js), it
# compiles the api once and runs those from api/dist/bench/ instead, one after another. With DATABASE_URL set, it uses that and starts
# nothing. Otherwise it uses the development PostgreSQL cluster that `npm start` uses (127.0.0.1:55432,
# started here if it is not running, and stopped again afterwards), in a database of its own that it drops.
source "$(cd "$(dirname "${BASH_SOURCE[0]}")/../../.." && pwd)/.stack/lib.sh"

run_benchmarks() {
  if [ "$#" -eq 0 ]; then
    (cd "$ROOT" && npm run bench -w api)
    return
  fi
  (cd "$ROOT/api" && npx tsc -p tsconfig.build.json) || return 1
  # Every script runs even when one misses its target; the status is the first non-zero one.
  local script status=0
  for script in "$@"; do
    say "Benchmark: $script"
    (cd "$ROOT/api" && node "dist/bench/$script") || { local code=$?; [ "$status" -eq 0 ] && status=$code; }
  done
  return "$status"
}

if [ -n "${DATABASE_URL:-}" ]; then
  run_benchmarks "$@"
  exit
fi

PG_PORT="${PG_PORT:-55432}"
BENCH_DB_NAME="${BENCH_DB_NAME:-evenhand_bench}"

ensure_dependencies
ensure_postgres_binaries
PG_PARENT="$(choose_pg_parent "$LOCAL_DIR/postgres")"
start_postgres "$PG_PARENT" "$PG_PORT"

drop_bench_database() {
  "$PG_BIN/psql" -h 127.0.0.1 -p "$PG_PORT" -U postgres -d postgres -v ON_ERROR_STOP=1 -qtA \
    -c "DROP DATABASE IF EXISTS \"$BENCH_DB_NAME\" WITH (FORCE)" >/dev/null || true
  stop_postgres
}
trap drop_bench_database EXIT
ensure_database "$PG_PORT" "$BENCH_DB_NAME" fresh

say "Benchmark database: $BENCH_DB_NAME on 127.0.0.1:$PG_PORT (dropped afterwards)"
DATABASE_URL="postgres://postgres@127.0.0.1:$PG_PORT/$BENCH_DB_NAME" run_benchmarks "$@"
