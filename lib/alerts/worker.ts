import type { Knex } from "knex";
import { alertConfig, type AlertConfig } from "./config";
import { deliverOutbox, type MailSender } from "./outbox";
import { escalateDueAlerts, openOverdueReassessments, raiseSignalLosses } from "./sweeps";
import { cosignConfig, remindCosigns } from "../orders/cosign-reminders";
import type { CosignConfig } from "../orders/cosign-steps";
import { escalateOrderRequests } from "../order-requests/sweep";

export type WorkerPass = {
  escalated: number;
  overdueOpened: number;
  signalLosses: number;
  cosignReminded: number;
  cosignEscalated: number;
  requestsEscalated: number;
  sent: number;
  failed: number;
};

/**
 * One pass of the background work alerts need besides the writes that raise
 * them: escalate what nobody acknowledged, open overdue reassessments, raise
 * signal loss for monitors gone silent during an excursion, remind and
 * escalate verbal orders waiting for co-signature, escalate order requests
 * nobody answered, deliver the outbox. Time-driven, so the tests call it with
 * their own clock.
 */
export async function runAlertWork(
  knex: Knex,
  sender: MailSender,
  now: Date = new Date(),
  cfg: AlertConfig = alertConfig(),
  cosign: CosignConfig = cosignConfig(),
): Promise<WorkerPass> {
  const escalated = await escalateDueAlerts(knex, now, cfg);
  const overdueOpened = await openOverdueReassessments(knex, now, cfg);
  const signalLosses = await raiseSignalLosses(knex, now, cfg);
  const co = await remindCosigns(knex, now, cosign);
  const requestsEscalated = await escalateOrderRequests(knex, now);
  const { sent, failed } = await deliverOutbox(knex, sender, now);
  return {
    escalated,
    overdueOpened,
    signalLosses,
    cosignReminded: co.reminded,
    cosignEscalated: co.escalated,
    requestsEscalated,
    sent,
    failed,
  };
}

/**
 * Runs {@link runAlertWork} every `intervalMs` until stopped. A failing pass
 * (database restarting, say) is logged and retried on the next tick; passes
 * never overlap.
 */
export function startAlertWorker(
  knex: Knex,
  sender: MailSender,
  opts: { intervalMs?: number; log?: (line: string) => void } = {},
): { stop(): Promise<void> } {
  const intervalMs = opts.intervalMs ?? 5000;
  const log = opts.log ?? ((line: string) => console.log(line));
  let stopped = false;
  let timer: NodeJS.Timeout | undefined;
  let running: Promise<void> = Promise.resolve();
  const tick = () => {
    running = runAlertWork(knex, sender)
      .then((pass) => {
        if (
          pass.escalated ||
          pass.overdueOpened ||
          pass.signalLosses ||
          pass.cosignReminded ||
          pass.cosignEscalated ||
          pass.requestsEscalated ||
          pass.sent ||
          pass.failed
        )
          log(
            `[alerts] escalated ${pass.escalated}, overdue opened ${pass.overdueOpened}, signal lost ${pass.signalLosses}, co-sign reminded ${pass.cosignReminded} / escalated ${pass.cosignEscalated}, order requests escalated ${pass.requestsEscalated}, mail sent ${pass.sent}` +
              (pass.failed
                ? `, ${pass.failed} failed (kept in the outbox, retried with backoff)`
                : ""),
          );
      })
      .catch((error: unknown) =>
        log(`[alerts] pass failed: ${error instanceof Error ? error.message : String(error)}`),
      )
      .finally(() => {
        if (!stopped) timer = setTimeout(tick, intervalMs);
      });
  };
  tick();
  return {
    async stop() {
      stopped = true;
      if (timer) clearTimeout(timer);
      await running;
    },
  };
}
