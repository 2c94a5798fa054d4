#!/usr/bin/env bash
# `npm test`: the same preparation as the demo, then type-check, lint, unit and
# component tests, integration tests against a throw-away database on the
# private MariaDB, and end-to-end tests in Debian's Chromium against a
# production build. Ends with one line: "N passed, N failed".
set -uo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/../db/scripts/prepare.sh"
set +e

PREPARE_START=$SECONDS
prepare --browser || { echo "preparation failed"; echo "0 passed, 1 failed"; exit 1; }

RESULTS="$ROOT/tests/artifacts/results"
rm -rf "$RESULTS" && mkdir -p "$RESULTS"
# How long each part took, printed before the result line.
TIMINGS="$RESULTS/timings.txt"
printf '%-22s %5d s\n' "preparation" $((SECONDS - PREPARE_START)) > "$TIMINGS"
timed() {
  local name="$1" start=$SECONDS; shift
  "$@"; local rc=$?
  printf '%-22s %5d s\n' "$name" $((SECONDS - start)) >> "$TIMINGS"
  return $rc
}
export TEST_DB="tidemark_test_$$"
export DATABASE_NAME="$TEST_DB"
export TIDEMARK_DEMO=1
export E2E_PORT="${E2E_PORT:-3100}"
export E2E_BASE_URL="http://localhost:$E2E_PORT"
SERVER_PID=""

cleanup() {
  if [ -n "$SERVER_PID" ]; then kill "$SERVER_PID" 2>/dev/null; wait "$SERVER_PID" 2>/dev/null; fi
  bash db/scripts/mariadb.sh drop-db "$TEST_DB" >/dev/null 2>&1
}
trap cleanup EXIT

# A step that is not a test runner counts as one check.
check() {
  local name="$1"; shift
  say "$name"
  if timed "$name" "$@"; then echo "{\"name\":\"$name\",\"ok\":true}" > "$RESULTS/check-$name.json"
  else echo "{\"name\":\"$name\",\"ok\":false}" > "$RESULTS/check-$name.json"; fi
}

vitest_project() {
  local name="$1"; shift
  say "vitest: $name"
  timed "vitest $name" npx vitest run --config tests/vitest.config.mts "$@" \
    --reporter=default --reporter=json --outputFile.json="$RESULTS/vitest-$name.json"
  [ -f "$RESULTS/vitest-$name.json" ] || echo "{\"name\":\"vitest-$name\",\"ok\":false}" > "$RESULTS/check-vitest-$name.json"
}

check database bash -c "bash db/scripts/mariadb.sh create-db $TEST_DB && npx tsx node_modules/knex/bin/cli.js --knexfile knexfile.ts migrate:latest && npx tsx node_modules/knex/bin/cli.js --knexfile knexfile.ts seed:run"
check typecheck npx tsc --noEmit
check lint npm run --silent lint
check format npx prettier --check --log-level warn .
vitest_project unit --project unit --project component
vitest_project integration --project integration

if build_is_stale; then check build npx next build; fi
if [ -f .next/BUILD_ID ]; then
  say "Starting the app for end-to-end tests on $E2E_BASE_URL"
  # The next binary itself (not npx), so the PID we stop is the server.
  NEXTAUTH_URL="$E2E_BASE_URL" node_modules/.bin/next start -H 127.0.0.1 -p "$E2E_PORT" > "$RESULTS/server.log" 2>&1 &
  SERVER_PID=$!
  for _ in $(seq 1 100); do curl -sf -o /dev/null "$E2E_BASE_URL/sign-in" && break; sleep 0.2; done
  vitest_project e2e --project e2e
else
  echo '{"name":"e2e","ok":false}' > "$RESULTS/check-e2e.json"
fi

say "Time per part"
cat "$TIMINGS"
printf '%-22s %5d s\n' "total" "$SECONDS"
node tests/summary.mjs "$RESULTS"
