#!/usr/bin/env bash
# `npm run cluster`: Tidemark on several servers, all on this machine — a
# 3-node MariaDB Galera cluster, 3 app servers, 2 alert workers, the local mail
# inbox and HAProxy in front (the app on http://localhost:$PORT, the database
# on 127.0.0.1:$CLUSTER_DB_PORT), health-checked. Migrates and seeds once,
# prints what runs where; Ctrl-C stops it all.
#
#   cluster.sh           start everything and wait (Ctrl-C stops)
#   cluster.sh up        start everything and return (the cluster tests use this)
#   cluster.sh down      stop everything `up` started
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/prepare.sh"
# shellcheck source=db/scripts/galera.sh
source "$ROOT/db/scripts/galera.sh"

PORT="${PORT:-3000}"
CLUSTER_DB_PORT="${CLUSTER_DB_PORT:-3410}"
APP_PORT_BASE="${CLUSTER_APP_PORT_BASE:-3100}"
APP_PORTS=($((APP_PORT_BASE + 1)) $((APP_PORT_BASE + 2)) $((APP_PORT_BASE + 3)))
WORKERS=2
MAIL_INBOX_PORT="${MAIL_INBOX_PORT:-2580}"
export SMTP_PORT="${SMTP_PORT:-2525}"
export DATABASE_NAME="${DATABASE_NAME:-tidemark_cluster}"
export TIDEMARK_DEMO="${TIDEMARK_DEMO:-1}"
export NEXTAUTH_URL="${NEXTAUTH_URL:-http://localhost:$PORT}"

# The check account's password lives beside the other secrets of this install.
LOCAL_SECRETS+=(CLUSTER_CHECK_PASSWORD)

pid_of() { cat "$CLUSTER_DIR/$1.pid" 2>/dev/null || true; }
# A missing PID file must never become `kill 0`, which signals our own group.
running() { local pid; pid="$(pid_of "$1")"; [ -n "$pid" ] && [ "$pid" -gt 1 ] && kill -0 "$pid" 2>/dev/null; }
stop_proc() {
  if running "$1"; then kill "$(pid_of "$1")" 2>/dev/null || true; fi
  rm -f "$CLUSTER_DIR/$1.pid"
}

wait_http() {
  local url="$1" what="$2"
  for _ in $(seq 1 150); do curl -sf -o /dev/null "$url" && return 0; sleep 0.2; done
  echo "$what did not answer on $url" >&2
  return 1
}

# HAProxy: the app servers behind /api/health, the Galera nodes behind a check
# that asks each node whether it is Synced. A node that leaves the primary
# component is marked down within 2 s and its connections are cut, so the apps'
# pools reconnect to the others; a request is re-sent to another app server only
# when its connection could not be made (never a POST that reached a server).
write_haproxy_config() {
  local n i cfg="$CLUSTER_DIR/haproxy.cfg" check="$CLUSTER_DIR/galera-check.sh"
  umask 077
  cat >"$CLUSTER_DIR/check.cnf" <<CNF
[client]
user=tidemark_check
password=$CLUSTER_CHECK_PASSWORD
CNF
  cat >"$check" <<CHECK
#!/bin/sh
# HAProxy external check: \$3 is the node's address, \$4 its port.
state=\$(mariadb --defaults-extra-file="$CLUSTER_DIR/check.cnf" -h "\$3" -P "\$4" --connect-timeout=1 -N \\
  -e "SHOW GLOBAL STATUS LIKE 'wsrep_local_state'" 2>/dev/null | cut -f2)
[ "\$state" = 4 ]
CHECK
  chmod 0700 "$check"
  {
    cat <<CFG
global
  maxconn 4000
  external-check
  insecure-fork-wanted
  stats socket $CLUSTER_DIR/haproxy.sock mode 600 level admin
  pidfile $CLUSTER_DIR/haproxy.pid

defaults
  timeout connect 2s
  timeout client 10m
  timeout server 10m
  retries 2

frontend web
  mode http
  bind 127.0.0.1:$PORT
  option forwardfor
  default_backend apps

backend apps
  mode http
  balance roundrobin
  option redispatch
  option httpchk GET /api/health
  default-server inter 1s fall 2 rise 2
CFG
    for i in "${!APP_PORTS[@]}"; do echo "  server app$((i + 1)) 127.0.0.1:${APP_PORTS[$i]} check"; done
    cat <<CFG

listen galera
  mode tcp
  bind 127.0.0.1:$CLUSTER_DB_PORT
  balance roundrobin
  option external-check
  external-check path "/usr/bin:/bin"
  external-check command $check
  default-server inter 1s fall 2 rise 2 on-marked-down shutdown-sessions
CFG
    for n in $(seq 1 "$CLUSTER_NODES"); do echo "  server node$n $(node_host "$n"):$(node_sql_port "$n") check"; done
  } >"$cfg"
}

