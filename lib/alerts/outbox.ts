import type { Knex } from "knex";
import { getEnv } from "../env";
import { appendLedger, lockPatientChain, SYSTEM_ACTOR } from "../ledger/service";
import { alertMessageId, composeAlertEmail, retryDelayMs } from "./email";
import type { AlertKind } from "./kinds";
import { recipientsFor, type RecipientBasis } from "./recipients";

import { isRetryable, transact } from "../transaction";

/**
 * Who was told at one level and why, as the alert keeps it for the screens;
 * `duty` names the level a recipient was chosen for when an alert tells two at once.
 */
export type Told = { name: string; basis: RecipientBasis; duty?: string }[];

type AlertMailContext = {
  id: number;
  kind: AlertKind;
  grade: "routine" | "urgent";
  bed_id: number;
  unit_id: number;
  order_id: number | null;
  started_at: Date;
  band_lower_pct: number | null;
  band_upper_pct: number | null;
  worst_spo2_pct: string | null;
  trigger_spo2_pct: string | null;
  detail_json: string;
  unit_code: string;
  unit_name: string;
  time_zone: string;
  bed_label: string;
};

function mailDomain(from: string): string {
  return /@([A-Za-z0-9.-]+)/.exec(from)?.[1] ?? "tidemark.invalid";
}

/**
 * Writes the e-mails for one alert step into the outbox, inside the caller's
 * transaction. One row per alert, purpose and recipient — a repeated step
 * never queues the same mail twice. Users who turned e-mail off for this kind
 * still see the alert in the app.
 */
export async function queueAlertMail(
  trx: Knex.Transaction,
  alertId: number,
  level: number,
  purpose: string,
  now: Date,
  opts: { exclude?: number | null } = {},
): Promise<{
  recipients: (number | null)[];
  told: Told;
  mailed: (number | null)[];
  optedOut: number[];
  excluded: number[];
}> {
  const a = (await trx("alerts as a")
    .join("units as u", "u.id", "a.unit_id")
    .join("beds as b", "b.id", "a.bed_id")
    .where("a.id", alertId)
    .first(
      "a.id",
      "a.kind",
      "a.grade",
      "a.bed_id",
      "a.unit_id",
      "a.order_id",
      "a.started_at",
      "a.band_lower_pct",
      "a.band_upper_pct",
      "a.worst_spo2_pct",
      "a.trigger_spo2_pct",
      "a.detail_json",
      "u.code as unit_code",
      "u.name as unit_name",
      "u.time_zone",
      "b.label as bed_label",
    )) as AlertMailContext;
  const recipients = await recipientsFor(
    trx,
    { bedId: a.bed_id, unitId: a.unit_id, orderId: a.order_id },
    level,
    now,
  );
  if (!recipients.length)
    return { recipients: [], told: [], mailed: [], optedOut: [], excluded: [] };
  const optedOut = (await trx("alert_email_preferences")
    .whereIn(
      "user_id",
      recipients.flatMap((r) => (r.id === null ? [] : [r.id])),
    )
    .where({ kind: a.kind, email: false })
    .pluck("user_id")) as number[];
  const env = getEnv();
  const detail = JSON.parse(a.detail_json) as {
    limitsAtMax?: string[];
    overdueMinutes?: number;
    lastSampleAt?: string;
    excursion?: { phase: "pending" | "open"; direction: "below" | "above" };
    pao2?: number;
    pao2Band?: { lower: number; upper: number };
    breaches?: string[];
  };
  const spo2 = a.worst_spo2_pct ?? a.trigger_spo2_pct;
  const mail = composeAlertEmail({
    alertId: a.id,
    kind: a.kind,
    grade: a.grade,
    purpose: purpose.startsWith("escalate")
      ? "escalate"
      : purpose === "urgent"
        ? "urgent"
        : "notify",
    escalationLevel: level,
    unitCode: a.unit_code,
    unitName: a.unit_name,
    bedLabel: a.bed_label,
    timeZone: a.time_zone,
    startedAt: new Date(a.started_at),
    band:
      a.band_lower_pct !== null && a.band_upper_pct !== null
        ? { lower: a.band_lower_pct, upper: a.band_upper_pct }
        : null,
    spo2: spo2 === null ? null : Number(spo2),
    limitsAtMax: detail.limitsAtMax,
    overdueMinutes: detail.overdueMinutes,
    ...(detail.lastSampleAt ? { lastSampleAt: new Date(detail.lastSampleAt) } : {}),
    ...(detail.excursion ? { excursion: detail.excursion } : {}),
    ...(detail.pao2 !== undefined ? { pao2: detail.pao2 } : {}),
    ...(detail.pao2Band ? { pao2Band: detail.pao2Band } : {}),
    ...(detail.breaches ? { breaches: detail.breaches } : {}),
    baseUrl: env.NEXTAUTH_URL,
  });
  // Whoever charted the value that raised the alert is at the bedside: no e-mail for them.
  const excluded = recipients.flatMap((r) =>
    r.id !== null && r.id === opts.exclude ? [r.id] : [],
  );
  const mailed = recipients.filter(
    (r) => r.id === null || (!optedOut.includes(r.id) && !excluded.includes(r.id)),
  );
  if (mailed.length) {
    await trx("mail_outbox")
      .insert(
        mailed.map((r) => ({
          alert_id: a.id,
          purpose,
          recipient_user_id: r.id,
          recipient_basis: r.basis,
          to_address: r.email,
          subject: mail.subject,
          text_body: mail.text,
          html_body: mail.html,
          // The fallback address has no user: 0 stands for it in the Message-ID.
          message_id: alertMessageId(a.id, purpose, r.id ?? 0, mailDomain(env.SMTP_FROM)),
          state: "pending",
          next_attempt_at: now,
          created_at: now,
        })),
      )
      .onConflict()
      .ignore();
  }
  return {
    recipients: recipients.map((r) => r.id),
    told: recipients.map((r) => ({ name: r.name, basis: r.basis })),
    mailed: mailed.map((r) => r.id),
    optedOut,
    excluded,
  };
}

