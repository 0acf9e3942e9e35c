# Sourced by the scripts: where PostgreSQL and the mail fake live for this checkout.
# Every value can be overridden from the environment.
QUELL_ROOT="${QUELL_ROOT:-$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)}"
export QUELL_ROOT
export QUELL_PG_PORT="${QUELL_PG_PORT:-54329}"
export QUELL_PG_HOST="${QUELL_PG_HOST:-127.0.0.1}"
export QUELL_PG_USER="${QUELL_PG_USER:-quell}"
export QUELL_PG_PASSWORD="${QUELL_PG_PASSWORD:-quell-dev}"
export QUELL_DB="${QUELL_DB:-quell}"
export QUELL_SMTP_PORT="${QUELL_SMTP_PORT:-2525}"
export QUELL_SMTP_HOST="${QUELL_SMTP_HOST:-127.0.0.1}"
export QUELL_DATA="${QUELL_DATA:-$QUELL_ROOT/.data}"
if [ -z "${DATABASE_URL:-}" ]; then
  export DATABASE_URL="postgres://${QUELL_PG_USER}:${QUELL_PG_PASSWORD}@${QUELL_PG_HOST}:${QUELL_PG_PORT}/${QUELL_DB}"
fi
