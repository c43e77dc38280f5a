# shellcheck shell=bash
# Background services started by a script, each in its own session so that stopping one
# also stops what it spawned (pnpm -> tsx -> node) and Ctrl-C reaches only the script.

HB_SERVICE_PIDS=()
HB_SERVICE_NAMES=()
HB_SERVICE_LOGS=()

# spawn NAME LOGFILE COMMAND...: sets HB_LAST_PID.
spawn() {
  local name=$1 logfile=$2
  shift 2
  mkdir -p "$(dirname "$logfile")"
  : >"$logfile"
  setsid "$@" >>"$logfile" 2>&1 </dev/null &
  HB_LAST_PID=$!
  HB_SERVICE_PIDS+=("$HB_LAST_PID")
  HB_SERVICE_NAMES+=("$name")
  HB_SERVICE_LOGS+=("$logfile")
}

service_alive() { kill -0 "$1" 2>/dev/null; }

# Stops services newest first: TERM to the whole group, KILL whatever is left after 10 s.
stop_services() {
  local i pid name n
  for ((i = ${#HB_SERVICE_PIDS[@]} - 1; i >= 0; i--)); do
    pid=${HB_SERVICE_PIDS[$i]}
    name=${HB_SERVICE_NAMES[$i]}
    [ -n "$pid" ] || continue
    if service_alive "$pid"; then
      kill -TERM -- "-$pid" 2>/dev/null || kill -TERM "$pid" 2>/dev/null || true
      for ((n = 0; n < 100; n++)); do
        service_alive "$pid" || break
        sleep 0.1
      done
      if service_alive "$pid"; then
        kill -KILL -- "-$pid" 2>/dev/null || true
      fi
      wait "$pid" 2>/dev/null || true
      note "$name stopped"
    fi
    HB_SERVICE_PIDS[$i]=''
  done
}

show_log_tail() {
  printf '%s--- last lines of %s ---%s\n' "$HB_DIM" "$1" "$HB_RESET" >&2
  tail -n "${2:-30}" "$1" >&2 || true
}

# wait_for_line PID LOGFILE PATTERN [SECONDS]
wait_for_line() {
  local pid=$1 logfile=$2 pattern=$3 limit=$(( ${4:-60} * 10 )) n
  for ((n = 0; n < limit; n++)); do
    grep -q -- "$pattern" "$logfile" 2>/dev/null && return 0
    service_alive "$pid" || { show_log_tail "$logfile"; return 1; }
    sleep 0.1
  done
  show_log_tail "$logfile"
  return 1
}

# wait_for_http PID LOGFILE URL [SECONDS]
wait_for_http() {
  local pid=$1 logfile=$2 url=$3 deadline=$(( $(date +%s) + ${4:-90} ))
  while [ "$(date +%s)" -lt "$deadline" ]; do
    http_ok "$url" && return 0
    service_alive "$pid" || { show_log_tail "$logfile"; return 1; }
    sleep 0.3
  done
  show_log_tail "$logfile"
  return 1
}
