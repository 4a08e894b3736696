#!/usr/bin/env bash
# Project-owned PostgreSQL cluster: .data/pg, listening on 127.0.0.1 only, on a non-default port.
# Usage: scripts/db.sh start|stop|status|psql [db]|reset-db <name>
# BAYWARD_PG_DATA (default .data/pg) and BAYWARD_PG_PORT select another, private cluster; its socket
# folder and log file sit beside its data folder.
set -euo pipefail
cd "$(dirname "$0")/.."
ROOT=$(pwd)
PGPORT=${BAYWARD_PG_PORT:-54329}
DATA=${BAYWARD_PG_DATA:-.data/pg}
case "$DATA" in /*) ;; *) DATA="$ROOT/$DATA" ;; esac
DATA=${DATA%/}
SOCK="$DATA-socket"
LOG="$DATA.log"
DATABASES=${BAYWARD_DATABASES:-"bayward bayward_test bayward_test_seed"}

find_bin() {
  for dir in /usr/lib/postgresql/*/bin; do
    [ -x "$dir/pg_ctl" ] && [ -x "$dir/initdb" ] && [ -x "$dir/postgres" ] && { echo "$dir"; return 0; }
  done
  return 1
}

ensure_server() {
  if BIN=$(find_bin); then return 0; fi
  echo "PostgreSQL server binaries not found; installing Debian's postgresql package…" >&2
  if [ "$(id -u)" -ne 0 ] || ! command -v apt-get >/dev/null; then
    echo "error: cannot install postgresql (need root and apt-get). Install it: apt-get install -y postgresql" >&2
    exit 1
  fi
  export DEBIAN_FRONTEND=noninteractive
  apt-get update -qq >/dev/null && apt-get install -y -qq --no-install-recommends postgresql >/dev/null || {
    echo "error: apt-get install postgresql failed" >&2; exit 1; }
  BIN=$(find_bin) || { echo "error: postgresql installed but no server binaries found" >&2; exit 1; }
}

# Runs a server binary as the postgres OS user when we are root (initdb refuses root).
as_owner() {
  if [ "$(id -u)" -eq 0 ]; then runuser -u postgres -- "$@"; else "$@"; fi
}

running() { as_owner "$BIN/pg_ctl" -D "$DATA" status >/dev/null 2>&1; }

init_cluster() {
  [ -f "$DATA/PG_VERSION" ] && return 0
  mkdir -p "$DATA" "$SOCK"
  if [ "$(id -u)" -eq 0 ]; then
    chown postgres:postgres "$DATA" "$SOCK"
    chmod 700 "$DATA"
    # every parent of the data folder must be traversable by the postgres user
    p="$ROOT"; while [ "$p" != "/" ]; do chmod o+x "$p" 2>/dev/null || true; p=$(dirname "$p"); done
  fi
  as_owner "$BIN/initdb" -D "$DATA" -U postgres --auth=trust --encoding=UTF8 --locale=C.UTF-8 >/dev/null
  cat >> "$DATA/postgresql.conf" <<CONF
listen_addresses = '127.0.0.1'
port = $PGPORT
unix_socket_directories = '$SOCK'
max_connections = 200
shared_buffers = 256MB
fsync = on
CONF
  # Loopback only; this cluster is for development and tests on one machine.
  cat > "$DATA/pg_hba.conf" <<HBA
local all all trust
host  all all 127.0.0.1/32 trust
HBA
}

start() {
  ensure_server
  init_cluster
  if ! running; then
    # a pid file left by a killed server would stop pg_ctl from starting a new one
    if [ -f "$DATA/postmaster.pid" ]; then
      pid=$(head -1 "$DATA/postmaster.pid")
      if ! kill -0 "$pid" 2>/dev/null; then rm -f "$DATA/postmaster.pid"; fi
    fi
    touch "$LOG"; [ "$(id -u)" -eq 0 ] && chown postgres:postgres "$LOG"
    as_owner "$BIN/pg_ctl" -D "$DATA" -l "$LOG" -w -t 30 start >/dev/null || { tail -20 "$LOG" >&2; exit 1; }
  fi
  psql_admin -tAc "SELECT 1 FROM pg_roles WHERE rolname='bayward'" | grep -q 1 ||
    psql_admin -qc "CREATE ROLE bayward LOGIN CREATEDB"
  for db in $DATABASES; do create_db "$db"; done
  echo "PostgreSQL running on 127.0.0.1:$PGPORT (databases: $DATABASES)"
}

create_db() {
  psql_admin -tAc "SELECT 1 FROM pg_database WHERE datname='$1'" | grep -q 1 ||
    psql_admin -qc "CREATE DATABASE \"$1\" OWNER bayward"
}

psql_admin() { "$BIN/psql" -h 127.0.0.1 -p "$PGPORT" -U postgres -d postgres -v ON_ERROR_STOP=1 "$@"; }

cmd=${1:-status}
case "$cmd" in
  start) start ;;
  stop)
    ensure_server
    if [ -f "$DATA/PG_VERSION" ] && running; then as_owner "$BIN/pg_ctl" -D "$DATA" -m fast -w stop >/dev/null; fi
    echo "PostgreSQL stopped" ;;
  status)
    ensure_server
    if [ -f "$DATA/PG_VERSION" ] && running; then echo "running on 127.0.0.1:$PGPORT"; else echo "stopped"; exit 3; fi ;;
  psql) ensure_server; exec "$BIN/psql" -h 127.0.0.1 -p "$PGPORT" -U bayward -d "${2:-bayward}" ;;
  create-db) ensure_server; create_db "$2" ;;
  drop-db) ensure_server; psql_admin -qc "DROP DATABASE IF EXISTS \"$2\" WITH (FORCE)" ;;
  *) echo "usage: $0 start|stop|status|psql [db]|create-db <name>|drop-db <name>" >&2; exit 2 ;;
esac
