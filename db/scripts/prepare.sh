#!/usr/bin/env bash
# Shared preparation for `npm run demo` and `npm test`: npm packages, the private
# MariaDB (installed from Debian's packages when missing) and, with --browser,
# Debian's Chromium; the secrets of this install (.env.local, generated on first
# run), exported so every later step reads them. Source it from the other scripts.
set -euo pipefail

ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/../.." && pwd)"
cd "$ROOT"
# shellcheck source=db/scripts/secrets.sh
source "$ROOT/db/scripts/secrets.sh"
export NEXT_TELEMETRY_DISABLED=1
export PLAYWRIGHT_SKIP_BROWSER_DOWNLOAD=1

say() { printf '\n\033[1m== %s\033[0m\n' "$*"; }
as_root() { if [ "$(id -u)" -eq 0 ]; then "$@"; else sudo "$@"; fi; }

apt_install() {
  # Refresh the package lists once per preparation, only when something is missing.
  if [ -z "${TIDEMARK_APT_UPDATED:-}" ]; then
    as_root apt-get update -qq
    export TIDEMARK_APT_UPDATED=1
  fi
  as_root env DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "$@" >/dev/null
}

ensure_node_modules() {
  local marker="node_modules/.package-lock.json"
  if [ ! -f "$marker" ] || [ package-lock.json -nt "$marker" ]; then
    say "Installing npm packages (npm ci)"
    npm ci --no-audit --no-fund --loglevel=error
  fi
}

ensure_mariadb() {
  if ! command -v mariadbd >/dev/null 2>&1 && [ ! -x /usr/sbin/mariadbd ]; then
    say "Installing MariaDB server from Debian's packages"
    apt_install mariadb-server mariadb-client
  fi
  say "Starting the private MariaDB"
  bash db/scripts/mariadb.sh start
}

ensure_chromium() {
  if [ ! -x /usr/bin/chromium ]; then
    say "Installing Chromium from Debian's packages"
    apt_install chromium
  fi
}

knex_cli() { npx tsx node_modules/knex/bin/cli.js --knexfile knexfile.ts "$@"; }

# True when the last build is older than any source file it was built from.
build_is_stale() {
  [ ! -f .next/BUILD_ID ] && return 0
  [ -n "$(find app components lib middleware.ts next.config.mjs tailwind.config.ts package-lock.json \
    -newer .next/BUILD_ID -type f -print -quit 2>/dev/null)" ]
}

# Each step is checked explicitly: callers run this under `||`, where set -e is off.
prepare() {
  ensure_local_env || return 1
  load_local_env || return 1
  ensure_node_modules || return 1
  ensure_mariadb || return 1
  if [ "${1:-}" = "--browser" ]; then ensure_chromium || return 1; fi
}
