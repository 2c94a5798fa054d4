#!/usr/bin/env bash
# `npm run test:cluster`: a fresh cluster on directories and ports of its own
# (db/scripts/cluster.sh), the fault-injection tests against it
# (tests/cluster/faults.ts), then everything stopped and removed. Ends with
# "N passed, N failed" and how long each part took.
set -uo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/../../db/scripts/prepare.sh"

export DATABASE_NAME=tidemark_test_cluster
export TIDEMARK_DEMO=1
export PORT="${CLUSTER_TEST_PORT:-3300}"
export CLUSTER_DB_PORT="${CLUSTER_TEST_DB_PORT:-3420}"
export CLUSTER_APP_PORT_BASE="${CLUSTER_TEST_APP_PORT_BASE:-3310}"
export SMTP_PORT="${CLUSTER_TEST_SMTP_PORT:-2625}"
export CLUSTER_EXTERNAL_SMTP=1
# A killed worker's claimed e-mail is taken over after 15 s instead of 2 min.
export OUTBOX_CLAIM_SECONDS=15
export TIDEMARK_CLUSTER_DIR="$ROOT/.run/cluster-test"
export TIDEMARK_CLUSTER_DATA="$ROOT/.data/cluster-test"
export NEXTAUTH_URL="http://localhost:$PORT"
export E2E_BASE_URL="http://localhost:$PORT"
# The tests' own database connection goes through the load balancer, like the app's.
export DATABASE_HOST=127.0.0.1
export DATABASE_PORT="$CLUSTER_DB_PORT"
export LEDGER_ANCHOR_PATH="$TIDEMARK_CLUSTER_DIR/ledger-anchor.json"

# A real partition needs network namespaces (root); otherwise the cut-off node is paused.
if [ "$(id -u)" -eq 0 ] && ip netns add tmprobe 2>/dev/null; then
  ip netns del tmprobe
  export TIDEMARK_CLUSTER_NETNS=1
else
  export TIDEMARK_CLUSTER_NETNS=0
fi

TIMINGS=()
timed() {
  local name="$1" start=$SECONDS; shift
  "$@"; local rc=$?
  TIMINGS+=("$(printf '%-26s %5d s' "$name" $((SECONDS - start)))")
  return $rc
}

teardown() {
  bash db/scripts/cluster.sh down >/dev/null 2>&1
  rm -rf "$TIDEMARK_CLUSTER_DATA"
}
trap teardown EXIT

START=$SECONDS
teardown
say "Starting the cluster for the fault tests (partition by $([ "$TIDEMARK_CLUSTER_NETNS" = 1 ] && echo 'network namespaces' || echo SIGSTOP))"
if ! timed "cluster start" bash db/scripts/cluster.sh up; then
  echo "the cluster did not start"
  echo "0 passed, 1 failed"
  exit 1
fi
timed "fault tests" npx tsx tests/cluster/faults.ts
RC=$?
timed "cluster stop" teardown
say "Time per part (cluster)"
printf '%s\n' "${TIMINGS[@]}"
printf '%-26s %5d s\n' "total" $((SECONDS - START))
exit $RC
