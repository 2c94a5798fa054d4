#!/usr/bin/env bash
# A 3-node MariaDB Galera cluster on this machine, from Debian's packages
# (mariadb-server brings galera-4). Each node has its own data directory,
# socket and ports. Sourced by cluster.sh and the cluster tests; expects ROOT.
#
# Two layouts:
# - loopback (default): every node on 127.0.0.1, ports 3411-3413 for SQL and
#   4510/4520/4530 for replication;
# - netns (TIDEMARK_CLUSTER_NETNS=1, root only): each node in a network
#   namespace of its own on a private bridge (10.77.0.11-13, standard ports), so
#   a test can cut one node off the network for real. The unix sockets stay in
#   the shared file system, so a cut-off node can still be asked how it is.

CLUSTER_DIR="${TIDEMARK_CLUSTER_DIR:-$ROOT/.run/cluster}"
CLUSTER_DATA="${TIDEMARK_CLUSTER_DATA:-$ROOT/.data/cluster}"
CLUSTER_NODES=3
CLUSTER_NAME=tidemark
CLUSTER_NETNS="${TIDEMARK_CLUSTER_NETNS:-0}"
BRIDGE=tmbr0
BRIDGE_ADDR=10.77.0.1

# The OS user whose socket login administers every node.
GALERA_ADMIN="$(id -un)"

galera_log() { printf '[galera] %s\n' "$*"; }

node_host() { if [ "$CLUSTER_NETNS" = 1 ]; then echo "10.77.0.1$1"; else echo 127.0.0.1; fi; }
node_sql_port() { if [ "$CLUSTER_NETNS" = 1 ]; then echo 3306; else echo $((3410 + $1)); fi; }
node_gcomm_port() { if [ "$CLUSTER_NETNS" = 1 ]; then echo 4567; else echo $((4500 + 10 * $1)); fi; }
node_socket() { echo "$CLUSTER_DIR/node$1.sock"; }
node_pid_file() { echo "$CLUSTER_DIR/node$1.pid"; }
node_log() { echo "$CLUSTER_DIR/node$1.log"; }
node_datadir() { echo "$CLUSTER_DATA/node$1"; }
node_ns() { echo "tmg$1"; }

# Runs a command in node N's namespace (or plainly, on loopback).
in_node() {
  local n="$1"; shift
  if [ "$CLUSTER_NETNS" = 1 ]; then ip netns exec "$(node_ns "$n")" "$@"; else "$@"; fi
}

node_sql() {
  local n="$1"; shift
  mariadb --no-defaults --socket="$(node_socket "$n")" -u"$GALERA_ADMIN" "$@"
}

node_alive() {
  [ -S "$(node_socket "$1")" ] && mariadb-admin --no-defaults --socket="$(node_socket "$1")" -u"$GALERA_ADMIN" ping >/dev/null 2>&1
}

# wsrep_local_state 4 = Synced: in the primary component and caught up.
node_synced() {
  [ "$(node_sql "$1" -N -e "SHOW GLOBAL STATUS LIKE 'wsrep_local_state'" 2>/dev/null | cut -f2)" = 4 ]
}

galera_provider() {
  local p
  for p in /usr/lib/galera/libgalera_smm.so /usr/lib/libgalera_smm.so /usr/lib/x86_64-linux-gnu/galera/libgalera_smm.so; do
    [ -f "$p" ] && { echo "$p"; return; }
  done
  return 1
}

ensure_galera_installed() {
  if galera_provider >/dev/null && command -v rsync >/dev/null; then return; fi
  galera_log "installing Debian's galera-4 and rsync (state transfer)"
  as_root env DEBIAN_FRONTEND=noninteractive apt-get install -y -qq galera-4 rsync >/dev/null
}

galera_server_user() {
  if [ "$(id -u)" -eq 0 ] && id mysql >/dev/null 2>&1 \
    && runuser -u mysql -- test -x "$(dirname "$CLUSTER_DATA")" -a -x "$(dirname "$CLUSTER_DIR")" 2>/dev/null; then
    echo mysql
  else
    id -un
  fi
}

# The private bridge and one namespace per node (netns layout only).
netns_up() {
  [ "$CLUSTER_NETNS" = 1 ] || return 0
  ip link show "$BRIDGE" >/dev/null 2>&1 || {
    ip link add "$BRIDGE" type bridge
    ip addr add "$BRIDGE_ADDR/24" dev "$BRIDGE"
    ip link set "$BRIDGE" up
  }
  local n ns
  for n in $(seq 1 "$CLUSTER_NODES"); do
    ns="$(node_ns "$n")"
    ip netns list | grep -qw "$ns" && continue
    ip netns add "$ns"
    ip link add "tmv$n" type veth peer name "tmp$n"
    ip link set "tmp$n" netns "$ns"
    ip link set "tmv$n" master "$BRIDGE"
    ip link set "tmv$n" up
    ip netns exec "$ns" ip addr add "$(node_host "$n")/24" dev "tmp$n"
    ip netns exec "$ns" ip link set "tmp$n" up
    ip netns exec "$ns" ip link set lo up
  done
}

