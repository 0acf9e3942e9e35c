# Shared steps of the start and test commands (sourced, not run).
set -euo pipefail
cd "$(dirname "${BASH_SOURCE[0]}")/.."
source db/env.sh

say() { echo "[quell] $*"; }

# npm dependencies: install when node_modules is missing or older than the lock file.
ensure_deps() {
  local stamp=node_modules/.package-lock.json
  if [ ! -d node_modules ] || [ ! -f "$stamp" ] || [ package-lock.json -nt "$stamp" ] || [ package.json -nt "$stamp" ]; then
    say "installing npm dependencies"
    # --include=dev: the build, the migrations (tsx) and the tests need the dev dependencies, whatever NODE_ENV says.
    if [ -f package-lock.json ]; then npm ci --include=dev --no-audit --no-fund --loglevel=error; else npm install --include=dev --no-audit --no-fund --loglevel=error; fi
  fi
}

# A secret for sealing session cookies: from the environment, else generated once and kept in .data (git-ignored).
ensure_secret() {
  if [ -z "${SESSION_SECRET:-}" ]; then
    mkdir -p "$QUELL_DATA"
    [ -s "$QUELL_DATA/session-secret" ] || node -e 'process.stdout.write(require("crypto").randomBytes(32).toString("hex"))' > "$QUELL_DATA/session-secret"
    SESSION_SECRET=$(cat "$QUELL_DATA/session-secret")
    export SESSION_SECRET
  fi
}

migrate() { NODE_OPTIONS="--import tsx" npx knex --knexfile knexfile.ts migrate:latest >/dev/null; }
seed() { NODE_OPTIONS="--import tsx" npx knex --knexfile knexfile.ts seed:run >/dev/null; }

free_port() { node -e 'const s=require("net").createServer();s.listen(0,"127.0.0.1",()=>{console.log(s.address().port);s.close()})'; }

# Wait until an HTTP URL answers (a failed build still prints "Ready", so the log is no proof).
wait_http() {
  local url="$1" i=0
  until curl -fsS -o /dev/null "$url" 2>/dev/null; do
    i=$((i+1)); [ $i -gt 300 ] && return 1; sleep 0.2
  done
}

wait_port() {
  local port="$1" i=0
  until node -e "require('net').connect($port,'127.0.0.1').on('connect',()=>process.exit(0)).on('error',()=>process.exit(1))" 2>/dev/null; do
    i=$((i+1)); [ $i -gt 100 ] && return 1; sleep 0.1
  done
}

# Build unless the build in $1 is newer than every source file.
build_if_stale() {
  local dist="$1"
  if [ -f "$dist/BUILD_ID" ] && [ -z "$(find app components lib workers next.config.mjs tailwind.config.ts package.json -newer "$dist/BUILD_ID" -print -quit 2>/dev/null)" ]; then
    say "build is up to date ($dist)"
    return 0
  fi
  say "building ($dist)"
  QUELL_DIST_DIR="$dist" node_modules/.bin/next build
}

# Stop background processes: TERM first, KILL whatever is still there two seconds later.
stop_all() {
  local p i
  for p in "$@"; do kill "$p" 2>/dev/null || true; done
  for i in $(seq 1 20); do
    local alive=0
    for p in "$@"; do kill -0 "$p" 2>/dev/null && alive=1; done
    [ $alive = 0 ] && break
    sleep 0.1
  done
  for p in "$@"; do kill -9 "$p" 2>/dev/null || true; done
  wait 2>/dev/null || true
}
