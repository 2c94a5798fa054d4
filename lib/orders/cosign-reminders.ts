import type { Knex } from "knex";
import { when } from "../alerts/email";
import { queueUserMail } from "../alerts/outbox";
import { getEnv } from "../env";
import { appendLedger, lockPatientChain, SYSTEM_ACTOR } from "../ledger/service";
import { transact } from "../transaction";
import { unitCosigners } from "./cosigners";
import { waitingWords } from "./waiting";
import {
  composeCosignEmail,
  cosignMessageId,
  cosignStepDue,
  type CosignConfig,
  type CosignStep,
} from "./cosign-steps";

/** The co-sign settings from the environment (README "Configuration"). */
export function cosignConfig(): CosignConfig {
  const env = getEnv();
  return {
    remindMs: env.COSIGN_REMIND_MINUTES * 60_000,
    escalateMs: env.COSIGN_ESCALATE_HOURS * 3_600_000,
  };
}

type Waiting = {
  id: number;
  patient_id: number;
  unit_id: number;
  entry_mode: "verbal" | "telephone";
  created_at: Date;
  prescriber_id: number;
  prescriber_name: string;
  prescriber_email: string;
  prescriber_active: number;
  entered_by_name: string;
  bed_label: string;
  unit_code: string;
  unit_name: string;
  time_zone: string;
  fallback_email: string | null;
};

/**
 * The worker's co-sign sweep: every verbal or telephone order still awaiting
 * co-signature whose next step is due gets it — a reminder to its prescriber,
 * or after the deadline the escalation to the unit's designated co-signers
 * (the unit's fallback address when it designates none). Each step is a row
 * of `order_cosign_notices` (primary key: order and step), its e-mails and its
 * ledger row, in one transaction; the row is the claim, so a step runs once
 * even with two workers on two servers. Returns the steps this call took.
 */
export async function remindCosigns(
  knex: Knex,
  now: Date,
  cfg: CosignConfig = cosignConfig(),
  /** The units to sweep (tests and scripts); every unit by default. */
  opts: { unitIds?: readonly number[] } = {},
): Promise<{ reminded: number; escalated: number }> {
  // Through the (unit_id, status) index: the units are few, orders many.
  const unitIds = opts.unitIds ?? ((await knex("units").pluck("id")) as number[]);
  if (!unitIds.length) return { reminded: 0, escalated: 0 };
  const waiting = (await knex("orders as o")
    .join("admissions as a", "a.id", "o.admission_id")
    .join("beds as b", "b.id", "a.bed_id")
    .join("units as un", "un.id", "o.unit_id")
    .join("users as p", "p.id", "o.prescriber_id")
    .join("users as e", "e.id", "o.entered_by")
    .whereIn("o.unit_id", unitIds)
    .where("o.status", "awaiting_cosign")
    .where("o.created_at", "<=", new Date(now.getTime() - Math.min(cfg.remindMs, cfg.escalateMs)))
    .orderBy("o.created_at")
    .select(
      "o.id",
      "o.patient_id",
      "o.unit_id",
      "o.entry_mode",
      "o.created_at",
      "o.prescriber_id",
      "p.name as prescriber_name",
      "p.email as prescriber_email",
      "p.active as prescriber_active",
      "e.name as entered_by_name",
      "b.label as bed_label",
      "un.code as unit_code",
      "un.name as unit_name",
      "un.time_zone",
      "un.fallback_email",
    )) as Waiting[];
  if (!waiting.length) return { reminded: 0, escalated: 0 };
  const taken = (await knex("order_cosign_notices")
    .whereIn(
      "order_id",
      waiting.map((o) => o.id),
    )
    .select("order_id", "step")) as { order_id: number; step: string }[];
  const done = new Set(taken.map((t) => `${t.order_id}:${t.step}`));
  const escalatedOrders = new Set(
    taken.filter((t) => t.step === "escalate").map((t) => t.order_id),
  );
  let reminded = 0;
  let escalated = 0;
  for (const order of waiting) {
    const step = cosignStepDue(new Date(order.created_at), now, cfg);
    if (!step || escalatedOrders.has(order.id) || done.has(`${order.id}:${step.step}`)) continue;
    if (await takeStep(knex, order, step, now)) {
      if (step.kind === "remind") reminded++;
      else escalated++;
    }
  }
  return { reminded, escalated };
}

type Recipient = {
  id: number | null;
  email: string;
  name: string;
  basis: "prescriber" | "designated" | "fallback";
};

