#!/usr/bin/env bash
# `npm run demo`: install what is missing, start the private database, migrate,
# seed the invented demo hospital, build, start the local mail inbox and serve
# on http://localhost:3000.
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/prepare.sh"

PORT="${PORT:-3000}"
MAIL_INBOX_PORT="${MAIL_INBOX_PORT:-2580}"
MAIL_INBOX_URL="http://127.0.0.1:$MAIL_INBOX_PORT"
export TIDEMARK_DEMO=1
export NEXTAUTH_URL="${NEXTAUTH_URL:-http://localhost:$PORT}"

prepare || { echo "Preparation failed; see the messages above." >&2; exit 1; }

say "Migrating and seeding the demo database"
knex_cli migrate:latest
knex_cli seed:run
# The seeded shifts age; bring assignments and charge duties forward to the current and next shift.
npx tsx db/scripts/roll-assignments.ts
# A database from before the rollups existed gets them once from its raw rows.
npx tsx db/scripts/rebuild-rollups.ts --if-empty

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

mkdir -p .run
# The local SMTP fake catches every e-mail the demo sends (SMTP_* unset means
# 127.0.0.1:2525). Like the server, a leftover from an earlier run is replaced;
# the tsx binary itself (not npx), so the PID we stop forwards the signal to it.
if [ -f .run/mail-inbox.pid ] && kill -0 "$(cat .run/mail-inbox.pid)" 2>/dev/null; then
  kill "$(cat .run/mail-inbox.pid)" && sleep 1
fi
node_modules/.bin/tsx db/scripts/mail-inbox.ts > .run/mail-inbox.log &
echo $! > .run/mail-inbox.pid
stop_mail_inbox() { kill "$(cat .run/mail-inbox.pid)" 2>/dev/null || true; rm -f .run/mail-inbox.pid; }
trap stop_mail_inbox EXIT
trap 'exit 130' INT
trap 'exit 143' TERM
for _ in $(seq 1 50); do
  curl -sf -o /dev/null "$MAIL_INBOX_URL/api/messages" && break
  kill -0 "$(cat .run/mail-inbox.pid)" 2>/dev/null || break # exited: reused an earlier inbox, or failed
  sleep 0.2
done
if ! curl -sf -o /dev/null "$MAIL_INBOX_URL/api/messages"; then
  echo "The mail inbox did not start; see the message above or .run/mail-inbox.log" >&2
  exit 1
fi

# The alert worker: escalations, overdue reassessments and outbox delivery.
if [ -f .run/alert-worker.pid ] && kill -0 "$(cat .run/alert-worker.pid)" 2>/dev/null; then
  kill "$(cat .run/alert-worker.pid)" && sleep 1
fi
node_modules/.bin/tsx db/scripts/alert-worker.ts > .run/alert-worker.log 2>&1 &
echo $! > .run/alert-worker.pid
stop_background() {
  kill "$(cat .run/alert-worker.pid)" 2>/dev/null || true; rm -f .run/alert-worker.pid
  stop_mail_inbox
}
trap stop_background EXIT

npx tsx db/scripts/print-sign-ins.ts "$NEXTAUTH_URL" "$MAIL_INBOX_URL"
echo "Alert worker log: .run/alert-worker.log"
echo "Stop the server with Ctrl-C; stop the database with: npm run db:stop"
node_modules/.bin/next start -H 127.0.0.1 -p "$PORT" &
echo $! > .run/next.pid
wait $!