/**
 * Writes one e-mail that belongs to no alert (`alert_id` null, e.g. an order
 * notice or an order request) into the outbox, inside the caller's
 * transaction; the worker delivers it like alert mail. The Message-ID is
 * unique, so a repeated step queues it once. Returns the Message-ID.
 */
export async function queueUserMail(
  trx: Knex.Transaction,
  purpose: string,
  /** `id` null: an address with no user behind it (a unit's fallback address). */
  recipient: { id: number | null; email: string; name: string; basis?: RecipientBasis },
  compose: (env: { baseUrl: string; domain: string }) => {
    subject: string;
    text: string;
    html: string;
    messageId: string;
  },
  now: Date,
  orderRequestId: number | null = null,
): Promise<string> {
  const env = getEnv();
  const mail = compose({ baseUrl: env.NEXTAUTH_URL, domain: mailDomain(env.SMTP_FROM) });
  await trx("mail_outbox")
    .insert({
      alert_id: null,
      order_request_id: orderRequestId,
      purpose,
      recipient_user_id: recipient.id,
      recipient_basis: recipient.basis ?? null,
      to_address: recipient.email,
      subject: mail.subject,
      text_body: mail.text,
      html_body: mail.html,
      message_id: mail.messageId,
      state: "pending",
      next_attempt_at: now,
      created_at: now,
    })
    .onConflict()
    .ignore();
  return mail.messageId;
}

/**
 * Cancels an alert's e-mail that has not left yet, with the reason — an
 * alert resolved or acknowledged before its e-mail was sent is not announced
 * as if it still waited for someone. `purposes` limits it (by prefix).
 * Returns the recipients whose e-mail was cancelled (null: the unit's fallback address).
 */
