#!/usr/bin/env bash
# npm test (and .ci/run): bootstrap like npm start, but into throwaway databases, then run
# type checks, lint, unit tests, API tests against real PostgreSQL, and browser tests in Debian's
# Chromium. Ends with one line "N passed, N failed[, N skipped]" summing every runner.
set -euo pipefail

source "$(dirname "${BASH_SOURCE[0]}")/lib/common.sh"
source "$HB_ROOT/scripts/lib/packages.sh"
source "$HB_ROOT/scripts/lib/postgres.sh"
source "$HB_ROOT/scripts/lib/procs.sh"
source "$HB_ROOT/scripts/lib/env.sh"

cd "$HB_ROOT"
HB_STARTED_AT=$(now_ms)
HB_CLEANED=0
HB_RUN_DIR="$HB_DATA/test-run"
HB_TEST_DBS=()
# Per step: name|passed|failed|skipped|time|status
HB_STEPS=()

cleanup() {
  [ "$HB_CLEANED" = 1 ] && return 0
  HB_CLEANED=1
  trap '' INT TERM
  log "Cleaning up"
  stop_services
  local db
  for db in "${HB_TEST_DBS[@]}"; do pg_drop_db "$db" >/dev/null || warn "could not drop $db"; done
  [ "${#HB_TEST_DBS[@]}" = 0 ] || note "dropped ${HB_TEST_DBS[*]}"
  pg_stop_if_started || true
}
HB_SUMMARY_PRINTED=0

print_summary() {
  local extra_failed=$1 total_p=0 total_f=0 total_s=0 row name p f s took status
  HB_SUMMARY_PRINTED=1
  echo
  printf '%s%-32s %7s %7s %7s %9s  %s%s\n' "$HB_BOLD" step passed failed skipped time result "$HB_RESET"
  for row in "${HB_STEPS[@]}"; do
    IFS='|' read -r name p f s took status <<<"$row"
    printf '%-32s %7s %7s %7s %9s  %s\n' "$name" "$p" "$f" "$s" "$took" "$status"
    total_p=$((total_p + p)) total_f=$((total_f + f)) total_s=$((total_s + s))
  done
  [ "$extra_failed" = 0 ] || printf '%-32s %7s %7s %7s %9s  %s\n' "(run stopped early)" 0 "$extra_failed" 0 - failed
  total_f=$((total_f + extra_failed))
  echo
  echo "Bootstrap timings:"
  print_timings
  echo "Total: $(since "$HB_STARTED_AT")"
  echo
  local line="$total_p passed, $total_f failed"
  [ "$total_s" = 0 ] || line+=", $total_s skipped"
  echo "$line"
  [ "$total_f" = 0 ]
}

# A run that stops before the end (bootstrap error, Ctrl-C) still closes with the count line.
on_exit() {
  local rc=$?
  cleanup
  if [ "$HB_SUMMARY_PRINTED" = 0 ]; then
    print_summary 1 || true
    exit $((rc == 0 ? 1 : rc))
  fi
}
trap on_exit EXIT
trap 'exit 130' INT
trap 'exit 143' TERM

export CI="${CI:-}" PLAYWRIGHT_SKIP_BROWSER_DOWNLOAD=1
rm -rf "$HB_RUN_DIR"
mkdir -p "$HB_RUN_DIR" "$HB_LOGS"

log "Bootstrapping"
boot "pnpm" ensure_pnpm
boot "dependencies" ensure_deps
boot "postgresql install" ensure_postgres_installed
boot "chromium install" ensure_chromium_installed
boot "postgresql cluster" pg_choose_dir
# Throwaway data only: durability is not worth the time here.
boot "postgresql start" pg_start "-c fsync=off -c synchronous_commit=off -c full_page_writes=off"
# The API's restart test stops and starts the cluster: only one this run started, never a developer's running one.
if [ "$HB_PG_STARTED" = 1 ]; then export PGBIN HB_PG_DATA="$HB_PG_DIR/data"; fi
pg_drop_stale_test_dbs

HB_RUN_ID="$$_$(random_hex 3)"
HB_API_DB="hodboard_test_${HB_RUN_ID}"
HB_E2E_DB="hodboard_test_${HB_RUN_ID}_e2e"
HB_TEST_DBS+=("$HB_API_DB")
boot "api test database" pg_create_db "$HB_API_DB"

# Everything the API's config reads, set here so nothing leaks in from a developer's .env or shell.
export NODE_ENV=test HOST=127.0.0.1 LOG_LEVEL=warn
export JWT_SECRET="test-$(random_hex 24)"
export MAIL_FROM="Hodboard <no-reply@hodboard.test>"
export MAIL_SMTP_PORT MAIL_HTTP_PORT SMTP_HOST SMTP_PORT MAIL_CATCHER_URL WEB_DIST PORT APP_URL DATABASE_URL
MAIL_SMTP_PORT=$(free_port)
MAIL_HTTP_PORT=$(free_port)
WEATHER_FAKE_PORT=$(free_port)
WEATHER_API_URL="http://127.0.0.1:$WEATHER_FAKE_PORT"
GEOCODER_URL="http://127.0.0.1:$WEATHER_FAKE_PORT"
export WEATHER_FAKE_PORT WEATHER_API_URL GEOCODER_URL
crew_phone_fake_env "$HB_RUN_DIR/s3"
SMTP_HOST=127.0.0.1
SMTP_PORT=$MAIL_SMTP_PORT
MAIL_CATCHER_URL="http://127.0.0.1:$MAIL_HTTP_PORT/"
WEB_DIST="$HB_ROOT/apps/web/dist"
PORT=$(free_port)
APP_URL="http://127.0.0.1:$PORT"
DATABASE_URL=$(pg_url "$HB_API_DB")

