# Shared by start.sh and test.sh (sourced, not run).

# npm ci when node_modules is missing or older than package-lock.json's content.
ensure_node_modules() {
  local want have=""
  want=$(sha256sum package-lock.json | cut -d' ' -f1)
  [ -f node_modules/.brinkline-lock-hash ] && have=$(cat node_modules/.brinkline-lock-hash)
  if [ "$want" != "$have" ]; then
    echo "» installing dependencies (npm ci)…"
    npm ci --no-audit --no-fund --loglevel=error
    echo "$want" > node_modules/.brinkline-lock-hash
  fi
}

# Content hash of everything the build reads; a build is reused while it matches.
source_hash() {
  find app server shared drizzle nuxt.config.ts tailwind.config.ts tsconfig.json package-lock.json \
    -type f -print0 2>/dev/null | sort -z | xargs -0 sha256sum | sha256sum | cut -d' ' -f1
}

# Several runs on one checkout (tests, benchmarks, start) share .nuxt/ and .output/: one build
# or test run at a time holds this lock, so none reads a build another is replacing.
take_build_lock() {
  [ -n "${BRINKLINE_BUILD_LOCKED:-}" ] && return
  exec 9>"${TMPDIR:-/tmp}/brinkline-build-$(echo "$PWD" | sha256sum | head -c 12).lock"
  flock 9 || true
  export BRINKLINE_BUILD_LOCKED=1
}

ensure_build() {
  take_build_lock
  local want; want=$(source_hash)
  if [ ! -f .output/.brinkline-build-hash ] || [ "$(cat .output/.brinkline-build-hash)" != "$want" ]; then
    echo "» building (sources changed)…"
    npx nuxt build > "${BUILD_LOG:-/tmp/brinkline-build.log}" 2>&1 || { tail -40 "${BUILD_LOG:-/tmp/brinkline-build.log}"; echo "build failed" >&2; exit 1; }
    echo "$want" > .output/.brinkline-build-hash
  fi
}

# Waits until the server's health route answers (database included).
wait_for_health() {
  local url=$1 tries=${2:-120}
  for _ in $(seq 1 "$tries"); do
    curl -fsS "$url/api/public/health" >/dev/null 2>&1 && return 0
    sleep 0.5
  done
  return 1
}

random_secret() { head -c 32 /dev/urandom | base64 | tr -dc 'A-Za-z0-9' | head -c "${1:-32}"; }

# Opens a log for this run: the previous runs' lines are kept (the file is appended to, each run
# starting with a banner), and a file past BRINKLINE_LOG_MAX_BYTES (default 20 MB) moves to .1,
# .1 to .2 … up to BRINKLINE_LOG_KEEP (default 5) old files, so logs never grow without bound.
open_run_log() {
  local log=$1 max=${BRINKLINE_LOG_MAX_BYTES:-20000000} keep=${BRINKLINE_LOG_KEEP:-5}
  if [ -f "$log" ] && [ "$(stat -c %s "$log")" -gt "$max" ]; then
    for i in $(seq $((keep - 1)) -1 1); do [ -f "$log.$i" ] && mv -f "$log.$i" "$log.$((i + 1))"; done
    mv -f "$log" "$log.1"
  fi
  echo "===== $(date -u +%Y-%m-%dT%H:%M:%SZ) npm start (pid $$) =====" >> "$log"
}
