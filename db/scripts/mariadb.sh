#!/usr/bin/env bash
# Private MariaDB instance for Tidemark: own data directory, own socket and port,
# loopback only. Usage: mariadb.sh start | stop | status | create-db NAME | drop-db NAME
#
# Hardening (also applied in place to data directories of earlier versions):
# root exists only as root@localhost, which in MariaDB means the socket, and
# authenticates by the OS user (unix_socket), so there is no root over TCP and
# no root password to leak; the server runs as the `mysql` system user when we
# are root and it exists; files are read and written only in a folder of its
# own (secure_file_priv) and LOAD DATA LOCAL is off.
set -euo pipefail

ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/../.." && pwd)"
DATA_DIR="${TIDEMARK_DB_DATA_DIR:-$ROOT/.data/mariadb}"
RUN_DIR="${TIDEMARK_RUN_DIR:-$ROOT/.run}"
PORT="${DATABASE_PORT:-3399}"
SOCKET="$RUN_DIR/mariadb.sock"
PID_FILE="$RUN_DIR/mariadb.pid"
LOG_FILE="$RUN_DIR/mariadb.log"
FILES_DIR="$RUN_DIR/mariadb-files"
DB_NAME="${DATABASE_NAME:-tidemark}"
# The OS user whose socket login is the database administrator.
ADMIN_USER="$(id -un)"

# shellcheck source=db/scripts/secrets.sh
source "$ROOT/db/scripts/secrets.sh"

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

# The server runs as `mysql` when we are root and that user can reach both
# folders; otherwise as whoever runs this script.
server_user() {
  if [ "$(id -u)" -ne 0 ] || ! id mysql >/dev/null 2>&1; then id -un; return; fi
  if runuser -u mysql -- test -x "$(dirname "$DATA_DIR")" -a -x "$(dirname "$RUN_DIR")" 2>/dev/null; then
    echo mysql
  else
    echo root
  fi
}

# Socket login as the administrator. A data directory made before the
# hardening, by someone other than root, has only root@localhost without a
# password until harden_accounts has run: that login is used then.
login_user() {
  if [ "$ADMIN_USER" != root ] \
    && ! mariadb --no-defaults --socket="$SOCKET" -u"$ADMIN_USER" -e 'SELECT 1' >/dev/null 2>&1; then
    echo root
  else
    echo "$ADMIN_USER"
  fi
}

client() { mariadb --no-defaults --socket="$SOCKET" -u"$(login_user)" "$@"; }

admin() { mariadb-admin --no-defaults --socket="$SOCKET" -u"$(login_user)" "$@"; }

# ping answers "alive" even when the login is refused, so any account does.
is_running() {
  [ -S "$SOCKET" ] && mariadb-admin --no-defaults --socket="$SOCKET" -u"$ADMIN_USER" ping >/dev/null 2>&1
}

# SQL string literal for a value that may hold quotes or backslashes.
sql_quote() {
  local s="${1//\\/\\\\}"
  printf "'%s'" "${s//\'/\'\'}"
}

# A server started by an earlier version of this script (as root, reading any
# file) is restarted with the current options.
needs_restart() {
  local owner hardened
  owner="$(ps -o user= -p "$(cat "$PID_FILE" 2>/dev/null || echo 0)" 2>/dev/null || true)"
  hardened="$(client -N -e "SELECT TRIM(TRAILING '/' FROM @@secure_file_priv) = $(sql_quote "$FILES_DIR")
    AND @@local_infile = 0" 2>/dev/null || true)"
  [ "$hardened" != 1 ] || [ "${owner// /}" != "$(server_user)" ]
}

# Folders owned by the server's user and closed to everyone else, so only it
# (and root) reaches the socket.
prepare_dirs() {
  local user="$1"
  mkdir -p "$RUN_DIR" "$DATA_DIR" "$FILES_DIR"
  if [ "$user" != "$(id -un)" ]; then
    # Upgrade in place: a data directory and logs written by a server that ran as root.
    find "$DATA_DIR" "$FILES_DIR" ! -user "$user" -exec chown "$user:" {} +
    find "$RUN_DIR" -maxdepth 1 \( -name 'mariadb*' -o -path "$RUN_DIR" \) ! -user "$user" -exec chown "$user:" {} +
  fi
  chmod 0700 "$RUN_DIR" "$DATA_DIR" "$FILES_DIR"
}

