#!/usr/bin/env bash
# `npm start`: everything a new machine needs, then the demo plant running. Ctrl-C stops what
# this script started; the next start finds the data where it was left.
set -euo pipefail
cd "$(dirname "$0")/.."
source scripts/lib.sh

export BRINKLINE_STATE_DIR=${BRINKLINE_STATE_DIR:-$PWD/.data}
mkdir -p "$BRINKLINE_STATE_DIR"
PORT=${PORT:-3000}
HOST=${HOST:-127.0.0.1}
URL="http://$HOST:$PORT"

ensure_node_modules

PG_STATE=$(scripts/pg.sh start | tail -1)
PIDS=()
cleanup() {
  trap - INT TERM EXIT
  echo; echo "» stopping…"
  for pid in "${PIDS[@]}"; do kill "$pid" 2>/dev/null || true; done
  # Give each a few seconds to flush (the simulators try to deliver what they buffered).
  for _ in $(seq 1 20); do
    alive=0; for pid in "${PIDS[@]}"; do kill -0 "$pid" 2>/dev/null && alive=1; done
    [ $alive = 0 ] && break; sleep 0.5
  done
  for pid in "${PIDS[@]}"; do kill -9 "$pid" 2>/dev/null || true; done
  if [ "$PG_STATE" = STARTED ]; then scripts/pg.sh stop; echo "» PostgreSQL stopped"; fi
}
trap cleanup INT TERM EXIT

# Secrets made once per installation and kept in the state dir (never committed).
CREDS="$BRINKLINE_STATE_DIR/demo-credentials.env"
if [ ! -f "$CREDS" ]; then
  umask 077
  { echo "BRINKLINE_DEMO_PASSWORD=$(random_secret 12)"
    echo "BRINKLINE_SIM_KEY=bk_$(random_secret 40)"
    echo "NUXT_SESSION_PASSWORD=$(random_secret 48)"; } > "$CREDS"
fi
set -a; source "$CREDS"; set +a

# The server connects as a role that owns no tables; migrations run as the schema owner
# (scripts/pg.sh). A database given from outside brings its own addresses.
if [ -z "${NUXT_DATABASE_URL:-}" ]; then
  export NUXT_DATABASE_URL=$(scripts/pg.sh url app)
  export NUXT_MIGRATION_DATABASE_URL=${NUXT_MIGRATION_DATABASE_URL:-$(scripts/pg.sh url owner)}
fi
export NUXT_PUBLIC_URL=$URL
export MAIL_SMTP_PORT=${MAIL_SMTP_PORT:-1025} MAIL_HTTP_PORT=${MAIL_HTTP_PORT:-1080}
export NUXT_SMTP_URL=${NUXT_SMTP_URL:-smtp://127.0.0.1:$MAIL_SMTP_PORT}
export BRINKLINE_SEED_DEMO=1
# The simulators serve the OPC UA units (shared/demo/opcuaDemo.ts) on this loopback port, and the
# seed connects Brinkline's collector to it; the client keeps its certificates in the state dir.
export BRINKLINE_DEMO_OPCUA_PORT=${BRINKLINE_DEMO_OPCUA_PORT:-4840}
export BRINKLINE_OPCUA_PKI_DIR=${BRINKLINE_OPCUA_PKI_DIR:-$BRINKLINE_STATE_DIR/opcua-pki}

ensure_build

if [ -f scripts/mailbox/localMailbox.ts ]; then
  open_run_log "$BRINKLINE_STATE_DIR/mail-catcher.log"
  MAIL_DIR="$BRINKLINE_STATE_DIR/mail" node --import tsx scripts/mailbox/localMailbox.ts >> "$BRINKLINE_STATE_DIR/mail-catcher.log" 2>&1 &
  PIDS+=($!)
fi

open_run_log "$BRINKLINE_STATE_DIR/server.log"
PORT=$PORT HOST=$HOST node .output/server/index.mjs >> "$BRINKLINE_STATE_DIR/server.log" 2>&1 &
PIDS+=($!)
wait_for_health "$URL" 240 || { tail -30 "$BRINKLINE_STATE_DIR/server.log"; echo "server did not become healthy" >&2; exit 1; }

if [ -f simulators/run.ts ]; then
  open_run_log "$BRINKLINE_STATE_DIR/simulators.log"
  # The key reaches the simulators through the environment (BRINKLINE_SIM_KEY, exported above from
  # the credentials file), never on the command line, where `ps` would show it to every user.
  SIM_OPCUA_PKI_DIR="$BRINKLINE_STATE_DIR/opcua-plant-pki" node --import tsx simulators/run.ts --unit all --url "$URL" \
    --backfill-hours "${SIM_BACKFILL_HOURS:-6}" --opcua-port "$BRINKLINE_DEMO_OPCUA_PORT" \
    >> "$BRINKLINE_STATE_DIR/simulators.log" 2>&1 &
  PIDS+=($!)
fi

cat <<INFO

  Brinkline is running:  $URL
  Local mailbox:         http://127.0.0.1:$MAIL_HTTP_PORT
  Demo plant OPC UA:     opc.tcp://127.0.0.1:$BRINKLINE_DEMO_OPCUA_PORT (T-400 comes this way; Admin → OPC UA)

  Demo sign-ins (password for all: $BRINKLINE_DEMO_PASSWORD)
    operator    operator@harrowgate.example
    engineer    engineer@harrowgate.example
    supervisor  supervisor@harrowgate.example
    admin       admin@harrowgate.example

  Logs in $BRINKLINE_STATE_DIR. Advisory only: follow the plant's operating procedures.
  Press Ctrl-C to stop.
INFO
wait -n "${PIDS[@]}" || true
