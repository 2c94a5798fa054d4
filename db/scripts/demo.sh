#!/usr/bin/env bash
# `npm run demo`: install what is missing, start the private database, migrate,
# seed the invented demo hospital, build and serve on http://localhost:3000.
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/prepare.sh"

PORT="${PORT:-3000}"
export TIDEMARK_DEMO=1
export NEXTAUTH_URL="${NEXTAUTH_URL:-http://localhost:$PORT}"

prepare || { echo "Preparation failed; see the messages above." >&2; exit 1; }

say "Migrating and seeding the demo database"
knex_cli migrate:latest
knex_cli seed:run

if build_is_stale; then
  say "Building the app"
  npx next build
fi

# A demo server left over from an earlier run is replaced, never doubled.
if [ -f .run/next.pid ] && kill -0 "$(cat .run/next.pid)" 2>/dev/null; then
  kill "$(cat .run/next.pid)" && sleep 1
fi
if (exec 3<>"/dev/tcp/127.0.0.1/$PORT") 2>/dev/null; then
  echo "Port $PORT is in use by another program; stop it or run: PORT=3001 npm run demo" >&2
  exit 1
fi

npx tsx db/scripts/print-sign-ins.ts "$NEXTAUTH_URL"
echo "Stop the server with Ctrl-C; stop the database with: npm run db:stop"
mkdir -p .run
node_modules/.bin/next start -H 127.0.0.1 -p "$PORT" &
echo $! > .run/next.pid
wait $!
