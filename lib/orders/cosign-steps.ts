import { noticeHtml } from "../alerts/email";

// When a verbal or telephone order waiting for co-signature is reminded and
// escalated. Pure. The prescriber is reminded every `remindMs` after the order
// was entered; at `escalateMs` it goes to the unit's designated co-signers.
// Many hospitals require the prescriber's authentication of a verbal order
// within 24–48 h (common practice; local policy decides, hence the settings).

export type CosignConfig = { remindMs: number; escalateMs: number };

export type CosignStep = {
  /** "remind-1", "remind-2", … or "escalate": one notice per order and step. */
  step: string;
  kind: "remind" | "escalate";
  /** When the step fell due. */
  dueAt: Date;
};

/**
 * The step due for an order entered at `createdAt`, at `now`: the latest one
 * only — a worker that was down for three intervals sends one reminder, not
 * three. Null before the first interval has passed.
 */
export function cosignStepDue(createdAt: Date, now: Date, cfg: CosignConfig): CosignStep | null {
  const age = now.getTime() - createdAt.getTime();
  if (age >= cfg.escalateMs) {
    return {
      step: "escalate",
      kind: "escalate",
      dueAt: new Date(createdAt.getTime() + cfg.escalateMs),
    };
  }
  const n = Math.floor(age / cfg.remindMs);
  if (n < 1) return null;
  return {
    step: `remind-${n}`,
    kind: "remind",
    dueAt: new Date(createdAt.getTime() + n * cfg.remindMs),
  };
}

export type CosignEmailInput = {
  kind: "remind" | "escalate";
  orderId: number;
  entryMode: "verbal" | "telephone";
  enteredBy: string;
  prescriber: string;
  unitCode: string;
  unitName: string;
  bedLabel: string;
  enteredAt: string;
  waiting: string;
  /** Escalation only: why this person is told. */
  basis?: "designated" | "fallback";
  baseUrl: string;
};

/** The reminder or escalation e-mail: unit, bed, who and how long — never the patient's name. */
export function composeCosignEmail(input: CosignEmailInput): {
  subject: string;
  text: string;
  html: string;
} {
  const where = `${input.unitCode} bed ${input.bedLabel}`;
  const reminder = input.kind === "remind";
  const subject = reminder
    ? `Co-sign reminder: ${input.entryMode} order #${input.orderId} waiting ${input.waiting} — ${where}`
    : `Co-sign overdue: ${input.entryMode} order #${input.orderId} waiting ${input.waiting} — ${where}`;
  const title = reminder
    ? `Your ${input.entryMode} order #${input.orderId} still waits for your co-signature.`
    : `${input.prescriber}'s ${input.entryMode} order #${input.orderId} has waited ${input.waiting} for a co-signature.`;
  const link = `${input.baseUrl.replace(/\/$/, "")}/orders/${input.orderId}`;
  const facts = [
    `Where: ${input.unitName} (${input.unitCode}), bed ${input.bedLabel}`,
    `Entered: ${input.enteredAt} by ${input.enteredBy}, ${input.entryMode}, from ${input.prescriber}`,
    `Waiting: ${input.waiting}`,
  ];
  const note = reminder
    ? "Open the order, check it is what you meant, and co-sign it."
    : input.basis === "fallback"
      ? "This unit designates no co-signer, so its fallback address is told. A designated physician should review the order."
      : "You are a co-signer this unit designates: review the order and co-sign it, or reach the prescriber.";
  return {
    subject: subject.slice(0, 200),
    text: [title, ...facts, note, "", `Open the order: ${link}`].join("\n"),
    html: noticeHtml({ title, facts, note, link, linkText: "Open the order in Tidemark" }),
  };
}

/** Stable per order, step and recipient (0: the unit's fallback address): a retry sends the same Message-ID. */
export function cosignMessageId(
  orderId: number,
  step: string,
  userId: number | null,
  domain: string,
): string {
  return `<order-${orderId}.cosign-${step}.${userId ?? 0}@${domain}>`;
}
