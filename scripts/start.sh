#!/usr/bin/env bash
# npm start: bootstrap everything on a bare Debian machine with Node 20, then serve Hodboard
# (web + API on one port) with a local mail catcher, until Ctrl-C.
set -euo pipefail

# shellcheck source=lib/common.sh
source "$(dirname "${BASH_SOURCE[0]}")/lib/common.sh"
source "$HB_ROOT/scripts/lib/packages.sh"
source "$HB_ROOT/scripts/lib/postgres.sh"
source "$HB_ROOT/scripts/lib/procs.sh"
source "$HB_ROOT/scripts/lib/env.sh"

cd "$HB_ROOT"
HB_STARTED_AT=$(now_ms)
HB_CLEANED=0

cleanup() {
  [ "$HB_CLEANED" = 1 ] && return 0
  HB_CLEANED=1
  trap '' INT TERM
  log "Stopping"
  stop_services
  pg_stop_if_started || true
}
trap cleanup EXIT
trap 'exit 130' INT
trap 'exit 143' TERM

log "Bootstrapping Hodboard in $HB_ROOT"
boot "pnpm" ensure_pnpm
boot "dependencies" ensure_deps
ensure_env_file
load_env_file "$HB_ROOT/.env"

: "${NODE_ENV:=development}" "${HOST:=127.0.0.1}" "${LOG_LEVEL:=info}"
[ "${#JWT_SECRET}" -ge 32 ] || die "JWT_SECRET in .env must be at least 32 characters"

# A DATABASE_URL from .env or the shell means "use that server" (e.g. docker-compose.dev.yml);
# otherwise the project runs its own cluster.
if [ -z "${DATABASE_URL:-}" ]; then
  boot "postgresql install" ensure_postgres_installed
  boot "postgresql cluster" pg_choose_dir
  boot "postgresql start" pg_start
  boot "database" pg_create_db hodboard
  DATABASE_URL=$(pg_url hodboard)
else
  note "using DATABASE_URL from the environment; no local cluster"
fi

PORT=$(pick_port "${PORT:-3000}")
MAIL_SMTP_PORT=$(pick_port "${MAIL_SMTP_PORT:-${SMTP_PORT:-1025}}")
MAIL_HTTP_PORT=$(pick_port "${MAIL_HTTP_PORT:-1080}")
WEATHER_FAKE_PORT=$(pick_port "${WEATHER_FAKE_PORT:-1090}")
# Forecasts and postcodes come from the local fake unless .env names a hosted service.
: "${WEATHER_API_URL:=http://127.0.0.1:$WEATHER_FAKE_PORT}"
: "${GEOCODER_URL:=http://127.0.0.1:$WEATHER_FAKE_PORT}"
crew_phone_fake_env "$HB_DATA/s3" persist
# npm start always delivers mail to its own catcher, never to a real server.
SMTP_HOST=127.0.0.1
SMTP_PORT=$MAIL_SMTP_PORT
MAIL_CATCHER_URL="http://localhost:$MAIL_HTTP_PORT/"
: "${MAIL_FROM:=Hodboard <no-reply@hodboard.test>}"
case "${APP_URL:-}" in
  "" | http://localhost:* | http://127.0.0.1:*) APP_URL="http://localhost:$PORT" ;;
esac
WEB_DIST="$HB_ROOT/apps/web/dist"
export NODE_ENV HOST PORT APP_URL DATABASE_URL JWT_SECRET SMTP_HOST SMTP_PORT MAIL_FROM WEB_DIST LOG_LEVEL \
  MAIL_CATCHER_URL MAIL_SMTP_PORT MAIL_HTTP_PORT WEATHER_FAKE_PORT WEATHER_API_URL GEOCODER_URL

mkdir -p "$HB_LOGS"

stripe_fake_env

start_fakes() {
  spawn "fakes" "$HB_LOGS/fakes.log" bash -c 'cd apps/api && exec ./node_modules/.bin/tsx src/fakes/run.ts'
  HB_FAKES_PID=$HB_LAST_PID
  wait_for_line "$HB_FAKES_PID" "$HB_LOGS/fakes.log" '^fakes ready' 60 || die "the local fakes did not start"
}
boot "fakes" start_fakes

boot "migrate" pnpm --filter @hodboard/api migrate

seed() {
  pnpm --filter @hodboard/api seed | tee "$HB_LOGS/seed.log"
}
boot "seed" seed

# vite build takes a while; skip it when nothing it reads changed since the last build.
build_web() {
  local stamp="$WEB_DIST/.hodboard-build"
  if [ -f "$stamp" ] && [ -f "$WEB_DIST/index.html" ] && [ -z "$(find apps/web packages/shared pnpm-lock.yaml \
    \( -name node_modules -o -name dist \) -prune -o -type f -newer "$stamp" -print -quit)" ]; then
    note "web build up to date"
    return 0
  fi
  # Vite takes NODE_ENV from the environment; only "production" gives the production bundle.
  NODE_ENV=production pnpm --filter @hodboard/web build
  touch "$stamp"
}
boot "web build" build_web

start_api() {
  spawn "api" "$HB_LOGS/api.log" pnpm --filter @hodboard/api start
  HB_API_PID=$HB_LAST_PID
  wait_for_http "$HB_API_PID" "$HB_LOGS/api.log" "http://127.0.0.1:$PORT/api/health" 120 ||
    die "the API did not answer on /api/health (log: $HB_LOGS/api.log)"
}
boot "api start" start_api

sign_ins=$(grep -E '^  [^ ].*[^ ]+@[^ ]+  +[^ ]+ *$' "$HB_LOGS/seed.log" || true)

echo
printf '%sHodboard is running%s  (ready in %s)\n' "$HB_GREEN$HB_BOLD" "$HB_RESET" "$(since "$HB_STARTED_AT")"
echo
note "App:          $APP_URL"
note "Caught mail:  $MAIL_CATCHER_URL"
note "Database:     $DATABASE_URL"
note "Logs:         $HB_LOGS/api.log, $HB_LOGS/fakes.log"
echo
if [ -n "$sign_ins" ]; then
  echo "  Demo sign-ins (role, e-mail, password):"
  printf '%s\n' "$sign_ins" | sed 's/^/  /'
else
  warn "the seed printed no demo sign-ins (see $HB_LOGS/seed.log)"
fi
echo
echo "  Timings:"
print_timings
echo
echo "  Press Ctrl-C to stop (the API, the fakes and PostgreSQL if this started it)."

# Runs until Ctrl-C, or until the API or the fakes exit by themselves.
rc=0
wait -n "$HB_API_PID" "$HB_FAKES_PID" || rc=$?
for pid in "$HB_API_PID" "$HB_FAKES_PID"; do
  service_alive "$pid" || { warn "a service exited (status $rc)"; show_log_tail "$HB_LOGS/api.log" 20; show_log_tail "$HB_LOGS/fakes.log" 10; break; }
done
exit "$rc"