export async function cancelPendingMail(
  trx: Knex.Transaction,
  alertId: number,
  reason: string,
  now: Date,
  purposes?: readonly string[],
): Promise<(number | null)[]> {
  const pending = (await trx("mail_outbox")
    .where({ alert_id: alertId, state: "pending" })
    .forUpdate()
    .select("id", "purpose", "recipient_user_id")) as {
    id: number;
    purpose: string;
    recipient_user_id: number | null;
  }[];
  const chosen = purposes
    ? pending.filter((m) => purposes.some((p) => m.purpose.startsWith(p)))
    : pending;
  if (!chosen.length) return [];
  await trx("mail_outbox")
    .whereIn(
      "id",
      chosen.map((m) => m.id),
    )
    .update({ state: "cancelled", cancel_reason: reason.slice(0, 300), cancelled_at: now });
  return chosen.map((m) => m.recipient_user_id);
}

/** What the worker needs of a nodemailer transport. */
export type MailSender = {
  sendMail(message: {
    from: string;
    to: string;
    subject: string;
    text: string;
    html: string;
    messageId: string;
    headers?: Record<string, string>;
  }): Promise<{ response?: string }>;
};

type OutboxRow = {
  id: number;
  alert_id: number | null;
  order_request_id: number | null;
  purpose: string;
  recipient_user_id: number | null;
  to_address: string;
  subject: string;
  text_body: string;
  html_body: string;
  message_id: string;
  attempts: number;
};

/**
 * Delivers due outbox mail. Each row is claimed first (so two workers never
 * send one row at once), sent, and only then marked sent — with the alert's
 * "notified" step and its ledger row — in one transaction. A failed send is
 * retried later with backoff; nothing is dropped.
 */
