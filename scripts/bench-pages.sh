#!/usr/bin/env bash
# The pages' budget (run by scripts/bench.sh): builds the web app, serves it with the seeded demo firm from its
# own database next to bench.sh's, and measures the crew home and the office board (scripts/bench-pages.mjs).
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/lib/common.sh"
source "$HB_ROOT/scripts/lib/procs.sh"
cd "$HB_ROOT"
: "${DATABASE_URL:?bench-pages needs DATABASE_URL pointing at a throwaway PostgreSQL database (bench.sh sets it)}"

admin_url="${DATABASE_URL%/*}/postgres"
pages_db="$(basename "${DATABASE_URL%%\?*}")_pages"
psql_admin() { psql -X -q -v ON_ERROR_STOP=1 "$admin_url" "$@"; }
WEB_DIST=''
cleanup() {
  stop_services
  [ -z "$WEB_DIST" ] || rm -rf "$WEB_DIST"
  psql_admin -c "DROP DATABASE IF EXISTS \"$pages_db\" WITH (FORCE)" >/dev/null 2>&1 || true
}
trap cleanup EXIT
psql_admin -c "DROP DATABASE IF EXISTS \"$pages_db\" WITH (FORCE)" -c "CREATE DATABASE \"$pages_db\""

export DATABASE_URL="${DATABASE_URL%/*}/$pages_db" NODE_ENV=production HOST=127.0.0.1 LOG_LEVEL=warn AUTH_RATE_LIMIT=10000 AUTH_ADDRESS_RATE_LIMIT=10000
# A build of its own, away from apps/web/dist: another build of the checkout may be running (Vite's lock on
# the project only guards the one output folder, so it is bypassed for this separate one). Not under .data:
# the static file server refuses paths through a dot folder.
WEB_DIST=$(mktemp -d "${TMPDIR:-/tmp}/hodboard-bench-web.XXXXXX")
export JWT_SECRET="bench-$(random_hex 24)" WEB_DIST
PORT=$(free_port)
export PORT APP_URL="http://127.0.0.1:$PORT"
# Vite takes NODE_ENV from the environment; only "production" gives the production bundle.
pnpm --filter @hodboard/web exec vite build --outDir "$WEB_DIST" --emptyOutDir --bypass-lock >"$HB_DATA/bench-pages-build.log" 2>&1 || { tail -20 "$HB_DATA/bench-pages-build.log"; die "web build failed"; }
pnpm --filter @hodboard/api migrate >/dev/null
pnpm --filter @hodboard/api seed >/dev/null
spawn "api" "$HB_DATA/bench-pages-api.log" pnpm --filter @hodboard/api start
wait_for_http "$HB_LAST_PID" "$HB_DATA/bench-pages-api.log" "$APP_URL/api/health" 120 || die "the API did not start"
node scripts/bench-pages.mjs "$APP_URL" "$WEB_DIST"
