#!/usr/bin/env bash
# `npm run bench`: every benchmark, one after another, each printing its ratios with their targets. All of them run
# even when one misses (so one run shows every figure); the exit code is non-zero when any benchmark failed or
# missed its target. Ports and the PostgreSQL cluster follow the environment (PG_PORT, BENCH_*_PORT), so two
# checkouts can run benchmarks side by side.
set -u
HERE="$(cd "$(dirname "${BASH_SOURCE[0]}")" && pwd)"
failed=()
run() {
  local name="$1"; shift
  "$@" || failed+=("$name (exit $?)")
}
run "allocation" bash "$HERE/run-with-local-postgres.sh"
run "dropout watch and signing" bash "$HERE/run-with-local-postgres.sh" attrition-bench.js run-signing-bench.js
run "payouts" bash "$HERE/run-payout-bench.sh"
run "first load" bash "$HERE/../../../portal/bench/run-first-load.sh"
if [ "${#failed[@]}" -gt 0 ]; then
  printf '[bench] target missed or run failed: %s\n' "${failed[@]}" >&2
  exit 1
fi
echo "[bench] every target met"
