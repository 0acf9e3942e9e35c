#!/usr/bin/env bash
# Local PostgreSQL for development and tests: a cluster of our own on 127.0.0.1, TCP only.
#   bash db/pg.sh start    initialise (first time), start, create role and databases
#   bash db/pg.sh stop     stop the cluster
#   bash db/pg.sh status   say where it lives and whether it runs
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/env.sh"

log() { echo "[db] $*"; }

find_bin() {
  local d
  for d in /usr/lib/postgresql/*/bin; do
    [ -x "$d/initdb" ] && { PGBIN="$d"; }
  done
  [ -n "${PGBIN:-}" ]
}

ensure_installed() {
  if find_bin; then return 0; fi
  if [ "$(id -u)" = 0 ]; then
    log "PostgreSQL binaries missing: installing Debian's postgresql package"
    DEBIAN_FRONTEND=noninteractive apt-get update -qq
    DEBIAN_FRONTEND=noninteractive apt-get install -y -qq postgresql >/dev/null
    find_bin || { log "postgresql installed but initdb not found"; exit 1; }
  else
    echo "PostgreSQL is not installed. Install it with: sudo apt-get install -y postgresql" >&2
    exit 1
  fi
}

# As root the server must run as 'postgres'; the data folder must be reachable by that user.
as_pg() {
  if [ "$(id -u)" = 0 ]; then runuser -u postgres -- "$@"; else "$@"; fi
}

choose_dir() {
  local want="$QUELL_DATA/pg"
  if [ -n "${QUELL_PGDATA:-}" ]; then PGDATA_DIR="$QUELL_PGDATA"; return; fi
  mkdir -p "$QUELL_DATA"
  if [ "$(id -u)" != 0 ]; then PGDATA_DIR="$want"; return; fi
  if runuser -u postgres -- test -x "$QUELL_DATA" 2>/dev/null; then
    PGDATA_DIR="$want"
  else
    local h
    h=$(printf '%s' "$QUELL_ROOT" | cksum | cut -d' ' -f1)
    PGDATA_DIR="${TMPDIR:-/tmp}/quell-pg-$h"
    FALLBACK_REASON="the postgres user cannot reach $QUELL_DATA"
  fi
}

is_ready() { "$PGBIN/pg_isready" -q -h "$QUELL_PG_HOST" -p "$QUELL_PG_PORT" >/dev/null 2>&1; }

psql_admin() {
  as_pg "$PGBIN/psql" -h "$QUELL_PG_HOST" -p "$QUELL_PG_PORT" -U postgres -d postgres -v ON_ERROR_STOP=1 -qtA "$@"
}

start() {
  ensure_installed
  choose_dir
  if [ ! -f "$PGDATA_DIR/PG_VERSION" ]; then
    log "initialising a cluster in $PGDATA_DIR${FALLBACK_REASON:+ ($FALLBACK_REASON)}"
    mkdir -p "$PGDATA_DIR"
    [ "$(id -u)" = 0 ] && chown postgres:postgres "$PGDATA_DIR"
    chmod 700 "$PGDATA_DIR"
    as_pg "$PGBIN/initdb" -D "$PGDATA_DIR" -U postgres --auth=trust -E UTF8 --locale=C.UTF-8 >/dev/null
    cat >> "$PGDATA_DIR/postgresql.conf" <<CONF
listen_addresses = '127.0.0.1'
unix_socket_directories = ''
fsync = off
synchronous_commit = off
full_page_writes = off
max_connections = 100
CONF
  fi
  if ! is_ready; then
    as_pg "$PGBIN/pg_ctl" -D "$PGDATA_DIR" -o "-p $QUELL_PG_PORT" -l "$PGDATA_DIR/server.log" -w -t 30 start >/dev/null
    local i=0
    until is_ready; do i=$((i+1)); [ $i -gt 100 ] && { log "PostgreSQL did not become ready"; tail -20 "$PGDATA_DIR/server.log" >&2; exit 1; }; sleep 0.1; done
    log "PostgreSQL up on $QUELL_PG_HOST:$QUELL_PG_PORT"
  fi
  if [ "$(psql_admin -c "select 1 from pg_roles where rolname='$QUELL_PG_USER'")" != 1 ]; then
    psql_admin -c "create role \"$QUELL_PG_USER\" login password '$QUELL_PG_PASSWORD' createdb"
  fi
  local db
  for db in "$@"; do
    if [ "$(psql_admin -c "select 1 from pg_database where datname='$db'")" != 1 ]; then
      psql_admin -c "create database \"$db\" owner \"$QUELL_PG_USER\""
      log "created database $db"
    fi
  done
}

stop() {
  find_bin || exit 0
  choose_dir
  if [ -f "$PGDATA_DIR/PG_VERSION" ] && is_ready; then
    as_pg "$PGBIN/pg_ctl" -D "$PGDATA_DIR" -m fast -w stop >/dev/null && log "PostgreSQL stopped"
  else
    log "PostgreSQL is not running"
  fi
}

# Drop and recreate one database (the test command starts from an empty one).
recreate() {
  local db="$1"
  psql_admin -c "drop database if exists \"$db\" with (force)"
  psql_admin -c "create database \"$db\" owner \"$QUELL_PG_USER\""
}

cmd="${1:-start}"; shift || true
case "$cmd" in
  start) start "${@:-$QUELL_DB}" ;;
  stop) stop ;;
  recreate) ensure_installed; choose_dir; recreate "$1" ;;
  status) ensure_installed; choose_dir; if is_ready; then echo "running: $PGDATA_DIR port $QUELL_PG_PORT"; else echo "stopped: $PGDATA_DIR"; fi ;;
  *) echo "usage: db/pg.sh start|stop|status|recreate DB" >&2; exit 2 ;;
esac
