#!/usr/bin/env bash
# npm run bench: runs every benchmark below and prints their rows as one table
# (also written to bench-results.json, git-ignored).
#
# Adding a benchmark: append "suite|command" to HB_BENCHES. The command runs from the repo
# root with BENCH_RESULTS_FILE set; it writes there a JSON array of flat objects, one per row,
# e.g. `writeFileSync(process.env.BENCH_RESULTS_FILE, JSON.stringify(bench.table()))` with
# tinybench. A benchmark that writes no file still runs; its own output is all there is.
set -euo pipefail

source "$(dirname "${BASH_SOURCE[0]}")/lib/common.sh"
source "$HB_ROOT/scripts/lib/packages.sh"
source "$HB_ROOT/scripts/lib/postgres.sh"

# HB_ONLY="board pages" runs only the named suites.
# BENCH_SECONDS shortens the load runs of "reads" (30 s per endpoint and floor by default) for a trial run.
HB_BENCHES=(
  "shared|pnpm --filter @hodboard/shared bench"
  "board|pnpm --filter @hodboard/api bench"
  "reads|pnpm --filter @hodboard/api exec tsx bench/reads.bench.ts"
  "replan|pnpm --filter @hodboard/api exec tsx bench/replan.bench.ts"
  "pages|bash scripts/bench-pages.sh"
)

cd "$HB_ROOT"
log "Bootstrapping"
boot "pnpm" ensure_pnpm
boot "dependencies" ensure_deps
boot "postgresql install" ensure_postgres_installed
boot "postgresql cluster" pg_choose_dir
boot "postgresql start" pg_start "-c fsync=off -c synchronous_commit=off"
HB_BENCH_DB="hodboard_bench_$$"
boot "bench database" pg_create_db "$HB_BENCH_DB"
export DATABASE_URL
DATABASE_URL=$(pg_url "$HB_BENCH_DB")
bench_cleanup() {
  pg_drop_db "$HB_BENCH_DB" >/dev/null 2>&1 || true
  pg_stop_if_started || true
}
trap bench_cleanup EXIT

export BENCH_LOAD_START
BENCH_LOAD_START=$(cut -d' ' -f1-3 /proc/loadavg)
run_dir="$HB_DATA/bench-run"
rm -rf "$run_dir"
mkdir -p "$run_dir"
failed=()
inputs=()
for entry in "${HB_BENCHES[@]}"; do
  suite=${entry%%|*}
  command=${entry#*|}
  if [ -n "${HB_ONLY:-}" ] && [[ " $HB_ONLY " != *" $suite "* ]]; then continue; fi
  log "bench: $suite"
  out="$run_dir/$suite.json"
  if BENCH_RESULTS_FILE="$out" timed "bench $suite" bash -c "$command" </dev/null; then :; else failed+=("$suite"); fi
  inputs+=("$suite=$out")
done

echo
node "$HB_ROOT/scripts/lib/bench-table.mjs" "$HB_ROOT/bench-results.json" "${inputs[@]}"
echo
print_timings
if [ "${#failed[@]}" != 0 ]; then
  die "benchmarks failed: ${failed[*]}"
fi
