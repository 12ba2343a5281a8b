#!/usr/bin/env bash
# Project-local PostgreSQL cluster for development and tests.
#   pg.sh ensure-installed   install Debian's postgresql when its binaries are missing
#   pg.sh start [dbname]     init (first time) + start; prints the DATABASE_URL as the last line
#   pg.sh stop               fast shutdown
#   pg.sh status
#   pg.sh where              print data=, run= (socket dir) and port= lines; tests read paths from here
# Listens on 127.0.0.1 only, port $DW_PG_PORT (default: 54400 + a hash of the checkout path mod 1000, so two checkouts
# on one machine never share a port). Data lives in .pg/ (git-ignored) or $DW_PG_DIR; when the postgres user cannot
# enter that folder (a 0700 mktemp clone) it moves to /tmp/dw-pg-<hash>, and the socket dir moves to /tmp when its
# path has a space or is too long for a Unix socket.
# trust auth and fsync=off are for dev/test only; point DATABASE_URL at a real server for real data.
set -euo pipefail

ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/../.." && pwd)"
path_hash() { echo -n "$1" | sha1sum | cut -c1-10; }
PORT="${DW_PG_PORT:-$((54400 + 16#$(path_hash "$ROOT" | cut -c1-6) % 1000))}"
BIN="${PG_BIN:-/usr/lib/postgresql/15/bin}"
BASE="${DW_PG_DIR:-$ROOT/.pg}"

say() { echo "[pg] $*" >&2; }

ensure_installed() {
  if [ -x "$BIN/initdb" ]; then return 0; fi
  say "PostgreSQL binaries not found in $BIN; installing Debian's postgresql package"
  if [ "$(id -u)" != 0 ] || ! command -v apt-get >/dev/null; then
    say "cannot install: needs root and apt-get. Install PostgreSQL 15 (apt-get install -y postgresql) or set DATABASE_URL."
    exit 3
  fi
  (apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq postgresql >/dev/null) || {
    say "apt-get install postgresql failed; install it by hand or set DATABASE_URL to an existing server."; exit 3; }
  [ -x "$BIN/initdb" ] || { say "postgresql installed but $BIN/initdb is missing (set PG_BIN)"; exit 3; }
}

