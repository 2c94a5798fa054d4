/**
 * `npm run worker`: the alert worker — escalations, overdue reassessments and
 * outbox delivery every few seconds — and, beside it, the ledger anchor: the
 * chain heads signed into a file outside the database every
 * LEDGER_ANCHOR_MINUTES. `npm run demo` starts it beside the app; production
 * runs one (or more: rows are claimed before sending) per site.
 */
import "../../lib/local-env";
import { startAlertWorker } from "../../lib/alerts/worker";
import { db } from "../../lib/db";
import { getEnv } from "../../lib/env";
import { startLedgerAnchoring } from "../../lib/ledger/anchor";
import { ledgerAnchorPath } from "../../lib/ledger/keys";
import { mailTransport } from "../../lib/mail/transport";

const env = getEnv();
const worker = startAlertWorker(db(), mailTransport(), { intervalMs: 5000 });
const anchoring = startLedgerAnchoring(db(), { intervalMs: env.LEDGER_ANCHOR_MINUTES * 60_000 });
console.log(`[alerts] worker running; mail via ${env.SMTP_HOST}:${env.SMTP_PORT}`);
console.log(
  `[ledger] anchoring chain heads to ${ledgerAnchorPath()} every ${env.LEDGER_ANCHOR_MINUTES} min`,
);

async function shutdown() {
  await Promise.all([worker.stop(), anchoring.stop()]);
  await db().destroy();
  process.exit(0);
}
process.on("SIGINT", () => void shutdown());
process.on("SIGTERM", () => void shutdown());