start_server() {
  local user
  user="$(server_user)"
  if [ "$user" = root ]; then
    log "running the server as root: no mysql system user, or it cannot reach $DATA_DIR"
  fi
  prepare_dirs "$user"
  if [ ! -d "$DATA_DIR/mysql" ]; then
    log "initialising data directory $DATA_DIR"
    # Socket authentication: root@localhost and the administrator log in by
    # their OS user; no passwordless root, no TCP root accounts.
    mariadb-install-db --no-defaults --user="$user" --datadir="$DATA_DIR" \
      --auth-root-authentication-method=socket --auth-root-socket-user="$ADMIN_USER" \
      --skip-test-db --skip-name-resolve >"$RUN_DIR/mariadb-init.log" 2>&1
  fi
  rm -f "$SOCKET"
  log "starting on 127.0.0.1:$PORT as $user"
  nohup "$(mariadbd_bin)" --no-defaults --user="$user" --datadir="$DATA_DIR" \
    --socket="$SOCKET" --port="$PORT" --bind-address=127.0.0.1 --pid-file="$PID_FILE" \
    --log-error="$LOG_FILE" --skip-name-resolve --default-time-zone=+00:00 \
    --secure-file-priv="$FILES_DIR" --local-infile=0 \
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
}

# Idempotent: drops every root account other than root@localhost (the TCP
# ones an earlier `normal` install made) and anonymous accounts, and makes the
# socket logins authenticate by OS user only.
harden_accounts() {
  local drops
  drops="$(client -N -e "SELECT CONCAT('DROP USER ', QUOTE(User), '@', QUOTE(Host), ';')
    FROM mysql.global_priv WHERE (User = 'root' AND Host <> 'localhost') OR User = ''")"
  {
    printf '%s\n' "$drops"
    if [ "$ADMIN_USER" != root ]; then
      # Created before root is switched, so the administrator is never locked out.
      echo "CREATE USER IF NOT EXISTS $(sql_quote "$ADMIN_USER")@'localhost' IDENTIFIED VIA unix_socket;"
      echo "ALTER USER $(sql_quote "$ADMIN_USER")@'localhost' IDENTIFIED VIA unix_socket;"
      echo "GRANT ALL PRIVILEGES ON *.* TO $(sql_quote "$ADMIN_USER")@'localhost' WITH GRANT OPTION;"
    fi
    echo "ALTER USER 'root'@'localhost' IDENTIFIED VIA unix_socket;"
  } | client
}

start() {
  ensure_installed
  ensure_local_env
  load_local_env
  # Before server_user looks whether the mysql user can reach them.
  mkdir -p "$RUN_DIR" "$(dirname "$DATA_DIR")"
  if is_running && needs_restart; then
    log "restarting the running server with the hardened settings"
    stop
  fi
  if is_running; then
    log "already running (socket $SOCKET, port $PORT); reusing it"
  else
    start_server
  fi
  harden_accounts
  provision "$DB_NAME"
}

# Two accounts: the owner runs migrations and seeds (DDL); the application user
# can only read and write rows. Both are scoped to databases named tidemark*.
# The passwords come from .env.local (or the environment); ALTER USER makes
# accounts of an earlier run, with the old documented passwords, follow them.
provision() {
  local name="$1" owner app owner_pw app_pw
  load_local_env
  : "${DATABASE_OWNER_PASSWORD:?no owner password; run: bash db/scripts/mariadb.sh start}"
  : "${DATABASE_PASSWORD:?no app password; run: bash db/scripts/mariadb.sh start}"
  owner="$(sql_quote "${DATABASE_OWNER_USER:-tidemark_owner}")"
  app="$(sql_quote "${DATABASE_USER:-tidemark_app}")"
  owner_pw="$(sql_quote "$DATABASE_OWNER_PASSWORD")"
  app_pw="$(sql_quote "$DATABASE_PASSWORD")"
  client <<SQL
CREATE DATABASE IF NOT EXISTS \`$name\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;
CREATE USER IF NOT EXISTS $owner@'127.0.0.1' IDENTIFIED BY $owner_pw;
CREATE USER IF NOT EXISTS $owner@'localhost' IDENTIFIED BY $owner_pw;
CREATE USER IF NOT EXISTS $app@'127.0.0.1' IDENTIFIED BY $app_pw;
CREATE USER IF NOT EXISTS $app@'localhost' IDENTIFIED BY $app_pw;
ALTER USER $owner@'127.0.0.1' IDENTIFIED BY $owner_pw;
ALTER USER $owner@'localhost' IDENTIFIED BY $owner_pw;
ALTER USER $app@'127.0.0.1' IDENTIFIED BY $app_pw;
ALTER USER $app@'localhost' IDENTIFIED BY $app_pw;
GRANT ALL PRIVILEGES ON \`tidemark%\`.* TO $owner@'127.0.0.1', $owner@'localhost';
GRANT SELECT, INSERT, UPDATE, DELETE, EXECUTE ON \`tidemark%\`.* TO $app@'127.0.0.1', $app@'localhost';
SQL
}

stop() {
  if is_running; then
    log "stopping"
    admin shutdown
    # shutdown returns before the socket is gone; a new start must not see it.
    for _ in $(seq 1 150); do
      if ! is_running; then break; fi
      sleep 0.2
    done
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
