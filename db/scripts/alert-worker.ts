/**
 * `npm run worker`: the alert worker — escalations, overdue reassessments and
 * outbox delivery every few seconds. `npm run demo` starts it beside the app;
 * production runs one (or more: rows are claimed before sending) per site.
 */
import "../../lib/local-env";
import { startAlertWorker } from "../../lib/alerts/worker";
import { db } from "../../lib/db";
import { getEnv } from "../../lib/env";
import { mailTransport } from "../../lib/mail/transport";

const env = getEnv();
const worker = startAlertWorker(db(), mailTransport(), { intervalMs: 5000 });
console.log(`[alerts] worker running; mail via ${env.SMTP_HOST}:${env.SMTP_PORT}`);

async function shutdown() {
  await worker.stop();
  await db().destroy();
  process.exit(0);
}
process.on("SIGINT", () => void shutdown());
process.on("SIGTERM", () => void shutdown());
