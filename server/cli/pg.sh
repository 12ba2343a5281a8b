#!/usr/bin/env bash
# Project-local PostgreSQL cluster for development and tests.
#   pg.sh ensure-installed   install Debian's postgresql when its binaries are missing
#   pg.sh start [dbname]     init (first time) + start; prints the DATABASE_URL as the last line
#   pg.sh stop               fast shutdown
#   pg.sh status
# Listens on 127.0.0.1 only, port $DW_PG_PORT (default 54329). Data lives in .pg/ (git-ignored) or $DW_PG_DIR.
# trust auth and fsync=off are for dev/test only; point DATABASE_URL at a real server for real data.
set -euo pipefail

ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/../.." && pwd)"
PORT="${DW_PG_PORT:-54329}"
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
    local h; h=$(echo -n "$BASE" | sha1sum | cut -c1-10)
    BASE="/tmp/dw-pg-$h"; DATA="$BASE/data"; RUN="$BASE/run"
    mkdir -p "$BASE"
  fi
  if [ ${#RUN} -gt 80 ]; then RUN="/tmp/dw-pg-run-$(echo -n "$BASE" | sha1sum | cut -c1-10)"; fi
  mkdir -p "$RUN"; chown postgres:postgres "$BASE" "$RUN"; chmod 700 "$BASE"
}

as_pg() { if [ "$(id -u)" = 0 ]; then runuser -u postgres -- "$@"; else "$@"; fi; }

ensure_user() {
  id postgres >/dev/null 2>&1 || useradd --system --home-dir /var/lib/postgresql --shell /bin/bash postgres
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
  ensure_installed; ensure_user; pick_dirs
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
  pick_dirs
  if is_ours_running; then as_pg "$BIN/pg_ctl" -D "$DATA" -m fast -w -s stop; fi
}

status() { pick_dirs; if is_ours_running; then echo "running on 127.0.0.1:$PORT ($DATA)"; else echo "stopped"; exit 1; fi; }

case "${1:-}" in
  ensure-installed) [ -n "${DATABASE_URL:-}" ] || ensure_installed ;;
  start) shift; start "$@" ;;
  stop) stop ;;
  status) status ;;
  *) echo "usage: pg.sh ensure-installed|start [db]|stop|status" >&2; exit 2 ;;
esac