ensure_haproxy() {
  command -v haproxy >/dev/null && return
  say "Installing HAProxy from Debian's packages"
  apt_install haproxy
}

start_app() {
  local i="$1" port="${APP_PORTS[$1]}"
  # HAProxy sets X-Forwarded-For: trusted, so sign-in throttling sees the client's address.
  DATABASE_HOST=127.0.0.1 DATABASE_PORT="$CLUSTER_DB_PORT" TRUSTED_PROXIES="${TRUSTED_PROXIES:-127.0.0.1}" \
    node_modules/.bin/next start -H 127.0.0.1 -p "$port" >"$CLUSTER_DIR/app$((i + 1)).log" 2>&1 &
  echo $! >"$CLUSTER_DIR/app$((i + 1)).pid"
}

# One process (node with tsx's loader, not the tsx wrapper), so killing the PID
# kills the worker itself.
start_worker() {
  local w="$1"
  DATABASE_HOST=127.0.0.1 DATABASE_PORT="$CLUSTER_DB_PORT" \
    node --import tsx db/scripts/alert-worker.ts >"$CLUSTER_DIR/worker$w.log" 2>&1 &
  echo $! >"$CLUSTER_DIR/worker$w.pid"
}

up() {
  ensure_local_env && load_local_env
  ensure_node_modules
  if ! command -v mariadbd >/dev/null 2>&1 && [ ! -x /usr/sbin/mariadbd ]; then
    say "Installing MariaDB server from Debian's packages"
    apt_install mariadb-server mariadb-client
  fi
  ensure_haproxy
  mkdir -p "$CLUSTER_DIR"
  say "Starting the Galera cluster ($CLUSTER_NODES nodes)"
  galera_up
  cluster_provision "$DATABASE_NAME"

  say "Migrating and seeding once, on node 1"
  DATABASE_HOST="$(node_host 1)" DATABASE_PORT="$(node_sql_port 1)" knex_cli migrate:latest
  if [ "$(node_sql 1 -N -e "SELECT COUNT(*) FROM \`$DATABASE_NAME\`.units")" = 0 ]; then
    DATABASE_HOST="$(node_host 1)" DATABASE_PORT="$(node_sql_port 1)" knex_cli seed:run
  fi
  DATABASE_HOST="$(node_host 1)" DATABASE_PORT="$(node_sql_port 1)" npx tsx db/scripts/roll-assignments.ts
  DATABASE_HOST="$(node_host 1)" DATABASE_PORT="$(node_sql_port 1)" npx tsx db/scripts/rebuild-rollups.ts --if-empty

  if build_is_stale; then say "Building the app"; npx next build; fi

  say "Starting HAProxy, $((${#APP_PORTS[@]})) app servers, $WORKERS alert workers and the mail inbox"
  write_haproxy_config
  stop_proc haproxy
  haproxy -D -f "$CLUSTER_DIR/haproxy.cfg"
  for _ in $(seq 1 50); do [ -s "$CLUSTER_DIR/haproxy.pid" ] && break; sleep 0.1; done
  # The cluster tests bring their own SMTP fake, so they can stop and restart it.
  if [ -z "${CLUSTER_EXTERNAL_SMTP:-}" ] && ! running mail-inbox; then
    MAIL_INBOX_PORT="$MAIL_INBOX_PORT" node_modules/.bin/tsx db/scripts/mail-inbox.ts >"$CLUSTER_DIR/mail-inbox.log" 2>&1 &
    echo $! >"$CLUSTER_DIR/mail-inbox.pid"
  fi
  local i w
  for i in "${!APP_PORTS[@]}"; do running "app$((i + 1))" || start_app "$i"; done
  for w in $(seq 1 "$WORKERS"); do running "worker$w" || start_worker "$w"; done
  for i in "${!APP_PORTS[@]}"; do wait_http "http://127.0.0.1:${APP_PORTS[$i]}/api/health" "app server $((i + 1))"; done
  wait_http "http://127.0.0.1:$PORT/api/health" "the load balancer"
  [ -n "${CLUSTER_EXTERNAL_SMTP:-}" ] || wait_http "http://127.0.0.1:$MAIL_INBOX_PORT/api/messages" "the mail inbox"
  print_layout
}

print_layout() {
  local n i w
  echo
  echo "What runs where (logs in ${CLUSTER_DIR#"$ROOT"/}):"
  for n in $(seq 1 "$CLUSTER_NODES"); do
    printf '  galera node%s   %s:%s  replication :%s  pid %s\n' "$n" "$(node_host "$n")" "$(node_sql_port "$n")" \
      "$(node_gcomm_port "$n")" "$(cat "$(node_pid_file "$n")" 2>/dev/null)"
  done
  printf '  database      127.0.0.1:%s  (HAProxy over the Synced nodes)\n' "$CLUSTER_DB_PORT"
  for i in "${!APP_PORTS[@]}"; do printf '  app server %s  127.0.0.1:%s  pid %s\n' "$((i + 1))" "${APP_PORTS[$i]}" "$(pid_of "app$((i + 1))")"; done
  for w in $(seq 1 "$WORKERS"); do printf '  alert worker %s              pid %s\n' "$w" "$(pid_of "worker$w")"; done
  if [ -n "${CLUSTER_EXTERNAL_SMTP:-}" ]; then
    printf '  SMTP          127.0.0.1:%s (the caller'"'"'s own)\n' "$SMTP_PORT"
  else
    printf '  mail inbox    http://127.0.0.1:%s (SMTP 127.0.0.1:%s)\n' "$MAIL_INBOX_PORT" "$SMTP_PORT"
  fi
  printf '  the app       http://localhost:%s  (HAProxy over the app servers)\n' "$PORT"
  echo
}

down() {
  local i w
  for i in "${!APP_PORTS[@]}"; do stop_proc "app$((i + 1))"; done
  for w in $(seq 1 "$WORKERS"); do stop_proc "worker$w"; done
  stop_proc mail-inbox
  stop_proc haproxy
  galera_down
}

# One part at a time, for the fault-injection tests.
part() {
  local what="$1" n="${2:?which one}"
  case "$what" in
    node-kill) node_kill "$n" ;;
    node-stop) node_stop "$n" ;;
    node-start) node_start "$n" join ;;
    node-wait) node_wait_synced "$n" ;;
    node-pause) kill -STOP "$(cat "$(node_pid_file "$n")")" ;;
    node-resume) kill -CONT "$(cat "$(node_pid_file "$n")")" ;;
    node-cut) node_cut "$n" ;;
    node-reconnect) node_reconnect "$n" ;;
    app-kill) kill -9 "$(pid_of "app$n")" ;;
    app-start) start_app "$((n - 1))"; wait_http "http://127.0.0.1:${APP_PORTS[$((n - 1))]}/api/health" "app server $n" ;;
    worker-kill) kill -9 "$(pid_of "worker$n")" ;;
    worker-pause) kill -STOP "$(pid_of "worker$n")" ;;
    worker-resume) kill -CONT "$(pid_of "worker$n")" ;;
    worker-start) start_worker "$n" ;;
    *) echo "unknown part command $what" >&2; return 2 ;;
  esac
}

# Node N's address for clients: "host port socket".
nodes() {
  local n
  for n in $(seq 1 "$CLUSTER_NODES"); do echo "$n $(node_host "$n") $(node_sql_port "$n") $(node_socket "$n")"; done
}

case "${1:-run}" in
  up) up ;;
  down) down ;;
  nodes) nodes ;;
  node-* | app-* | worker-*) load_local_env; part "$1" "${2:-}" ;;
  run)
    trap 'echo; say "Stopping the cluster"; down; exit 0' INT TERM
    up
    npx tsx db/scripts/print-sign-ins.ts "$NEXTAUTH_URL" "http://127.0.0.1:$MAIL_INBOX_PORT"
    echo "Ctrl-C stops the app servers, workers, load balancer and all three database nodes."
    while true; do sleep 1; done
    ;;
  *) echo "usage: $0 [up|down]" >&2; exit 2 ;;
esac
