#!/usr/bin/env bash
# Private MariaDB instance for Tidemark: own data directory, own socket and port,
# loopback only. Usage: mariadb.sh start | stop | status | create-db NAME | drop-db NAME
set -euo pipefail

ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/../.." && pwd)"
DATA_DIR="${TIDEMARK_DB_DATA_DIR:-$ROOT/.data/mariadb}"
RUN_DIR="${TIDEMARK_RUN_DIR:-$ROOT/.run}"
PORT="${DATABASE_PORT:-3399}"
SOCKET="$RUN_DIR/mariadb.sock"
PID_FILE="$RUN_DIR/mariadb.pid"
LOG_FILE="$RUN_DIR/mariadb.log"
DB_NAME="${DATABASE_NAME:-tidemark}"
# Documented demo credentials (README "Configuration"); production sets its own.
OWNER_USER="${DATABASE_OWNER_USER:-tidemark_owner}"
OWNER_PASSWORD="${DATABASE_OWNER_PASSWORD:-tidemark-owner-dev}"
APP_USER="${DATABASE_USER:-tidemark_app}"
APP_PASSWORD="${DATABASE_PASSWORD:-tidemark-app-dev}"

log() { printf '[db] %s\n' "$*"; }

as_root() { if [ "$(id -u)" -eq 0 ]; then "$@"; else sudo "$@"; fi; }

ensure_installed() {
  if command -v mariadbd >/dev/null 2>&1 || [ -x /usr/sbin/mariadbd ]; then return; fi
  log "MariaDB server not found; installing Debian's mariadb-server"
  as_root apt-get update -qq
  as_root env DEBIAN_FRONTEND=noninteractive apt-get install -y -qq mariadb-server >/dev/null
  # Debian's package may start its own system instance; ours is separate and does not need it.
}

mariadbd_bin() { command -v mariadbd || echo /usr/sbin/mariadbd; }

client() { mariadb --no-defaults --socket="$SOCKET" -uroot "$@"; }

is_running() {
  [ -S "$SOCKET" ] && mariadb-admin --no-defaults --socket="$SOCKET" -uroot ping >/dev/null 2>&1
}

start() {
  ensure_installed
  mkdir -p "$RUN_DIR"
  if is_running; then
    log "already running (socket $SOCKET, port $PORT); reusing it"
  else
    if [ ! -d "$DATA_DIR/mysql" ]; then
      log "initialising data directory $DATA_DIR"
      mkdir -p "$DATA_DIR"
      mariadb-install-db --no-defaults --user="$(id -un)" --datadir="$DATA_DIR" \
        --auth-root-authentication-method=normal --skip-test-db --skip-name-resolve >"$RUN_DIR/mariadb-init.log" 2>&1
    fi
    rm -f "$SOCKET"
    log "starting on 127.0.0.1:$PORT"
    nohup "$(mariadbd_bin)" --no-defaults --user="$(id -un)" --datadir="$DATA_DIR" \
      --socket="$SOCKET" --port="$PORT" --bind-address=127.0.0.1 --pid-file="$PID_FILE" \
      --log-error="$LOG_FILE" --skip-name-resolve --default-time-zone=+00:00 \
      --character-set-server=utf8mb4 --collation-server=utf8mb4_unicode_ci --skip-log-bin \
      --max-connections=300 --innodb-buffer-pool-size=256M >/dev/null 2>&1 &
    for _ in $(seq 1 150); do
      if is_running; then break; fi
      sleep 0.2
    done
    if ! is_running; then
      log "MariaDB did not answer; last lines of $LOG_FILE:"
      tail -20 "$LOG_FILE" >&2 || true
      exit 1
    fi
  fi
  provision "$DB_NAME"
}

# Two accounts: the owner runs migrations and seeds (DDL); the application user
# can only read and write rows. Both are scoped to databases named tidemark*.
provision() {
  local name="$1"
  client <<SQL
CREATE DATABASE IF NOT EXISTS \`$name\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;
CREATE USER IF NOT EXISTS '$OWNER_USER'@'127.0.0.1' IDENTIFIED BY '$OWNER_PASSWORD';
CREATE USER IF NOT EXISTS '$OWNER_USER'@'localhost' IDENTIFIED BY '$OWNER_PASSWORD';
CREATE USER IF NOT EXISTS '$APP_USER'@'127.0.0.1' IDENTIFIED BY '$APP_PASSWORD';
CREATE USER IF NOT EXISTS '$APP_USER'@'localhost' IDENTIFIED BY '$APP_PASSWORD';
GRANT ALL PRIVILEGES ON \`tidemark%\`.* TO '$OWNER_USER'@'127.0.0.1', '$OWNER_USER'@'localhost';
GRANT SELECT, INSERT, UPDATE, DELETE, EXECUTE ON \`tidemark%\`.* TO '$APP_USER'@'127.0.0.1', '$APP_USER'@'localhost';
SQL
}

stop() {
  if is_running; then
    log "stopping"
    mariadb-admin --no-defaults --socket="$SOCKET" -uroot shutdown
  else
    log "not running"
  fi
}

status() {
  if is_running; then log "running on 127.0.0.1:$PORT (socket $SOCKET, data $DATA_DIR)"; else log "not running"; return 1; fi
}

case "${1:-}" in
  start) start ;;
  stop) stop ;;
  status) status ;;
  create-db) is_running || start >/dev/null; provision "${2:?database name}" ;;
  drop-db) is_running || start >/dev/null; client -e "DROP DATABASE IF EXISTS \`${2:?database name}\`" ;;
  *) echo "usage: $0 start|stop|status|create-db NAME|drop-db NAME" >&2; exit 2 ;;
esac