async function recipientsOf(
  trx: Knex.Transaction,
  order: Waiting,
  kind: CosignStep["kind"],
): Promise<Recipient[]> {
  if (kind === "remind") {
    return order.prescriber_active
      ? [
          {
            id: order.prescriber_id,
            email: order.prescriber_email,
            name: order.prescriber_name,
            basis: "prescriber",
          },
        ]
      : [];
  }
  const designated = ((await unitCosigners(trx, [order.unit_id])).get(order.unit_id) ?? []).filter(
    (p) => p.id !== order.prescriber_id,
  );
  if (designated.length) {
    const emails = (await trx("users")
      .whereIn(
        "id",
        designated.map((p) => p.id),
      )
      .select("id", "email")) as { id: number; email: string }[];
    const byId = new Map(emails.map((r) => [r.id, r.email]));
    return designated.map((p) => ({
      id: p.id,
      email: byId.get(p.id)!,
      name: p.name,
      basis: "designated",
    }));
  }
  return order.fallback_email
    ? [
        {
          id: null,
          email: order.fallback_email,
          name: `${order.unit_code} fallback address`,
          basis: "fallback",
        },
      ]
    : [];
}

/** One step of one order, in one transaction; false when another worker took it first or the order was co-signed. */
async function takeStep(knex: Knex, order: Waiting, step: CosignStep, now: Date): Promise<boolean> {
  return transact(
    knex,
    async (trx) => {
      // The patient's chain first: the lock order every clinical write keeps.
      await lockPatientChain(trx, order.patient_id);
      const still = (await trx("orders")
        .where({ id: order.id, status: "awaiting_cosign" })
        .first("id")) as { id: number } | undefined;
      if (!still) return false;
      const [claim] = (await trx.raw(
        "INSERT IGNORE INTO order_cosign_notices (order_id, step, kind, unit_id, mailed, due_at, created_at) VALUES (?, ?, ?, ?, 0, ?, ?)",
        [order.id, step.step, step.kind, order.unit_id, step.dueAt, now],
      )) as [{ affectedRows: number }];
      if (!claim.affectedRows) return false;
      const recipients = await recipientsOf(trx, order, step.kind);
      const waiting = waitingWords(now.getTime() - new Date(order.created_at).getTime());
      const purpose = step.kind === "remind" ? "cosign_remind" : "cosign_escalate";
      const messageIds: string[] = [];
      for (const r of recipients) {
        messageIds.push(
          await queueUserMail(
            trx,
            purpose,
            // The outbox's recipient basis names alert roles; this step's basis is in its ledger row.
            { id: r.id, email: r.email, name: r.name },
            ({ baseUrl, domain }) => ({
              ...composeCosignEmail({
                kind: step.kind,
                orderId: order.id,
                entryMode: order.entry_mode,
                enteredBy: order.entered_by_name,
                prescriber: order.prescriber_name,
                unitCode: order.unit_code,
                unitName: order.unit_name,
                bedLabel: order.bed_label,
                enteredAt: when(new Date(order.created_at), order.time_zone),
                waiting,
                ...(r.basis === "prescriber" ? {} : { basis: r.basis }),
                baseUrl,
              }),
              messageId: cosignMessageId(order.id, step.step, r.id, domain),
            }),
            now,
          ),
        );
      }
      await trx("order_cosign_notices")
        .where({ order_id: order.id, step: step.step })
        .update({ mailed: recipients.length });
      await appendLedger(
        trx,
        SYSTEM_ACTOR,
        {
          action: step.kind === "remind" ? "order.cosign_remind" : "order.cosign_escalate",
          entityType: "order",
          entityId: order.id,
          patientId: order.patient_id,
          unitId: order.unit_id,
          after: {
            step: step.step,
            dueAt: step.dueAt.toISOString(),
            waitingMinutes: Math.floor(
              (now.getTime() - new Date(order.created_at).getTime()) / 60_000,
            ),
            told: recipients.map((r) => ({ userId: r.id, basis: r.basis })),
            messageIds,
            ...(recipients.length
              ? {}
              : {
                  nobody:
                    step.kind === "remind"
                      ? "The prescriber's account is deactivated."
                      : "The unit designates no other co-signer and has no fallback address.",
                }),
          },
        },
        now,
      );
      return true;
    },
    { label: "co-sign reminder" },
  );
}

export type CosignNotices = {
  reminders: number;
  lastRemindedAt: string | null;
  escalatedAt: string | null;
};

/** The reminders and escalation of each order asked about, for the co-sign queue. */
export async function cosignNotices(
  knex: Knex,
  orderIds: readonly number[],
): Promise<Map<number, CosignNotices>> {
  const out = new Map<number, CosignNotices>();
  if (!orderIds.length) return out;
  const rows = (await knex("order_cosign_notices")
    .whereIn("order_id", orderIds)
    .orderBy("created_at")
    .select("order_id", "kind", "created_at")) as {
    order_id: number;
    kind: "remind" | "escalate";
    created_at: Date;
  }[];
  for (const r of rows) {
    const n = out.get(r.order_id) ?? { reminders: 0, lastRemindedAt: null, escalatedAt: null };
    const at = new Date(r.created_at).toISOString();
    if (r.kind === "remind") {
      n.reminders++;
      n.lastRemindedAt = at;
    } else n.escalatedAt = at;
    out.set(r.order_id, n);
  }
  return out;
}
