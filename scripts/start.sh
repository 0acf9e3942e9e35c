#!/usr/bin/env bash
# The start command: set up everything on a fresh machine, then serve Quell on http://localhost:$PORT.
source "$(dirname "${BASH_SOURCE[0]}")/common.sh"
export PORT="${PORT:-3000}"

ensure_deps
bash db/pg.sh start "$QUELL_DB"
ensure_secret
migrate
seed

pids=()
cleanup() {
  trap - INT TERM EXIT
  stop_all "${pids[@]}"
  say "stopped the app and the mail fake (the database keeps running: npm run db:stop)"
}
trap cleanup INT TERM EXIT

node --import tsx db/mail-fake.ts & pids+=($!)
wait_port "$QUELL_SMTP_PORT" || { say "the mail fake did not start"; exit 1; }

NODE_ENV=production build_if_stale .next
NODE_ENV=production QUELL_DIST_DIR=.next node --require ./scripts/peer-address.cjs node_modules/.bin/next start -p "$PORT" -H "${QUELL_HOST:-127.0.0.1}" & pids+=($!)
wait_http "http://127.0.0.1:$PORT/api/health" || { say "the app did not answer"; exit 1; }

cat <<MSG

  Quell is running at http://localhost:$PORT
  Demo team "Kestrel Hollow Instruments — bench group" (development passwords, never for production):
    lead      lena.marsh@kestrel-hollow.test     password: demo-lead-2026
    designer  dev.okafor@kestrel-hollow.test     password: demo-designer-2026
    viewer    vera.lind@kestrel-hollow.test      password: demo-viewer-2026
  Mail sent by the app lands in the local outbox (leads: /dev/outbox).
  Ctrl-C stops the app and the mail fake; 'npm run db:stop' stops PostgreSQL.

MSG
wait "${pids[-1]}"