# postgres refuses to run as root: the cluster is owned by the postgres user, which needs to reach the folder.
pick_dirs() {
  DATA="$BASE/data"; RUN="$BASE/run"
  mkdir -p "$BASE"
  if ! runuser -u postgres -- test -x "$BASE" 2>/dev/null || ! runuser -u postgres -- test -x "$ROOT" 2>/dev/null; then
    BASE="/tmp/dw-pg-$(path_hash "$BASE")"; DATA="$BASE/data"; RUN="$BASE/run"
    mkdir -p "$BASE"
  fi
  # pg_ctl -o splits on spaces, and a Unix socket path has a limit of about 100 bytes.
  if [ ${#RUN} -gt 80 ] || [[ "$RUN" == *" "* ]]; then RUN="/tmp/dw-pg-run-$(path_hash "$BASE")"; fi
  mkdir -p "$RUN"; chown postgres:postgres "$BASE" "$RUN"; chmod 700 "$BASE"
}

as_pg() { if [ "$(id -u)" = 0 ]; then runuser -u postgres -- "$@"; else "$@"; fi; }

ensure_user() {
  id postgres >/dev/null 2>&1 || useradd --system --home-dir /var/lib/postgresql --shell /bin/bash postgres
}

# A server already running on this data dir keeps its port (e.g. started before the default port changed):
# use it rather than treating its postmaster.pid as stale.
adopt_running_port() {
  local pidfile="$DATA/postmaster.pid" pid p
  [ -f "$pidfile" ] || return 0
  pid=$(head -n1 "$pidfile"); p=$(sed -n 4p "$pidfile")
  [ -n "$pid" ] && [ -n "$p" ] && [ "$p" != "$PORT" ] && [ -r "/proc/$pid/cmdline" ] || return 0
  tr '\0' ' ' < "/proc/$pid/cmdline" | grep -q -- "$DATA" || return 0
  if "$BIN/pg_isready" -q -h "$RUN" -p "$p" -U postgres; then
    say "this checkout's cluster is already running on port $p (not $PORT); using it. 'bash server/cli/pg.sh stop' stops it."
    PORT="$p"
  fi
}

is_ours_running() {
  local pidfile="$DATA/postmaster.pid"
  [ -f "$pidfile" ] || return 1
  local pid; pid=$(head -n1 "$pidfile")
  [ -n "$pid" ] && [ -r "/proc/$pid/cmdline" ] || return 1
  awk '{exit !($3=="Z")}' "/proc/$pid/stat" 2>/dev/null && return 1   # a zombie is not a server
  tr '\0' ' ' < "/proc/$pid/cmdline" | grep -q -- "$DATA" || return 1
  "$BIN/pg_isready" -q -h "$RUN" -p "$PORT" -U postgres
}

clear_stale() {
  local pidfile="$DATA/postmaster.pid"
  [ -f "$pidfile" ] || return 0
  say "stale postmaster.pid found (server not running); waiting for old backends to exit, then removing it"
  for _ in $(seq 1 50); do
    local busy=0
    for p in /proc/[0-9]*; do
      [ "$(readlink "$p/cwd" 2>/dev/null)" = "$DATA" ] && busy=1 && break
    done
    [ $busy = 0 ] && break; sleep 0.1
  done
  rm -f "$pidfile" "$RUN/.s.PGSQL.$PORT.lock"
}

port_taken() { (exec 3<>"/dev/tcp/127.0.0.1/$PORT") 2>/dev/null; }

start() {
  local dbname="${1:-driftwarden}"
  ensure_installed; ensure_user; pick_dirs; adopt_running_port
  if [ ! -f "$DATA/PG_VERSION" ]; then
    say "initialising a new cluster in $DATA"
    mkdir -p "$DATA"; chown postgres:postgres "$DATA"
    as_pg "$BIN/initdb" -N -A trust -U postgres -E UTF8 --locale=C.UTF-8 -D "$DATA" >/dev/null
  fi
  if ! is_ours_running; then
    clear_stale
    if port_taken; then
      say "port $PORT on 127.0.0.1 is already in use by another program. Stop it, or set DW_PG_PORT to a free port, or set DATABASE_URL."
      exit 4
    fi
    as_pg "$BIN/pg_ctl" -D "$DATA" -l "$BASE/server.log" -w -t 30 -s \
      -o "-c listen_addresses=127.0.0.1 -p $PORT -k $RUN -c fsync=off -c synchronous_commit=off -c full_page_writes=off -c max_connections=200" start \
      || { say "PostgreSQL did not start; last log lines:"; tail -n 15 "$BASE/server.log" >&2; exit 5; }
  fi
  if ! as_pg "$BIN/psql" -h "$RUN" -p "$PORT" -U postgres -tAc "select 1 from pg_database where datname='$dbname'" | grep -q 1; then
    as_pg "$BIN/createdb" -h "$RUN" -p "$PORT" -U postgres "$dbname"
  fi
  echo "postgres://postgres@127.0.0.1:$PORT/$dbname"
}

stop() {
  pick_dirs; adopt_running_port
  if is_ours_running; then as_pg "$BIN/pg_ctl" -D "$DATA" -m fast -w -s stop; fi
}

where() { pick_dirs; adopt_running_port; printf 'data=%s\nrun=%s\nport=%s\n' "$DATA" "$RUN" "$PORT"; }

status() { pick_dirs; adopt_running_port; if is_ours_running; then echo "running on 127.0.0.1:$PORT ($DATA)"; else echo "stopped"; exit 1; fi; }

case "${1:-}" in
  ensure-installed) [ -n "${DATABASE_URL:-}" ] || ensure_installed ;;
  start) shift; start "$@" ;;
  stop) stop ;;
  status) status ;;
  where) where ;;
  *) echo "usage: pg.sh ensure-installed|start [db]|stop|status|where" >&2; exit 2 ;;
esac
