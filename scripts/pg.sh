#!/usr/bin/env bash
# PostgreSQL lifecycle for Brinkline: install Debian's postgresql-15 if missing, initdb, start on
# loopback at a non-default port, wait until ready, stop. Plain bash so it runs before `npm ci`.
#
#   scripts/pg.sh start   -> prints STARTED or ALREADY_RUNNING on the last line
#   scripts/pg.sh stop | status
#   scripts/pg.sh url [app|owner]  the superuser's address, or the app's or the schema owner's
#
# Database roles (issue 13 item 8): brinkline_owner owns the schema and runs the migrations;
# brinkline_app, which the server connects as, owns no tables and may only read and append to
# audit_log and alarm_events (the server grants that after migrating). Both are made at every start
# if missing (loopback trust authentication, so no passwords are stored).
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
  if [ -f "$PGDATA/PG_VERSION" ] && is_running; then ensure_roles; echo ALREADY_RUNNING; return; fi
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
  ensure_roles
  echo STARTED
}

# The two roles, and the database's objects owned by the owner role. A database first migrated
# by the superuser (before these roles existed) has its objects handed over, so nothing needs
# migrating by hand; pg-boss's queue schema goes to the app, which manages it.
ensure_roles() {
  "$PGBIN/psql" -q -v ON_ERROR_STOP=1 -h 127.0.0.1 -p "$PGPORT" -U postgres -d "$DB" >/dev/null <<SQL || die "could not set up the database roles"
DO \$\$ BEGIN
  IF NOT EXISTS (SELECT 1 FROM pg_roles WHERE rolname = 'brinkline_owner') THEN CREATE ROLE brinkline_owner LOGIN; END IF;
  IF NOT EXISTS (SELECT 1 FROM pg_roles WHERE rolname = 'brinkline_app') THEN CREATE ROLE brinkline_app LOGIN; END IF;
END \$\$;
ALTER DATABASE "$DB" OWNER TO brinkline_owner;
GRANT CONNECT, CREATE ON DATABASE "$DB" TO brinkline_app;
DO \$\$ DECLARE r record; BEGIN
  FOR r IN SELECT n.nspname, c.relname, c.relkind FROM pg_class c JOIN pg_namespace n ON n.oid = c.relnamespace
    WHERE n.nspname IN ('public', 'drizzle', 'pgboss') AND c.relkind IN ('r', 'p', 'S', 'v')
      AND NOT (c.relkind = 'S' AND EXISTS (SELECT 1 FROM pg_depend d WHERE d.objid = c.oid AND d.deptype IN ('a', 'i')))
      AND pg_get_userbyid(c.relowner) = 'postgres' LOOP
    EXECUTE format('ALTER %s %I.%I OWNER TO %I', CASE r.relkind WHEN 'S' THEN 'SEQUENCE' WHEN 'v' THEN 'VIEW' ELSE 'TABLE' END,
      r.nspname, r.relname, CASE r.nspname WHEN 'pgboss' THEN 'brinkline_app' ELSE 'brinkline_owner' END);
  END LOOP;
  FOR r IN SELECT nspname FROM pg_namespace WHERE nspname IN ('drizzle', 'pgboss') AND pg_get_userbyid(nspowner) = 'postgres' LOOP
    EXECUTE format('ALTER SCHEMA %I OWNER TO %I', r.nspname, CASE r.nspname WHEN 'pgboss' THEN 'brinkline_app' ELSE 'brinkline_owner' END);
  END LOOP;
  FOR r IN SELECT p.oid::regprocedure AS fn FROM pg_proc p JOIN pg_namespace n ON n.oid = p.pronamespace
    WHERE n.nspname = 'public' AND pg_get_userbyid(p.proowner) = 'postgres' LOOP
    EXECUTE format('ALTER FUNCTION %s OWNER TO brinkline_owner', r.fn);
  END LOOP;
END \$\$;
SQL
}

stop() {
  is_running || return 0
  as_owner "$PGBIN/pg_ctl" -D "$PGDATA" -w -m fast stop >/dev/null
}

case "${1:-}" in
  start) start ;;
  stop) stop ;;
  status) if is_running; then echo running; else echo stopped; fi ;;
  url) case "${2:-}" in
      '') echo "postgres://postgres@127.0.0.1:$PGPORT/$DB" ;;
      app) echo "postgres://brinkline_app@127.0.0.1:$PGPORT/$DB" ;;
      owner) echo "postgres://brinkline_owner@127.0.0.1:$PGPORT/$DB" ;;
      *) die "usage: scripts/pg.sh url [app|owner]" ;;
    esac ;;
  *) die "usage: scripts/pg.sh start|stop|status|url [app|owner]" ;;
esac