export async function deliverOutbox(
  knex: Knex,
  sender: MailSender,
  now: Date = new Date(),
  opts: { limit?: number; from?: string; claimMs?: number } = {},
): Promise<{ sent: number; failed: number }> {
  const from = opts.from ?? getEnv().SMTP_FROM;
  const claimMs = opts.claimMs ?? getEnv().OUTBOX_CLAIM_SECONDS * 1000;
  const due = (await knex("mail_outbox")
    .where({ state: "pending" })
    .where("next_attempt_at", "<=", now)
    .where((q) => {
      void q.whereNull("claimed_until").orWhere("claimed_until", "<", now);
    })
    .orderBy("id")
    .limit(opts.limit ?? 50)
    .select(
      "id",
      "alert_id",
      "order_request_id",
      "purpose",
      "recipient_user_id",
      "to_address",
      "subject",
      "text_body",
      "html_body",
      "message_id",
      "attempts",
    )) as OutboxRow[];
  let sent = 0;
  let failed = 0;
  // A pass over many rows takes time: each claim runs from the moment it is made
  // (in the caller's clock), or a late row's claim would already have lapsed and
  // another worker could send it at the same time.
  const started = Date.now();
  const clock = () => new Date(now.getTime() + (Date.now() - started));
  for (const row of due) {
    // On a multi-primary cluster two workers can both see the row free on
    // their own nodes; the second commit then fails certification: not ours.
    const claimed = await knex("mail_outbox")
      .where({ id: row.id, state: "pending" })
      .where((q) => {
        void q.whereNull("claimed_until").orWhere("claimed_until", "<", now);
      })
      .update({ claimed_until: new Date(clock().getTime() + claimMs) })
      .catch((error: unknown) => {
        if (isRetryable(error)) return 0;
        throw error;
      });
    if (!claimed) continue;
    if (row.alert_id !== null) {
      // Resolved meanwhile (a row queued before resolving cancelled its mail, or a race): not sent.
      const alert = (await knex("alerts")
        .where({ id: row.alert_id })
        .first("state", "resolved_at")) as { state: string; resolved_at: Date | null } | undefined;
      if (alert?.state === "resolved") {
        await knex("mail_outbox")
          .where({ id: row.id, state: "pending" })
          .update({
            state: "cancelled",
            cancel_reason: `The alert was resolved at ${new Date(alert.resolved_at ?? now).toISOString()} before this e-mail left.`,
            cancelled_at: now,
            claimed_until: null,
          });
        continue;
      }
    }
    let response: string;
    try {
      const info = await sender.sendMail({
        from,
        to: row.to_address,
        subject: row.subject,
        text: row.text_body,
        html: row.html_body,
        messageId: row.message_id,
        headers: row.alert_id ? { "X-Tidemark-Alert": String(row.alert_id) } : {},
      });
      response = (info.response ?? "accepted").slice(0, 300);
    } catch (error) {
      failed++;
      const attempts = row.attempts + 1;
      await knex("mail_outbox")
        .where({ id: row.id })
        .update({
          attempts,
          next_attempt_at: new Date(now.getTime() + retryDelayMs(attempts)),
          last_error: error instanceof Error ? error.message.slice(0, 1000) : String(error),
          claimed_until: null,
        });
      continue;
    }
    await transact(knex, async (trx) => {
      // The patient's chain first, the lock order every clinical write keeps.
      const owner = (await (row.alert_id !== null
        ? trx("alerts").where({ id: row.alert_id }).first("patient_id")
        : row.order_request_id !== null
          ? trx("order_requests").where({ id: row.order_request_id }).first("patient_id")
          : undefined)) as { patient_id: number } | undefined;
      if (owner) await lockPatientChain(trx, owner.patient_id);
      await trx("mail_outbox")
        .where({ id: row.id })
        .update({
          state: "sent",
          sent_at: now,
          attempts: row.attempts + 1,
          relay_response: response,
          claimed_until: null,
        });
      if (row.order_request_id !== null) {
        await noteRequestMailSent(trx, row, now);
        return;
      }
      if (row.alert_id === null) return;
      const alert = (await trx("alerts")
        .where({ id: row.alert_id })
        .forUpdate()
        .first("id", "state", "patient_id", "unit_id", "version")) as {
        id: number;
        state: string;
        patient_id: number;
        unit_id: number;
        version: number;
      };
      const firstNotice = row.purpose === "notify" && alert.state === "opened";
      if (firstNotice)
        await trx("alerts")
          .where({ id: alert.id })
          .update({ state: "notified", notified_at: now, version: alert.version + 1 });
      await appendLedger(
        trx,
        SYSTEM_ACTOR,
        {
          action: "alert.notify",
          entityType: "alert",
          entityId: alert.id,
          patientId: alert.patient_id,
          unitId: alert.unit_id,
          before: firstNotice ? { state: "opened" } : undefined,
          after: {
            ...(firstNotice ? { state: "notified" } : {}),
            purpose: row.purpose,
            recipientUserId: row.recipient_user_id,
            messageId: row.message_id,
            attempts: row.attempts + 1,
          },
        },
        now,
      );
    });
    sent++;
  }
  return { sent, failed };
}

/** An order request's e-mail accepted by the relay: its "notified" step (the chain is locked). */
async function noteRequestMailSent(trx: Knex.Transaction, row: OutboxRow, now: Date) {
  const request = (await trx("order_requests")
    .where({ id: row.order_request_id })
    .first("id", "patient_id", "unit_id")) as { id: number; patient_id: number; unit_id: number };
  await appendLedger(
    trx,
    SYSTEM_ACTOR,
    {
      action: "order_request.notify",
      entityType: "order_request",
      entityId: request.id,
      patientId: request.patient_id,
      unitId: request.unit_id,
      after: {
        purpose: row.purpose,
        recipientUserId: row.recipient_user_id,
        messageId: row.message_id,
        attempts: row.attempts + 1,
      },
    },
    now,
  );
}
