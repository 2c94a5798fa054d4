import { noticeHtml, when } from "../alerts/email";

/** The outbox purpose of the e-mail telling a prescriber their signed order was replaced. */
export const ORDER_SUPERSEDED_PURPOSE = "order_superseded";

/**
 * The e-mail to the prescriber of a signed order that a verbal or telephone
 * order replaced. Pure. Like alert e-mail it carries unit, bed, who and when,
 * and a link — never the patient's name or record number.
 */
export type OrderSupersededEmailInput = {
  oldOrderId: number;
  newOrderId: number;
  entryMode: "verbal" | "telephone";
  enteredBy: string;
  newPrescriber: string;
  /** The new order names the recipient as its prescriber too. */
  fromRecipient: boolean;
  unitCode: string;
  unitName: string;
  bedLabel: string;
  timeZone: string;
  at: Date;
  baseUrl: string;
};

export function composeOrderSupersededEmail(input: OrderSupersededEmailInput): {
  subject: string;
  text: string;
  html: string;
} {
  const where = `${input.unitCode} bed ${input.bedLabel}`;
  const subject = `Your order #${input.oldOrderId} was replaced by a ${input.entryMode} order — ${where}`;
  const link = `${input.baseUrl.replace(/\/$/, "")}/orders/${input.newOrderId}`;
  const yours = input.fromRecipient;
  const lines = [
    `Your signed oxygen order #${input.oldOrderId} is no longer in effect.`,
    `Where: ${input.unitName} (${input.unitCode}), bed ${input.bedLabel}`,
    `What: ${input.enteredBy} entered ${input.entryMode} order #${input.newOrderId} from ${
      yours ? "you" : input.newPrescriber
    }, read back; it is in effect and awaits co-signature.`,
    `When: ${when(input.at, input.timeZone)}`,
    yours
      ? "If you did not give this order, open it now."
      : "You are receiving this as the prescriber of the replaced order.",
    "",
    `Open the new order: ${link}`,
  ];
  const html = noticeHtml({
    title: lines[0]!,
    facts: lines.slice(1, 4),
    note: lines[4]!,
    link,
    linkText: "Open the new order in Tidemark",
  });
  return { subject: subject.slice(0, 200), text: lines.join("\n"), html };
}

/** Stable per replaced order and recipient: a retry sends the same Message-ID. */
export function orderSupersededMessageId(
  oldOrderId: number,
  userId: number,
  domain: string,
): string {
  return `<order-${oldOrderId}.superseded.${userId}@${domain}>`;
}

/** The outbox purpose of the notice telling a bed's nurse and therapist that its order changed. */
export const ORDER_CHANGE_PURPOSE = "order_change";

/**
 * The e-mail to a bed's assigned nurse or therapist when its order is new,
 * replaced or discontinued: the same shape as the prescriber's notice above
 * (unit, bed, what, when, a link), with the change in words.
 */
export function composeOrderChangeEmail(input: {
  orderId: number;
  event: "new" | "supersede" | "discontinue";
  words: string;
  by: string;
  duty: "nurse" | "therapist";
  unitCode: string;
  unitName: string;
  bedLabel: string;
  timeZone: string;
  at: Date;
  baseUrl: string;
}): { subject: string; text: string; html: string } {
  const where = `${input.unitCode} bed ${input.bedLabel}`;
  const what = { new: "New order", supersede: "Order changed", discontinue: "Order discontinued" }[
    input.event
  ];
  const link = `${input.baseUrl.replace(/\/$/, "")}/orders/${input.orderId}`;
  const lines = [
    `${what} for ${where}`,
    `Where: ${input.unitName} (${input.unitCode}), bed ${input.bedLabel}`,
    `What: ${input.words}`,
    `By: ${input.by}, ${when(input.at, input.timeZone)}`,
    `You are receiving this as the bed's assigned ${input.duty}. Open the order to mark it read.`,
    "",
    `Open the order: ${link}`,
  ];
  const html = noticeHtml({
    title: lines[0]!,
    facts: lines.slice(1, 4),
    note: lines[4]!,
    link,
    linkText: "Open the order in Tidemark",
  });
  return { subject: `${what} — ${where}`.slice(0, 200), text: lines.join("\n"), html };
}

/** Stable per order, event and recipient: a retry sends the same Message-ID. */
export function orderChangeMessageId(
  orderId: number,
  event: string,
  userId: number,
  domain: string,
): string {
  return `<order-${orderId}.${event}.${userId}@${domain}>`;
}
