# Shared set-up steps for `npm start` and `npm test`. Sourced, not run.
set -euo pipefail

ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
LOCAL_DIR="$ROOT/.local"
mkdir -p "$LOCAL_DIR"
export TMPDIR="${TMPDIR_OVERRIDE:-$LOCAL_DIR/tmp}"
mkdir -p "$TMPDIR"

say() { printf '\033[1;36m[evenhand]\033[0m %s\n' "$*"; }
fail() { printf '\033[1;31m[evenhand]\033[0m %s\n' "$*" >&2; exit 1; }

# start_service NAME DIR COMMAND...: runs in its own process group (so stopping it stops its children too),
# logging to $LOG_DIR/NAME.log; stop_services stops every one started so far.
SERVICE_PIDS=()
start_service() {
  local name="$1" dir="$2"
  shift 2
  mkdir -p "$LOG_DIR"
  (cd "$dir" && exec setsid "$@") >"$LOG_DIR/$name.log" 2>&1 &
  SERVICE_PIDS+=($!)
}

stop_services() {
  local pid
  for pid in "${SERVICE_PIDS[@]}"; do kill -TERM -- "-$pid" 2>/dev/null || kill -TERM "$pid" 2>/dev/null || true; done
  # Give them a moment to finish writing (the stand-in saves its state on the way out), then make sure.
  for pid in "${SERVICE_PIDS[@]}"; do
    for _ in 1 2 3 4 5 6 7 8 9 10; do kill -0 "$pid" 2>/dev/null || break; sleep 0.2; done
    kill -KILL -- "-$pid" 2>/dev/null || true
  done
  SERVICE_PIDS=()
}

as_root() {
  if [ "$(id -u)" -eq 0 ]; then "$@"; elif command -v sudo >/dev/null; then sudo "$@"; else fail "Need root for: $*"; fi
}

apt_install() {
  say "Installing from Debian: $*"
  as_root env DEBIAN_FRONTEND=noninteractive apt-get update -qq
  as_root env DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "$@" >/dev/null
}

# Installs npm dependencies when node_modules is missing or older than the lock file.
ensure_dependencies() {
  if [ ! -d "$ROOT/node_modules" ] || [ "$ROOT/package-lock.json" -nt "$ROOT/node_modules/.package-lock.json" ]; then
    say "Installing npm dependencies (npm ci)"
    (cd "$ROOT" && npm ci --no-audit --no-fund)
  fi
}

pg_bin_dir() {
  local dir
  dir="$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -1 || true)"
  if [ -n "$dir" ] && [ -x "$dir/postgres" ]; then echo "$dir"; fi
}

ensure_postgres_binaries() {
  if [ -z "$(pg_bin_dir)" ]; then apt_install postgresql; fi
  PG_BIN="$(pg_bin_dir)"
  [ -n "$PG_BIN" ] || fail "PostgreSQL server binaries not found after installing"
  # PostgreSQL refuses to run as root: use the unprivileged postgres account, created if missing.
  if [ "$(id -u)" -eq 0 ]; then
    PG_OS_USER=postgres
    id "$PG_OS_USER" >/dev/null 2>&1 || useradd --system --home-dir /var/lib/postgresql --shell /bin/sh "$PG_OS_USER"
  else
    PG_OS_USER="$(id -un)"
  fi
  export PG_BIN PG_OS_USER
}

as_pg_user() {
  if [ "$(id -un)" = "$PG_OS_USER" ]; then "$@"; else runuser -u "$PG_OS_USER" -- "$@"; fi
}

# Picks a folder the PostgreSQL account can write: inside the project when it can reach it, else under /var/tmp.
choose_pg_parent() {
  local wanted="$1" fallback
  mkdir -p "$wanted"
  if [ "$(id -u)" -eq 0 ]; then chown "$PG_OS_USER" "$wanted"; fi
  if as_pg_user test -w "$wanted" 2>/dev/null; then echo "$wanted"; return; fi
  fallback="/var/tmp/evenhand-$(printf '%s' "$wanted" | sha256sum | cut -c1-12)"
  mkdir -p "$fallback"
  chown "$PG_OS_USER" "$fallback"
  echo "$fallback"
}