netns_down() {
  [ "$CLUSTER_NETNS" = 1 ] || return 0
  local n
  for n in $(seq 1 "$CLUSTER_NODES"); do
    ip link del "tmv$n" 2>/dev/null || true
    ip netns del "$(node_ns "$n")" 2>/dev/null || true
  done
  ip link del "$BRIDGE" 2>/dev/null || true
}

# Cuts node N off the others (and from the clients): its link to the bridge goes down.
node_cut() { ip link set "tmv$1" down; }
node_reconnect() { ip link set "tmv$1" up; }

cluster_address() {
  local n list=""
  for n in $(seq 1 "$CLUSTER_NODES"); do list+="${list:+,}$(node_host "$n"):$(node_gcomm_port "$n")"; done
  echo "gcomm://$list"
}

# After a crash the state file says seqno -1: the position is recovered from
# InnoDB first, so the node can catch up by incremental transfer (IST) instead
# of copying everything (SST).
recovered_position() {
  local n="$1" datadir user out
  datadir="$(node_datadir "$n")"
  user="$(galera_server_user)"
  grep -q '^seqno:[[:space:]]*-1' "$datadir/grastate.dat" 2>/dev/null || return 0
  out="$CLUSTER_DIR/node$n.recover.log"
  "$(command -v mariadbd || echo /usr/sbin/mariadbd)" --no-defaults --user="$user" --datadir="$datadir" \
    --wsrep-on=ON --wsrep-provider="$(galera_provider)" --wsrep-cluster-address="$(cluster_address)" --wsrep-recover \
    --binlog-format=ROW --innodb-autoinc-lock-mode=2 --log-error="$out" >/dev/null 2>&1 || true
  sed -n 's/.*WSREP: Recovered position: *\([0-9a-f-]*:-\{0,1\}[0-9]*\).*/\1/p' "$out" | tail -1
}

# With wsrep on, MariaDB treats triggers as if written to a binary log; the
# migrations' owner (not SUPER) may create the ledger's guard triggers because
# log_bin_trust_function_creators is on. Triggers fire on the node that takes
# the write; the others apply its row changes.
#
# wsrep_sync_wait=3: a transaction's first read (and every UPDATE or DELETE)
# waits until the node has applied all that the cluster committed before it.
# Without it a client that wrote through one node and writes again through
# another can be told its own settings version is stale.
#
# Starts node N; `bootstrap` makes it the first node of a new primary component.
node_start() {
  local n="$1" mode="${2:-join}" datadir user host position extra=()
  datadir="$(node_datadir "$n")"
  user="$(galera_server_user)"
  host="$(node_host "$n")"
  mkdir -p "$datadir" "$CLUSTER_DIR"
  chmod 0700 "$CLUSTER_DATA" "$datadir"
  [ "$user" = "$(id -un)" ] || chown "$user:" "$CLUSTER_DATA" "$datadir" "$CLUSTER_DIR"
  if [ ! -d "$datadir/mysql" ]; then
    mariadb-install-db --no-defaults --user="$user" --datadir="$datadir" \
      --auth-root-authentication-method=socket --auth-root-socket-user="$GALERA_ADMIN" --skip-test-db --skip-name-resolve \
      >"$CLUSTER_DIR/node$n.init.log" 2>&1
  fi
  if [ "$mode" = bootstrap ]; then
    extra+=(--wsrep-new-cluster)
    # A cluster stopped uncleanly marks no node safe; node 1 is chosen (dev cluster).
    [ -f "$datadir/grastate.dat" ] && sed -i 's/^safe_to_bootstrap: 0/safe_to_bootstrap: 1/' "$datadir/grastate.dat"
  fi
  position="$(recovered_position "$n")"
  [ -n "$position" ] && extra+=(--wsrep-start-position="$position")
  rm -f "$(node_socket "$n")"
  in_node "$n" nohup "$(command -v mariadbd || echo /usr/sbin/mariadbd)" --no-defaults --user="$user" \
    --datadir="$datadir" --socket="$(node_socket "$n")" --port="$(node_sql_port "$n")" \
    --bind-address="$host" --pid-file="$(node_pid_file "$n")" --log-error="$(node_log "$n")" \
    --skip-name-resolve --default-time-zone=+00:00 --local-infile=0 \
    --secure-file-priv="$datadir" \
    --character-set-server=utf8mb4 --collation-server=utf8mb4_unicode_ci \
    --max-connections=300 --innodb-buffer-pool-size=128M --innodb-log-file-size=64M \
    --binlog-format=ROW --default-storage-engine=InnoDB --innodb-autoinc-lock-mode=2 \
    --wsrep-on=ON --wsrep-provider="$(galera_provider)" \
    --wsrep-cluster-name="$CLUSTER_NAME" --wsrep-cluster-address="$(cluster_address)" \
    --wsrep-node-name="node$n" --wsrep-node-address="$host:$(node_gcomm_port "$n")" \
    --wsrep-provider-options="gmcast.listen_addr=tcp://$host:$(node_gcomm_port "$n");ist.recv_addr=$host:$(($(node_gcomm_port "$n") + 1));gcache.size=256M;evs.suspect_timeout=PT3S;evs.inactive_timeout=PT6S;evs.install_timeout=PT6S" \
    --wsrep-sst-method=rsync --wsrep-sst-receive-address="$host:$(($(node_gcomm_port "$n") + 2))" \
    --wsrep-slave-threads=2 --log-bin-trust-function-creators=ON --wsrep-sync-wait=3 "${extra[@]}" >/dev/null 2>&1 &
}

