# shellcheck shell=bash
# pnpm, workspace dependencies and the Debian packages the scripts rely on.

HB_PNPM_VERSION=10.34.9
HB_APT_UPDATED=

ensure_pnpm() {
  if command -v pnpm >/dev/null 2>&1; then
    local have
    have=$(pnpm --version 2>/dev/null || true)
    [ "$have" = "$HB_PNPM_VERSION" ] || warn "pnpm $have found; this project is tested with $HB_PNPM_VERSION"
    return 0
  fi
  log "Installing pnpm $HB_PNPM_VERSION"
  local prefix
  prefix=$(npm prefix -g)
  if [ -w "$prefix" ] || [ -w "$prefix/lib" ]; then
    npm install -g --no-fund --no-audit "pnpm@$HB_PNPM_VERSION" || die "could not install pnpm"
  else
    as_root npm install -g --no-fund --no-audit "pnpm@$HB_PNPM_VERSION" || die "could not install pnpm"
  fi
  command -v pnpm >/dev/null 2>&1 || die "pnpm was installed but is not on PATH ($(npm prefix -g)/bin)"
}

# Everything that decides what `pnpm install` lays down; a change to any of them means reinstall.
deps_fingerprint() {
  (
    cd "$HB_ROOT"
    cat pnpm-lock.yaml pnpm-workspace.yaml .npmrc package.json apps/*/package.json packages/*/package.json 2>/dev/null
    echo "pnpm $HB_PNPM_VERSION node $(node --version)"
  ) | sha256sum | cut -d' ' -f1
}

ensure_deps() {
  local stamp="$HB_ROOT/node_modules/.hodboard-install" want
  want=$(deps_fingerprint)
  if [ -f "$stamp" ] && [ "$(cat "$stamp")" = "$want" ]; then
    note "dependencies up to date"
    return 0
  fi
  log "Installing dependencies from pnpm-lock.yaml"
  # Debian's Chromium runs the browser tests; Playwright must never fetch its own.
  # NODE_ENV=production in the caller's shell would make pnpm leave out devDependencies.
  (cd "$HB_ROOT" && NODE_ENV=development PLAYWRIGHT_SKIP_BROWSER_DOWNLOAD=1 pnpm install --frozen-lockfile --prefer-offline) ||
    die "pnpm install --frozen-lockfile failed (is pnpm-lock.yaml in step with every package.json?)"
  echo "$want" >"$stamp"
}

apt_install() {
  if [ -z "$HB_APT_UPDATED" ]; then
    as_root env DEBIAN_FRONTEND=noninteractive apt-get update -qq || die "apt-get update failed"
    HB_APT_UPDATED=1
  fi
  as_root env DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "$@" || die "apt-get install $* failed"
}

find_pg_bin() {
  PGBIN=$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -1 || true)
  [ -n "$PGBIN" ] && [ -x "$PGBIN/initdb" ]
}

ensure_postgres_installed() {
  if find_pg_bin; then
    note "PostgreSQL binaries: $PGBIN"
    return 0
  fi
  log "Installing PostgreSQL from Debian's packages"
  apt_install postgresql
  find_pg_bin || die "PostgreSQL was installed but no /usr/lib/postgresql/*/bin/initdb was found"
  stop_debian_main_cluster
}

# Debian's postinst creates a "main" cluster and starts it on 5432; the project runs its own cluster, so the one
# that this install just started is stopped again. Only called right after installing: a cluster that was already
# there may be someone's own. Failure (no such cluster, not running, no systemd) is fine.
stop_debian_main_cluster() {
  command -v pg_ctlcluster >/dev/null 2>&1 || return 0
  local dir ver
  for dir in /etc/postgresql/*/main; do
    [ -d "$dir" ] || continue
    ver=$(basename "$(dirname "$dir")")
    # A subshell, because as_root exits the script when it cannot get root.
    if (as_root pg_ctlcluster "$ver" main stop) >/dev/null 2>&1; then
      note "stopped Debian's own PostgreSQL cluster $ver/main; Hodboard runs its own"
    fi
  done
  return 0
}

ensure_chromium_installed() {
  if [ -x /usr/bin/chromium ]; then
    note "Chromium: $(/usr/bin/chromium --version 2>/dev/null || echo /usr/bin/chromium)"
    return 0
  fi
  log "Installing Chromium from Debian's packages"
  apt_install chromium
  [ -x /usr/bin/chromium ] || die "chromium was installed but /usr/bin/chromium is missing"
}
