#!/usr/bin/env bash
# The test command: the same set-up against a fresh test database and mail store, then
# vitest (unit + integration on real PostgreSQL), then end-to-end tests in Chromium against a production build.
source "$(dirname "${BASH_SOURCE[0]}")/common.sh"
export QUELL_DB="${QUELL_TEST_DB:-quell_test}"
export DATABASE_URL="postgres://${QUELL_PG_USER}:${QUELL_PG_PASSWORD}@${QUELL_PG_HOST}:${QUELL_PG_PORT}/${QUELL_DB}"
export SESSION_SECRET="${SESSION_SECRET:-test-secret-0123456789abcdef0123456789abcdef}"
export NODE_ENV=test

ensure_deps
bash db/pg.sh start "$QUELL_DB"
bash db/pg.sh recreate "$QUELL_DB" >/dev/null
migrate
seed >/dev/null

QUELL_SMTP_PORT=$(free_port); export QUELL_SMTP_PORT
PORT=$(free_port); export PORT
export QUELL_BASE_URL="http://127.0.0.1:$PORT"
RESULTS="$QUELL_DATA/test-results-$QUELL_DB"; mkdir -p "$RESULTS"; rm -f "$RESULTS"/*.json

pids=()
cleanup() {
  trap - INT TERM EXIT
  stop_all "${pids[@]}"
}
trap cleanup INT TERM EXIT

node --import tsx db/mail-fake.ts >"$QUELL_DATA/mail-$QUELL_DB.log" 2>&1 & pids+=($!)
wait_port "$QUELL_SMTP_PORT" || { say "the mail fake did not start"; exit 1; }

status=0
# Each check counts as one test in the closing line: the whole tree (DOM), and the worker side alone (webworker lib).
say "type check"
checks_failed=0
checks_passed=0
if npx tsc --noEmit -p tsconfig.json; then echo "type check: passed"; checks_passed=$((checks_passed+1)); else status=1; checks_failed=$((checks_failed+1)); echo "type check: failed"; fi
say "type check of workers/ (webworker lib)"
if npx tsc --noEmit -p workers/tsconfig.json; then echo "worker type check: passed"; checks_passed=$((checks_passed+1)); else status=1; checks_failed=$((checks_failed+1)); echo "worker type check: failed"; fi

say "unit and integration tests"
npx vitest run --reporter=default --reporter=json --outputFile="$RESULTS/vitest.json" || status=1

if [ ! -x /usr/bin/chromium ]; then
  if [ "$(id -u)" = 0 ]; then
    say "installing Debian's chromium for the end-to-end tests"
    DEBIAN_FRONTEND=noninteractive apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium >/dev/null
  else
    say "Chromium is missing: sudo apt-get install -y chromium"; exit 1
  fi
fi

say "end-to-end tests"
DIST="${QUELL_TEST_DIST:-.next-test}"
NODE_ENV=production build_if_stale "$DIST"
NODE_ENV=production QUELL_DIST_DIR="$DIST" node --require ./scripts/peer-address.cjs node_modules/.bin/next start -p "$PORT" -H 127.0.0.1 >"$QUELL_DATA/app-$QUELL_DB.log" 2>&1 & pids+=($!)
if wait_http "$QUELL_BASE_URL/api/health"; then
  npx vitest run --config vitest.e2e.config.ts --reporter=default --reporter=json --outputFile="$RESULTS/e2e.json" || status=1
else
  say "the app did not answer; its log:"; tail -40 "$QUELL_DATA/app-$QUELL_DB.log"; status=1
fi

node -e '
const fs=require("fs");let p=Number(process.argv[3]),f=Number(process.argv[2]),s=0;
for (const n of ["vitest.json","e2e.json"]) { const file=process.argv[1]+"/"+n;
  if(!fs.existsSync(file)){f++;continue} const r=JSON.parse(fs.readFileSync(file,"utf8"));
  p+=r.numPassedTests;f+=r.numFailedTests;s+=r.numPendingTests+(r.numTodoTests||0); }
console.log(`tests: ${p} passed, ${f} failed, ${s} skipped`);' "$RESULTS" "$checks_failed" "$checks_passed"
exit $status