stripe_fake_env

start_fakes() {
  spawn "fakes" "$HB_RUN_DIR/fakes.log" bash -c 'cd apps/api && exec ./node_modules/.bin/tsx src/fakes/run.ts'
  wait_for_line "$HB_LAST_PID" "$HB_RUN_DIR/fakes.log" '^fakes ready' 60 || die "the local fakes did not start"
}
boot "fakes" start_fakes

record() { HB_STEPS+=("$1|$2|$3|$4|$5|$6"); }

# Runners catch Ctrl-C themselves and exit 130, so the INT trap may never fire: stop here instead.
stop_if_interrupted() {
  case "$1" in 130 | 143) warn "interrupted"; exit "$1" ;; esac
}

# check NAME COMMAND...: a step without test counts (type check, build): a failure counts as one failed.
check() {
  local name=$1 start rc=0
  shift
  log "$name"
  start=$(now_ms)
  "$@" </dev/null || rc=$?
  if [ "$rc" = 0 ]; then
    record "$name" 0 0 0 "$(since "$start")" ok
  else
    record "$name" 0 1 0 "$(since "$start")" "failed (exit $rc)"
  fi
  stop_if_interrupted "$rc"
  return "$rc"
}

# counted NAME KIND REPORT COMMAND...: a test runner whose JSON report gives the counts.
counted() {
  local name=$1 kind=$2 report=$3 start rc=0 p f s status
  shift 3
  log "$name"
  start=$(now_ms)
  "$@" </dev/null || rc=$?
  read -r p f s < <(node "$HB_ROOT/scripts/lib/results.mjs" "$kind" "$report")
  # A runner that exits non-zero with no failed test (crash, unhandled error, no report) still failed.
  if [ "$rc" != 0 ] && [ "$f" = 0 ]; then f=1; fi
  if [ "$rc" = 0 ]; then status=ok; else status="failed (exit $rc)"; fi
  if [ "$rc" = 0 ] && [ $((p + f + s)) = 0 ]; then status="ok (no tests found)"; warn "$name ran no tests"; fi
  record "$name" "$p" "$f" "$s" "$(since "$start")" "$status"
  stop_if_interrupted "$rc"
  return "$rc"
}

not_run() { record "$1" 0 0 0 - "not run: $2"; }

# While working on one part: HB_ONLY="api e2e" runs only those steps (typecheck, lint, shared, web, api, e2e), and
# HB_E2E_ARGS passes Playwright a spec or a --grep. CI sets neither and runs everything.
wanted() { [ -z "${HB_ONLY:-}" ] || [[ " $HB_ONLY " == *" $1 "* ]]; }

# run_vitest NAME PACKAGE: the package's own `test` script, plus a JSON report for the counts.
run_vitest() {
  local report="$HB_RUN_DIR/${2##*/}.json"
  counted "$1" vitest "$report" pnpm --filter "$2" test \
    --reporter=default --reporter=json "--outputFile.json=$report" --passWithNoTests
}

if wanted typecheck; then check "typecheck" pnpm typecheck || true; fi
if wanted lint; then check "lint" pnpm lint || true; fi
if wanted shared; then run_vitest "unit: shared" @hodboard/shared || true; fi
if wanted web; then run_vitest "unit: web" @hodboard/web || true; fi
if wanted api; then run_vitest "api" @hodboard/api || true; fi

e2e_prepare() {
  pg_create_db "$HB_E2E_DB" || return 1
  DATABASE_URL=$(pg_url "$HB_E2E_DB") pnpm --filter @hodboard/api migrate || return 1
  DATABASE_URL=$(pg_url "$HB_E2E_DB") pnpm --filter @hodboard/api seed || return 1
  # Every browser test signs in and opens e-mailed links from 127.0.0.1; the production limits would lock later tests out.
  spawn "api" "$HB_RUN_DIR/api.log" env DATABASE_URL="$(pg_url "$HB_E2E_DB")" AUTH_RATE_LIMIT=10000 AUTH_ADDRESS_RATE_LIMIT=10000 \
    PUBLIC_LINK_RATE_LIMIT=10000 PUBLIC_LINK_MISS_LIMIT=10000 \
    pnpm --filter @hodboard/api start
  wait_for_http "$HB_LAST_PID" "$HB_RUN_DIR/api.log" "http://127.0.0.1:$PORT/api/health" 120
}

HB_TEST_DBS+=("$HB_E2E_DB")
# Vite takes NODE_ENV from the environment; "test" would ship Vue's development build.
if ! wanted e2e; then
  :
elif ! check "web build" env NODE_ENV=production pnpm --filter @hodboard/web build; then
  not_run "e2e" "the web build failed"
elif ! check "e2e: migrate, seed, start api" e2e_prepare; then
  not_run "e2e" "the API did not start (log: $HB_RUN_DIR/api.log)"
else
  export E2E_BASE_URL="$APP_URL" E2E_MAIL_URL="http://127.0.0.1:$MAIL_HTTP_PORT" \
    E2E_JSON_REPORT="$HB_RUN_DIR/e2e.json"
  if ! counted "e2e" playwright "$HB_RUN_DIR/e2e.json" pnpm exec playwright test --pass-with-no-tests ${HB_E2E_ARGS:-}; then
    show_log_tail "$HB_RUN_DIR/api.log" 40
  fi
fi

cleanup
print_summary 0
