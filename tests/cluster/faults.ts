/**
 * `npm run test:cluster` (tests/cluster/run.sh starts the cluster, then this):
 * faults injected into a running 3-node Galera cluster with 3 app servers and
 * 2 alert workers behind HAProxy, and what must hold afterwards.
 *
 * 1. 8 writers for 60 s; one Galera node killed (-9) and restarted, one app
 *    server killed: every acknowledged write on all three nodes, no write
 *    twice, the ledger verifies on every node, the nodes agree row for row.
 * 2. An alert storm with one worker killed and SMTP down for 30 s: every
 *    e-mail delivered exactly once (counted by Message-ID).
 * 3. One node cut off from the others: it stops taking writes, the others
 *    carry on, and it catches up when it returns.
 *
 * Ends with one line: "N passed, N failed".
 */
import "../../lib/local-env";
import { closeDb } from "../../lib/db";
import { startFakeInbox, type FakeInbox, type InboxMessage } from "../../lib/mail/fake-inbox";
import { storm } from "./storm";
import { partition } from "./partition";
import { loadWithFaults } from "./writes";
import type { Outcome } from "./outcome";

const SMTP_PORT = Number(process.env.SMTP_PORT ?? 2625);

/** The SMTP fake the workers send to; stopped and started again by the storm. */
export class Mailbox {
  private inbox: FakeInbox | null = null;
  private earlier: InboxMessage[] = [];

  async start(): Promise<void> {
    this.inbox = await startFakeInbox({ smtpPort: SMTP_PORT, httpPort: null });
  }

  async stop(): Promise<void> {
    if (!this.inbox) return;
    this.earlier.push(...this.inbox.messages());
    await this.inbox.stop();
    this.inbox = null;
  }

  /** Every message received by every instance so far. */
  all(): InboxMessage[] {
    return [...this.earlier, ...(this.inbox?.messages() ?? [])];
  }
}

async function main(): Promise<void> {
  const started = Date.now();
  const mailbox = new Mailbox();
  await mailbox.start();
  const outcomes: Outcome[] = [];
  const part = async (name: string, run: () => Promise<Outcome[]>) => {
    const t0 = Date.now();
    console.log(`\n== ${name}`);
    try {
      outcomes.push(...(await run()));
    } catch (error) {
      outcomes.push({ name, ok: false, detail: String((error as Error).stack ?? error) });
    }
    console.log(`   (${Math.round((Date.now() - t0) / 1000)} s)`);
  };
  await part("writes under a killed database node and a killed app server", () => loadWithFaults());
  await part("alert storm, a killed worker, SMTP down for 30 s", () => storm(mailbox));
  await part("one node cut off from the others", () => partition());

  console.log("\nResults:");
  for (const o of outcomes)
    console.log(`  ${o.ok ? "✓" : "✗"} ${o.name}${o.detail ? ` — ${o.detail}` : ""}`);
  const passed = outcomes.filter((o) => o.ok).length;
  console.log(`\nCluster tests took ${Math.round((Date.now() - started) / 1000)} s`);
  console.log(`${passed} passed, ${outcomes.length - passed} failed`);
  await mailbox.stop();
  await closeDb();
  process.exit(passed === outcomes.length && outcomes.length > 0 ? 0 : 1);
}

void main();
