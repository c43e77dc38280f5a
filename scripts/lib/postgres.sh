# shellcheck shell=bash
# A PostgreSQL cluster owned by the project: its own data folder, 127.0.0.1 only, its own port.
# Needs PGBIN (packages.sh: ensure_postgres_installed). Sets HB_PG_DIR, PGPORT, HB_PG_STARTED.

HB_PG_DEFAULT_PORT=54329
HB_PG_USER=hodboard
HB_PG_STARTED=0

# initdb refuses to run as root, so as root the cluster belongs to the postgres system user.
# From / because postgres may not be allowed into the caller's working directory.
as_pg() {
  if hb_is_root; then (cd / && runuser -u postgres -- "$@"); else "$@"; fi
}

pg_choose_dir() {
  local dir="$HB_DATA/postgres"
  if hb_is_root; then
    id postgres >/dev/null 2>&1 || die "no postgres system user (is the postgresql package installed?)"
    mkdir -p "$HB_DATA"
    # Every parent of the data folder must be traversable by postgres; a checkout under
    # /root, for one, is not. Then the cluster lives in the temp dir, keyed by checkout path.
    if ! runuser -u postgres -- test -x "$HB_DATA"; then
      local tmp="${TMPDIR:-/tmp}"
      runuser -u postgres -- test -w "$tmp" || tmp=/tmp
      dir="$tmp/hodboard-pg-$(path_hash "$HB_ROOT")"
      note "postgres cannot reach $HB_DATA; cluster goes to $dir"
    fi
    mkdir -p "$dir"
    [ -L "$dir" ] && die "$dir is a symlink; refusing to use it"
    chown postgres:postgres "$dir"
  else
    mkdir -p "$dir"
  fi
  chmod 700 "$dir"
  HB_PG_DIR=$dir
}

pg_running() { as_pg "$PGBIN/pg_ctl" -D "$HB_PG_DIR/data" status >/dev/null 2>&1; }

# pg_start [extra server options]: initialises the cluster on first use, starts it unless it is running.
pg_start() {
  local extra="${1:-}" data="$HB_PG_DIR/data" major
  major=$(basename "$(dirname "$PGBIN")")
  if [ ! -f "$data/PG_VERSION" ]; then
    log "Creating a PostgreSQL $major cluster in $data"
    as_pg "$PGBIN/initdb" -D "$data" -U "$HB_PG_USER" --auth=trust -E UTF8 --locale=C.UTF-8 >"$HB_PG_DIR/initdb.log" 2>&1 ||
      { cat "$HB_PG_DIR/initdb.log" >&2; die "initdb failed"; }
  fi
  [ "$(cat "$data/PG_VERSION")" = "$major" ] ||
    die "$data was made by PostgreSQL $(cat "$data/PG_VERSION") but $PGBIN is $major; remove $HB_PG_DIR to start afresh"

  if pg_running; then
    # Line 4 of postmaster.pid is the port the running server listens on.
    PGPORT=$(sed -n 4p "$data/postmaster.pid")
    note "PostgreSQL already running on 127.0.0.1:$PGPORT (left running afterwards)"
    HB_PG_STARTED=0
    return 0
  fi

  local port
  port=$(cat "$HB_PG_DIR/port" 2>/dev/null || echo "$HB_PG_DEFAULT_PORT")
  if ! port_is_free "$port"; then
    local taken=$port
    port=$(free_port)
    note "port $taken is taken; PostgreSQL moves to $port"
  fi
  echo "$port" >"$HB_PG_DIR/port"
  # No Unix socket: every client connects over TCP, and a deep checkout path could exceed the
  # socket path limit anyway.
  as_pg "$PGBIN/pg_ctl" -D "$data" -l "$HB_PG_DIR/server.log" -w -t 60 \
    -o "-h 127.0.0.1 -p $port -k '' $extra" start >/dev/null ||
    { tail -n 20 "$HB_PG_DIR/server.log" >&2; die "PostgreSQL did not start (log: $HB_PG_DIR/server.log)"; }
  PGPORT=$port
  HB_PG_STARTED=1
  note "PostgreSQL started on 127.0.0.1:$PGPORT"
}

pg_stop_if_started() {
  [ "$HB_PG_STARTED" = 1 ] || return 0
  HB_PG_STARTED=0
  as_pg "$PGBIN/pg_ctl" -D "$HB_PG_DIR/data" -m fast -w -t 30 stop >/dev/null && note "PostgreSQL stopped"
}

pg_psql() {
  "$PGBIN/psql" -X -q -v ON_ERROR_STOP=1 -h 127.0.0.1 -p "$PGPORT" -U "$HB_PG_USER" -d postgres "$@"
}

pg_url() { echo "postgres://$HB_PG_USER@127.0.0.1:$PGPORT/$1"; }

pg_db_exists() {
  [ "$(pg_psql -tAc "SELECT 1 FROM pg_database WHERE datname = '$1'")" = 1 ]
}

pg_create_db() {
  pg_db_exists "$1" && return 0
  pg_psql -c "CREATE DATABASE \"$1\" OWNER $HB_PG_USER" || die "could not create database $1"
  note "database $1 created"
}

pg_drop_db() {
  pg_psql -c "DROP DATABASE IF EXISTS \"$1\" WITH (FORCE)" && note "database $1 dropped"
}

# Throwaway databases are named hodboard_test_<pid>_...; drop those whose run has died.
pg_drop_stale_test_dbs() {
  local db pid
  for db in $(pg_psql -tAc "SELECT datname FROM pg_database WHERE datname LIKE 'hodboard\_test\_%'"); do
    pid=${db#hodboard_test_}
    pid=${pid%%_*}
    if [[ "$pid" =~ ^[0-9]+$ ]] && ! kill -0 "$pid" 2>/dev/null; then
      pg_drop_db "$db" >/dev/null || true
      note "dropped stale $db"
    fi
  done
}
