#!/usr/bin/env bash
# `npm test`: the whole suite from a fresh clone — dependencies, Chromium, a throwaway PostgreSQL,
# one build — then unit, e2e and browser layers. Ends with one "N passed, N failed" line.
set -euo pipefail
cd "$(dirname "$0")/.."
source scripts/lib.sh

ensure_node_modules
# Held for the whole run: another run must not rebuild .output under our servers.
take_build_lock

if [ ! -x /usr/bin/chromium ]; then
  if [ "$(id -u)" = 0 ]; then
    echo "» installing Chromium from Debian…"
    (apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium) >/dev/null
  else
    echo "Chromium is missing: install it with 'sudo apt-get install chromium'" >&2; exit 1
  fi
fi

# Our own PostgreSQL: fresh data dir, free port, fsync off (tests never need durability).
export BRINKLINE_PGDATA=$(mktemp -d /tmp/brinkline-test-pg.XXXXXX)
export BRINKLINE_PGPORT=${BRINKLINE_TEST_PGPORT:-$(node -e "const s=require('net').createServer().listen(0,'127.0.0.1',()=>{console.log(s.address().port);s.close()})")}
export BRINKLINE_PGFSYNC=off
OUT=${TEST_OUTPUT_DIR:-$PWD/test-output}
rm -rf "$OUT"; mkdir -p "$OUT/screenshots"
cleanup() { scripts/pg.sh stop || true; rm -rf "$BRINKLINE_PGDATA"; }
trap cleanup EXIT
scripts/pg.sh start >/dev/null

export NUXT_DATABASE_URL=$(scripts/pg.sh url)
export DATABASE_URL=$NUXT_DATABASE_URL
export NUXT_SESSION_PASSWORD=test-session-password-at-least-32-characters
export BRINKLINE_DEMO_PASSWORD=demo-test-password
export BRINKLINE_SEED_DEMO=1
export BRINKLINE_SIM_KEY=bk_test_simulator_key_for_the_demo_gateway_000
export TEST_OUTPUT_DIR=$OUT

BUILD_LOG="$OUT/build.log" ensure_build

set +e
npx vitest run --reporter=default --reporter=json --outputFile.json="$OUT/vitest.json" "$@"
STATUS=$?
# The type check counts as one more test; it runs on full-suite runs (no filter given).
TYPES_PASSED=0; TYPES_FAILED=0
if [ $# -eq 0 ]; then
  echo "» type check (vue-tsc)…"
  # `nuxt build` writes its types under node_modules/.cache; tsconfig.json reads .nuxt/, which
  # only `nuxt prepare` writes. Without it a clean clone would check nothing.
  if npx nuxt prepare > "$OUT/typecheck.log" 2>&1 && npx vue-tsc -b --noEmit >> "$OUT/typecheck.log" 2>&1; then TYPES_PASSED=1; else TYPES_FAILED=1; STATUS=1; cat "$OUT/typecheck.log"; fi
fi
set -e
node -e "
  const r = JSON.parse(require('fs').readFileSync('$OUT/vitest.json', 'utf8'))
  console.log('')
  console.log(\`\${r.numPassedTests + $TYPES_PASSED} passed, \${r.numFailedTests + $TYPES_FAILED} failed\` + (r.numPendingTests ? \`, \${r.numPendingTests} skipped\` : ''))
  if (r.numTotalTests === 0) process.exit(1)
" || STATUS=1
exit $STATUS