# start_postgres PARENT PORT: initialises PARENT/data on first use and starts it on 127.0.0.1:PORT.
start_postgres() {
  local parent="$1" port="$2"
  PG_DATA="$parent/data"
  PG_SOCKET_DIR="$parent/socket"
  PG_LOG="$parent/postgres.log"
  as_pg_user mkdir -p "$PG_SOCKET_DIR"
  if [ ! -f "$PG_DATA/PG_VERSION" ]; then
    say "Creating a PostgreSQL cluster in $PG_DATA"
    as_pg_user "$PG_BIN/initdb" -D "$PG_DATA" -U postgres --auth=trust -E UTF8 >/dev/null
  fi
  if as_pg_user "$PG_BIN/pg_ctl" -D "$PG_DATA" status >/dev/null 2>&1; then
    say "PostgreSQL already running from $PG_DATA"
    PG_STARTED_HERE=0
  else
    say "Starting PostgreSQL on 127.0.0.1:$port (data in $PG_DATA)"
    as_pg_user "$PG_BIN/pg_ctl" -D "$PG_DATA" -l "$PG_LOG" -w -t 60 \
      -o "-k $PG_SOCKET_DIR -p $port -h 127.0.0.1 -c fsync=${PG_FSYNC:-on}" start >/dev/null \
      || { tail -20 "$PG_LOG" >&2; fail "PostgreSQL did not start"; }
    PG_STARTED_HERE=1
  fi
  export PG_DATA PG_STARTED_HERE
}

stop_postgres() {
  if [ "${PG_STARTED_HERE:-0}" = 1 ] && [ -n "${PG_DATA:-}" ]; then
    say "Stopping PostgreSQL"
    as_pg_user "$PG_BIN/pg_ctl" -D "$PG_DATA" -m fast -w stop >/dev/null 2>&1 || true
    PG_STARTED_HERE=0
  fi
}

# ensure_database PORT NAME [fresh]: creates the database; with "fresh" drops it first.
ensure_database() {
  local port="$1" name="$2" mode="${3:-}"
  local psql=("$PG_BIN/psql" -h 127.0.0.1 -p "$port" -U postgres -d postgres -v ON_ERROR_STOP=1 -qtA)
  if [ "$mode" = fresh ]; then "${psql[@]}" -c "DROP DATABASE IF EXISTS \"$name\" WITH (FORCE)" >/dev/null; fi
  if [ "$("${psql[@]}" -c "SELECT 1 FROM pg_database WHERE datname = '$name'")" != 1 ]; then
    "${psql[@]}" -c "CREATE DATABASE \"$name\"" >/dev/null
  fi
}

ensure_chromium() {
  if [ ! -x "${CHROMIUM_PATH:-/usr/bin/chromium}" ]; then apt_install chromium; fi
  export CHROMIUM_PATH="${CHROMIUM_PATH:-/usr/bin/chromium}"
}

# pdfsig (Debian's poppler-utils) checks the signature of the signed consent copies in the api tests.
ensure_pdfsig() {
  if ! command -v pdfsig >/dev/null 2>&1; then apt_install poppler-utils; fi
}

# wait_for_url URL SECONDS: waits until the URL answers at all.
wait_for_url() {
  local url="$1" seconds="${2:-60}" i
  for ((i = 0; i < seconds * 4; i++)); do
    if curl -s -o /dev/null --max-time 2 "$url"; then return 0; fi
    sleep 0.25
  done
  fail "Timed out waiting for $url"
}

build_servers() {
  say "Compiling api and payments stand-in"
  (cd "$ROOT/api" && npm run build --silent)
  (cd "$ROOT/payments-fake" && npm run build --silent)
}

# run_supervised NAMES COLORS COMMAND...: runs the services side by side with their output prefixed. A service that
# exits with an error is restarted after 2 s (the log says so) while the others keep running; Ctrl-C or SIGTERM
# stops them all, once. Returns when every service has stopped.
run_supervised() {
  local names="$1" colors="$2"
  shift 2
  "$ROOT/node_modules/.bin/concurrently" --names "$names" --prefix-colors "$colors" --kill-signal SIGTERM \
    --restart-tries -1 --restart-after 2000 "$@" &
  local supervisor=$!
  # concurrently treats SIGINT as "stop everything" (and SIGTERM as a crash to restart from), so pass SIGINT on.
  trap 'kill -INT "$supervisor" 2>/dev/null' INT TERM
  local status=0
  while kill -0 "$supervisor" 2>/dev/null; do
    wait "$supervisor" && status=0 || status=$?
  done
  trap - INT TERM
  return "$status"
}
