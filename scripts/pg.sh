#!/usr/bin/env bash
# PostgreSQL lifecycle for Brinkline: install Debian's postgresql-15 if missing, initdb, start on
# loopback at a non-default port, wait until ready, stop. Plain bash so it runs before `npm ci`.
#
#   scripts/pg.sh start   -> prints STARTED or ALREADY_RUNNING on the last line
#   scripts/pg.sh stop | status | url
#
# Settings (environment):
#   BRINKLINE_PGDATA   data directory (default /var/lib/brinkline/pgdata as root,
#                      ~/.local/share/brinkline/pgdata otherwise; never under /root, which the
#                      postgres user cannot traverse)
#   BRINKLINE_PGPORT   port on 127.0.0.1 (default 54329, so a system server on 5432 never clashes)
#   BRINKLINE_PGFSYNC  on|off (default on; only tests turn it off)
#   BRINKLINE_DB       database name (default brinkline)
set -euo pipefail

PGBIN=${PGBIN:-/usr/lib/postgresql/15/bin}
if [ "$(id -u)" = 0 ]; then DEFAULT_DATA=/var/lib/brinkline/pgdata; else DEFAULT_DATA="$HOME/.local/share/brinkline/pgdata"; fi
PGDATA=${BRINKLINE_PGDATA:-$DEFAULT_DATA}
PGPORT=${BRINKLINE_PGPORT:-54329}
FSYNC=${BRINKLINE_PGFSYNC:-on}
DB=${BRINKLINE_DB:-brinkline}

die() { echo "brinkline-pg: $*" >&2; exit 1; }

# As root the server runs as the postgres system user; otherwise as the current user.
as_owner() { if [ "$(id -u)" = 0 ]; then runuser -u postgres -- "$@"; else "$@"; fi; }

ensure_installed() {
  [ -x "$PGBIN/initdb" ] && return
  if [ "$(id -u)" = 0 ]; then
    echo "brinkline-pg: installing postgresql-15 from Debian…" >&2
    (apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq postgresql-15) >/dev/null \
      || die "could not install postgresql-15 with apt-get"
    # Debian's package starts its own cluster on 5432; we do not use it.
    pg_ctlcluster 15 main stop >/dev/null 2>&1 || true
  else
    die "PostgreSQL 15 is missing: install it with 'sudo apt-get install postgresql-15' (or set PGBIN)"
  fi
}

is_running() { as_owner "$PGBIN/pg_ctl" -D "$PGDATA" status >/dev/null 2>&1; }

port_in_use() { (exec 3<>"/dev/tcp/127.0.0.1/$PGPORT") 2>/dev/null; }

ensure_datadir() {
  local owner; owner=$( [ "$(id -u)" = 0 ] && echo postgres || id -un )
  if [ -d "$PGDATA" ] && [ -n "$(ls -A "$PGDATA" 2>/dev/null)" ]; then
    local actual; actual=$(stat -c %U "$PGDATA")
    [ "$actual" = "$owner" ] || die "data directory $PGDATA is owned by '$actual', expected '$owner' (choose another BRINKLINE_PGDATA)"
    [ -f "$PGDATA/PG_VERSION" ] || die "$PGDATA is not empty and is not a PostgreSQL data directory"
    return
  fi
  mkdir -p "$PGDATA"
  [ "$(id -u)" = 0 ] && chown postgres:postgres "$PGDATA"
  chmod 700 "$PGDATA"
  as_owner "$PGBIN/initdb" -D "$PGDATA" -U postgres --auth=trust --encoding=UTF8 --locale=C.UTF-8 >/dev/null \
    || die "initdb failed for $PGDATA (every parent directory must be readable by the server's user)"
}

start() {
  ensure_installed
  if [ -f "$PGDATA/PG_VERSION" ] && is_running; then echo ALREADY_RUNNING; return; fi
  port_in_use && die "port $PGPORT on 127.0.0.1 is already in use (set BRINKLINE_PGPORT to a free port)"
  ensure_datadir
  as_owner "$PGBIN/pg_ctl" -D "$PGDATA" -w -t 60 -l "$PGDATA/server.log" \
    -o "-p $PGPORT -c listen_addresses=127.0.0.1 -k $PGDATA -c fsync=$FSYNC -c max_connections=200 -c shared_buffers=256MB" \
    start >/dev/null || die "PostgreSQL did not start; see $PGDATA/server.log"
  for _ in $(seq 1 60); do
    "$PGBIN/pg_isready" -q -h 127.0.0.1 -p "$PGPORT" && break
    sleep 0.5
  done
  "$PGBIN/psql" -h 127.0.0.1 -p "$PGPORT" -U postgres -d postgres -tAc "SELECT 1 FROM pg_database WHERE datname='$DB'" | grep -q 1 \
    || "$PGBIN/createdb" -h 127.0.0.1 -p "$PGPORT" -U postgres "$DB"
  echo STARTED
}

stop() {
  is_running || return 0
  as_owner "$PGBIN/pg_ctl" -D "$PGDATA" -w -m fast stop >/dev/null
}

case "${1:-}" in
  start) start ;;
  stop) stop ;;
  status) if is_running; then echo running; else echo stopped; fi ;;
  url) echo "postgres://postgres@127.0.0.1:$PGPORT/$DB" ;;
  *) die "usage: scripts/pg.sh start|stop|status|url" ;;
esac
