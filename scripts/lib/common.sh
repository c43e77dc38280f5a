# shellcheck shell=bash
# Shared helpers for scripts/start.sh, test.sh and bench.sh. Sourced, never run.

HB_ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/../.." && pwd)"
HB_DATA="$HB_ROOT/.data"
HB_LOGS="$HB_DATA/logs"

if [ -t 1 ] && [ -z "${NO_COLOR:-}" ]; then
  HB_BOLD=$'\033[1m' HB_DIM=$'\033[2m' HB_RED=$'\033[31m' HB_GREEN=$'\033[32m' HB_YELLOW=$'\033[33m' HB_RESET=$'\033[0m'
else
  HB_BOLD='' HB_DIM='' HB_RED='' HB_GREEN='' HB_YELLOW='' HB_RESET=''
fi

log() { printf '%s==>%s %s\n' "$HB_BOLD" "$HB_RESET" "$*"; }
note() { printf '    %s\n' "$*"; }
warn() { printf '%swarning:%s %s\n' "$HB_YELLOW" "$HB_RESET" "$*" >&2; }
die() { printf '%serror:%s %s\n' "$HB_RED" "$HB_RESET" "$*" >&2; exit 1; }

hb_is_root() { [ "$(id -u)" = 0 ]; }

# Installs need root; on a developer machine that means sudo, which may ask for a password.
as_root() {
  if hb_is_root; then
    "$@"
  elif command -v sudo >/dev/null 2>&1; then
    sudo "$@"
  else
    die "need root to run: $* (install sudo or run as root)"
  fi
}

now_ms() { date +%s%3N; }

# Seconds with one decimal since a now_ms value.
since() { local ms=$(( $(now_ms) - $1 )); printf '%d.%ds' $((ms / 1000)) $(((ms % 1000) / 100)); }

HB_TIMINGS=()

# timed LABEL COMMAND...: runs the command, prints and records how long it took, returns its status.
timed() {
  local label=$1 start rc=0
  shift
  start=$(now_ms)
  "$@" || rc=$?
  local took
  took=$(since "$start")
  HB_TIMINGS+=("$label|$took|$rc")
  if [ "$rc" = 0 ]; then
    printf '    %s%s: %s%s\n' "$HB_DIM" "$label" "$took" "$HB_RESET"
  else
    printf '    %s%s: failed (exit %s) after %s%s\n' "$HB_RED" "$label" "$rc" "$took" "$HB_RESET"
  fi
  return "$rc"
}

# boot LABEL COMMAND...: a bootstrap step. Called as a plain command (never under `||` or `if`) so
# `set -e` still stops the script inside it; a failure here is fatal.
boot() {
  local label=$1 start
  shift
  start=$(now_ms)
  "$@"
  local took
  took=$(since "$start")
  HB_TIMINGS+=("$label|$took|0")
  printf '    %s%s: %s%s\n' "$HB_DIM" "$label" "$took" "$HB_RESET"
}

print_timings() {
  local row label took rc
  for row in "${HB_TIMINGS[@]}"; do
    IFS='|' read -r label took rc <<<"$row"
    printf '    %-28s %8s%s\n' "$label" "$took" "$([ "$rc" = 0 ] || echo "  (exit $rc)")"
  done
}

random_hex() { od -An -N"${1:-4}" -tx1 /dev/urandom | tr -d ' \n'; }

path_hash() { printf '%s' "$1" | sha256sum | cut -c1-12; }

port_is_free() {
  node -e '
    const s = require("node:net").createServer();
    s.once("error", () => process.exit(1));
    s.listen(Number(process.argv[1]), "127.0.0.1", () => s.close(() => process.exit(0)));
  ' "$1"
}

# A free port below Linux's ephemeral range (32768 and up), so an outgoing connection cannot take it between
# this pick and the service's listen, and never one already handed out to this run (a port the system hands
# out for "any port" can come back on the next ask).
free_port() {
  node -e '
    const fs = require("node:fs");
    const net = require("node:net");
    const file = process.argv[1];
    const taken = new Set(fs.existsSync(file) ? fs.readFileSync(file, "utf8").split(/\s+/).filter(Boolean) : []);
    const attempt = (left) => {
      if (left === 0) {
        console.error("no free port found between 20000 and 32767");
        process.exit(1);
      }
      const port = 20000 + Math.floor(Math.random() * 12768);
      if (taken.has(String(port))) return attempt(left - 1);
      const server = net.createServer();
      server.once("error", () => attempt(left - 1));
      server.listen(port, "127.0.0.1", () => server.close(() => {
        fs.appendFileSync(file, `${port}\n`);
        process.stdout.write(String(port));
      }));
    };
    attempt(500);
  ' "${TMPDIR:-/tmp}/hodboard-ports-$$"
}

# The wanted port when it is free, else any free one.
pick_port() {
  if port_is_free "$1"; then echo "$1"; else free_port; fi
}

http_ok() {
  node -e '
    fetch(process.argv[1], { signal: AbortSignal.timeout(2000) })
      .then((r) => process.exit(r.ok ? 0 : 1), () => process.exit(1));
  ' "$1"
}