# Waits until node N is Synced; prints the seconds it took.
node_wait_synced() {
  local n="$1" limit="${2:-180}" start=$SECONDS
  while [ $((SECONDS - start)) -lt "$limit" ]; do
    if node_alive "$n" && node_synced "$n"; then echo $((SECONDS - start)); return 0; fi
    sleep 0.5
  done
  galera_log "node $n did not reach Synced in ${limit}s; last lines of $(node_log "$n"):"
  tail -15 "$(node_log "$n")" >&2 || true
  return 1
}

node_stop() {
  local n="$1"
  node_alive "$n" || return 0
  mariadb-admin --no-defaults --socket="$(node_socket "$n")" -u"$GALERA_ADMIN" shutdown 2>/dev/null || true
  for _ in $(seq 1 150); do node_alive "$n" || return 0; sleep 0.2; done
}

node_kill() { kill -9 "$(cat "$(node_pid_file "$1")")" 2>/dev/null || true; }

# Accounts and the database, made once on node 1 and replicated to the others
# (account statements replicate by total order isolation). The health-check
# account may only connect and read status.
cluster_provision() {
  local name="$1" owner app owner_pw app_pw
  : "${DATABASE_OWNER_PASSWORD:?no owner password}"
  : "${DATABASE_PASSWORD:?no app password}"
  : "${CLUSTER_CHECK_PASSWORD:?no check password}"
  q() { local s="${1//\\/\\\\}"; printf "'%s'" "${s//\'/\'\'}"; }
  owner="$(q "${DATABASE_OWNER_USER:-tidemark_owner}")"
  app="$(q "${DATABASE_USER:-tidemark_app}")"
  owner_pw="$(q "$DATABASE_OWNER_PASSWORD")"
  app_pw="$(q "$DATABASE_PASSWORD")"
  node_sql 1 <<SQL
CREATE DATABASE IF NOT EXISTS \`$name\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;
CREATE USER IF NOT EXISTS $owner@'%' IDENTIFIED BY $owner_pw;
CREATE USER IF NOT EXISTS $app@'%' IDENTIFIED BY $app_pw;
CREATE USER IF NOT EXISTS 'tidemark_check'@'%' IDENTIFIED BY $(q "$CLUSTER_CHECK_PASSWORD");
ALTER USER $owner@'%' IDENTIFIED BY $owner_pw;
ALTER USER $app@'%' IDENTIFIED BY $app_pw;
ALTER USER 'tidemark_check'@'%' IDENTIFIED BY $(q "$CLUSTER_CHECK_PASSWORD");
GRANT ALL PRIVILEGES ON \`tidemark%\`.* TO $owner@'%';
GRANT SELECT, INSERT, UPDATE, DELETE, EXECUTE ON \`tidemark%\`.* TO $app@'%';
SQL
}

# Starts the whole cluster: node 1 bootstraps, the others join one at a time.
galera_up() {
  ensure_galera_installed
  netns_up
  local n
  if node_alive 1; then galera_log "node 1 already running"; else
    galera_log "bootstrapping node 1 on $(node_host 1):$(node_sql_port 1)"
    node_start 1 bootstrap
    node_wait_synced 1 >/dev/null || return 1
  fi
  for n in $(seq 2 "$CLUSTER_NODES"); do
    node_alive "$n" && continue
    galera_log "node $n joins on $(node_host "$n"):$(node_sql_port "$n")"
    node_start "$n" join
    node_wait_synced "$n" >/dev/null || return 1
  done
  galera_log "cluster size $(node_sql 1 -N -e "SHOW GLOBAL STATUS LIKE 'wsrep_cluster_size'" | cut -f2), all nodes Synced"
}

# Stops the joiners first, so node 1 stops last and may bootstrap next time.
galera_down() {
  local n
  for n in $(seq "$CLUSTER_NODES" -1 1); do node_stop "$n"; done
  netns_down
}
