import { noticeHtml, when } from "../alerts/email";
import type { RequestSnapshot } from "./snapshot";
import { snapshotWords } from "./snapshot";

// The e-mails of an order request. Pure. Like alert e-mail they carry unit,
// bed, what is asked and a link — never the patient's name or record number.

export const ORDER_REQUEST_PURPOSES = {
  ask: "order_request",
  escalate: "order_request_escalate",
  closed: "order_request_closed",
} as const;
export type OrderRequestPurpose = keyof typeof ORDER_REQUEST_PURPOSES;

export type OrderRequestEmailInput = {
  requestId: number;
  purpose: OrderRequestPurpose;
  requestedBy: string;
  need: string;
  reason: string;
  snapshot: RequestSnapshot;
  unitCode: string;
  unitName: string;
  bedLabel: string;
  timeZone: string;
  askedAt: Date;
  /** For "closed": how it was closed, in words. */
  closedWords?: string;
  /** Why this person receives it (assigned physician, prescriber, charge nurse…). */
  asWho: string;
  escalateMinutes?: number;
  baseUrl: string;
};

export function composeOrderRequestEmail(input: OrderRequestEmailInput): {
  subject: string;
  text: string;
  html: string;
} {
  const where = `${input.unitCode} bed ${input.bedLabel}`;
  const base = input.baseUrl.replace(/\/$/, "");
  const link = `${base}/order-requests?request=${input.requestId}`;
  const subject =
    input.purpose === "closed"
      ? `Your order request #${input.requestId} is closed — ${where}`
      : `${input.purpose === "escalate" ? "Unanswered: " : ""}New order requested — ${where}`;
  const title =
    input.purpose === "closed"
      ? `Order request #${input.requestId}: ${input.closedWords ?? "closed"}`
      : `${input.requestedBy} asks for a new order`;
  const note =
    input.purpose === "closed"
      ? "You asked for this order; it needs nothing more from you."
      : input.purpose === "escalate"
        ? `Nobody answered within ${input.escalateMinutes ?? "?"} min. You are receiving this as the ${input.asWho}.`
        : `You are receiving this as the ${input.asWho}. Write the order, or answer with a reason.`;
  const facts = [
    `Where: ${input.unitName} (${input.unitCode}), bed ${input.bedLabel}`,
    `Needed: ${input.need}`,
    `Why: ${input.reason}`,
    `Now: ${snapshotWords(input.snapshot)}`,
    `Asked: ${when(input.askedAt, input.timeZone)}`,
  ];
  const lines = [title, ...facts, note, "", `Open the request: ${link}`];
  const html = noticeHtml({
    title,
    facts,
    note,
    link,
    linkText: "Open the request in Tidemark",
  });
  return { subject: subject.slice(0, 200), text: lines.join("\n"), html };
}

/** Stable per request, purpose and recipient (0: the unit's fallback address). */
export function orderRequestMessageId(
  requestId: number,
  purpose: OrderRequestPurpose,
  userId: number,
  domain: string,
): string {
  return `<order-request-${requestId}.${purpose}.${userId}@${domain}>`;
}
