#!/usr/bin/env bash
# Project-local PostgreSQL cluster on 127.0.0.1:54329 (never the system cluster).
#   bash db/cluster.sh start|stop|status|psql [db]
# Data, socket and log live in <repo>/.local/pg (git-ignored). When the postgres
# user cannot reach the checkout (e.g. a clone under /root), the cluster lives in
# /var/tmp/cellwright-pg-<hash of the repo path> instead; `status` prints where.
set -euo pipefail

REPO="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
PG_PORT="${PG_PORT:-54329}"
PG_APP_USER="cellwright"
PG_APP_PASSWORD="cellwright"
# Dev data; Playwright's database; the integration tests' own database (so the two suites never reset each other).
DATABASES=(cellwright cellwright_test cellwright_integration_test)

pg_bin() {
  local dir
  dir="$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -n 1 || true)"
  if [[ -z "$dir" || ! -x "$dir/initdb" ]]; then
    echo "PostgreSQL server binaries not found under /usr/lib/postgresql/*/bin (apt-get install -y postgresql)" >&2
    exit 1
  fi
  echo "$dir"
}

# Pick the cluster root: inside the checkout if postgres can traverse it.
cluster_root() {
  if [[ -n "${CELLWRIGHT_PG_ROOT:-}" ]]; then echo "$CELLWRIGHT_PG_ROOT"; return; fi
  mkdir -p "$REPO/.local"
  if runuser -u postgres -- test -x "$REPO/.local" 2>/dev/null; then
    echo "$REPO/.local/pg"
  else
    echo "/var/tmp/cellwright-pg-$(printf '%s' "$REPO" | sha256sum | cut -c1-12)"
  fi
}

ROOT="$(cluster_root)"
DATA="$ROOT/data"
RUN="$ROOT/run"
LOG="$ROOT/log/postgresql.log"

as_pg() { runuser -u postgres -- "$@"; }

is_running() {
  [[ -f "$DATA/PG_VERSION" ]] && as_pg "$(pg_bin)/pg_ctl" -D "$DATA" status >/dev/null 2>&1
}

psql_admin() {
  as_pg "$(pg_bin)/psql" -h "$RUN" -p "$PG_PORT" -U postgres -d postgres -v ON_ERROR_STOP=1 -qAt "$@"
}

init_cluster() {
  local bin; bin="$(pg_bin)"
  mkdir -p "$ROOT" "$RUN" "$(dirname "$LOG")"
  chown postgres:postgres "$ROOT" "$RUN" "$(dirname "$LOG")"
  chmod 700 "$ROOT"
  if [[ ! -f "$DATA/PG_VERSION" ]]; then
    mkdir -p "$DATA"; chown postgres:postgres "$DATA"; chmod 700 "$DATA"
    as_pg "$bin/initdb" -D "$DATA" -U postgres --encoding=UTF8 --locale=C.UTF-8 \
      --auth-local=trust --auth-host=scram-sha-256 >/dev/null
    cat >>"$DATA/postgresql.conf" <<CONF
# Cellwright project-local cluster
listen_addresses = '127.0.0.1'
port = $PG_PORT
unix_socket_directories = '$RUN'
fsync = off
synchronous_commit = off
CONF
  fi
}

ensure_databases() {
  if [[ "$(psql_admin -c "select 1 from pg_roles where rolname='$PG_APP_USER'")" != "1" ]]; then
    psql_admin -c "create role $PG_APP_USER login password '$PG_APP_PASSWORD'"
  fi
  for db in "${DATABASES[@]}"; do
    if [[ "$(psql_admin -c "select 1 from pg_database where datname='$db'")" != "1" ]]; then
      psql_admin -c "create database $db owner $PG_APP_USER"
    fi
  done
}

start() {
  init_cluster
  if ! is_running; then
    as_pg "$(pg_bin)/pg_ctl" -D "$DATA" -l "$LOG" -w -t 30 start >/dev/null
  fi
  ensure_databases
  echo "PostgreSQL running on 127.0.0.1:$PG_PORT (data: $DATA)"
}

stop() {
  if is_running; then
    as_pg "$(pg_bin)/pg_ctl" -D "$DATA" -m fast -w stop >/dev/null
    echo "PostgreSQL stopped"
  else
    echo "PostgreSQL not running"
  fi
}

status() {
  if is_running; then
    echo "running on 127.0.0.1:$PG_PORT (data: $DATA)"
  else
    echo "stopped (data: $DATA)"
    return 3
  fi
}

case "${1:-}" in
  start) start ;;
  stop) stop ;;
  status) status ;;
  psql) shift; db="${1:-cellwright}"; shift || true
        PGPASSWORD="$PG_APP_PASSWORD" exec psql -h 127.0.0.1 -p "$PG_PORT" -U "$PG_APP_USER" -d "$db" "$@" ;;
  *) echo "usage: bash db/cluster.sh start|stop|status|psql [database]" >&2; exit 2 ;;
esac
