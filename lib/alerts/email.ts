import { BELOW_OXIMETER_ACCURACY_LABEL, belowOximeterAccuracy } from "../oxygen/oximetry";
import { ALERT_KIND_LABELS, ESCALATION_LABELS, type AlertKind } from "./kinds";

/**
 * Alert e-mail content. Pure. Carries the minimum necessary — unit, bed, what
 * was missed and when, and a link — and never the patient's name or record
 * number: e-mail leaves the hospital's systems and lands on phones.
 */
export type AlertEmailInput = {
  alertId: number;
  kind: AlertKind;
  grade: "routine" | "urgent";
  purpose: "notify" | "escalate" | "urgent";
  escalationLevel: number;
  unitCode: string;
  unitName: string;
  bedLabel: string;
  timeZone: string;
  startedAt: Date;
  band: { lower: number; upper: number } | null;
  spo2: number | null;
  /** For limits reached: which limits are at the order's maximum. */
  limitsAtMax?: string[];
  /** For reassessment overdue: minutes past due. */
  overdueMinutes?: number;
  /** For signal loss: the last monitor sample, and whether an excursion was open or only pending. */
  lastSampleAt?: Date;
  excursion?: { phase: "pending" | "open"; direction: "below" | "above" };
  /** For PaO2 above band: the measured PaO2 and the order's PaO2 band, mmHg. */
  pao2?: number;
  pao2Band?: { lower: number; upper: number };
  /** For lung protection: each limit the ventilator check was beyond, in words. */
  breaches?: string[];
  baseUrl: string;
};

export type AlertEmail = { subject: string; text: string; html: string };

export function escapeHtml(s: string): string {
  return s
    .replace(/&/g, "&amp;")
    .replace(/</g, "&lt;")
    .replace(/>/g, "&gt;")
    .replace(/"/g, "&quot;");
}

/** A moment on the unit's clock, with the zone named. */
export function when(at: Date, timeZone: string): string {
  const local = new Intl.DateTimeFormat("en-GB", {
    timeZone,
    day: "2-digit",
    month: "short",
    hour: "2-digit",
    minute: "2-digit",
    hourCycle: "h23",
  }).format(at);
  return `${local} (${timeZone})`;
}

/** An SpO2 value as the alert texts show it, with the mark below the oximeter's accuracy. */
export function spo2Text(spo2: number | null | undefined): string {
  if (spo2 === null || spo2 === undefined) return "SpO2 ?";
  return `SpO2 ${spo2} %${belowOximeterAccuracy(spo2) ? ` (${BELOW_OXIMETER_ACCURACY_LABEL})` : ""}`;
}

/** What was missed, in one line. */
export function describeAlert(
  input: Pick<
    AlertEmailInput,
    | "kind"
    | "band"
    | "spo2"
    | "limitsAtMax"
    | "overdueMinutes"
    | "excursion"
    | "pao2"
    | "pao2Band"
    | "breaches"
  > & { lastSampleText?: string },
): string {
  const band = input.band ? `target ${input.band.lower}–${input.band.upper} %` : "no target band";
  switch (input.kind) {
    case "below_band":
      return `${spo2Text(input.spo2)}, below the ${band}.`;
    case "above_band":
      return `${spo2Text(input.spo2)} on supplemental oxygen, above the ${band}.`;
    case "limits_exhausted":
      return `SpO2 below the ${band} with ${(input.limitsAtMax ?? []).join(", ") || "a limit"} at the order's maximum: a new order is needed to go further.`;
    case "reassessment_overdue":
      if (input.overdueMinutes === undefined)
        return "Reassessment is past the interval the order sets.";
      // Whole minutes: under one past the interval, the reassessment is simply due.
      return input.overdueMinutes < 1
        ? "Reassessment is due now: the interval the order sets has passed."
        : `Reassessment is ${input.overdueMinutes} min past the interval the order sets.`;
    case "signal_loss": {
      const side = input.excursion?.direction === "above" ? "above" : "below";
      const state = input.excursion?.phase === "open" ? "while SpO2 was" : "while SpO2 was going";
      const last = input.lastSampleText ? ` (last sample ${input.lastSampleText})` : "";
      return `The SpO2 monitor stopped sending${last} ${state} ${side} the ${band}, worst ${spo2Text(input.spo2)}: check the probe and the patient.`;
    }
    case "pao2_above_band": {
      const pao2Band = input.pao2Band
        ? `PaO2 target ${input.pao2Band.lower}–${input.pao2Band.upper} mmHg`
        : "PaO2 target";
      return `PaO2 ${input.pao2 ?? "?"} mmHg on supplemental oxygen, above the ${pao2Band}: consider weaning.`;
    }
    case "lung_protection":
      return `A ventilator check beyond the order's lung-protective limits: ${(input.breaches ?? []).join("; ") || "a limit"}. Review the settings with the order.`;
  }
}

export function composeAlertEmail(input: AlertEmailInput): AlertEmail {
  const where = `${input.unitCode} bed ${input.bedLabel}`;
  const urgent = input.grade === "urgent";
  const prefix =
    input.purpose === "escalate"
      ? "Escalated: "
      : input.purpose === "urgent"
        ? "Now urgent: "
        : urgent
          ? "Urgent: "
          : "";
  const subject = `${prefix}${ALERT_KIND_LABELS[input.kind]} — ${where}`;
  const link = `${input.baseUrl.replace(/\/$/, "")}/alerts?alert=${input.alertId}`;
  const lines = [
    `${ALERT_KIND_LABELS[input.kind]}${urgent ? " (urgent)" : ""}`,
    `Where: ${input.unitName} (${input.unitCode}), bed ${input.bedLabel}`,
    `What: ${describeAlert({
      ...input,
      ...(input.lastSampleAt ? { lastSampleText: when(input.lastSampleAt, input.timeZone) } : {}),
    })}`,
    `Since: ${when(input.startedAt, input.timeZone)}`,
    `You are receiving this as the ${ESCALATION_LABELS[input.escalationLevel] ?? "care team"}${
      input.purpose === "escalate" ? " because it was not acknowledged in time" : ""
    }.`,
    "",
    `Open and acknowledge: ${link}`,
    "",
    "Decision support only: local protocols and the licensed clinicians at the bedside decide.",
  ];
  const html = noticeHtml({
    title: lines[0]!,
    facts: lines.slice(1, 4),
    note: lines[4]!,
    link,
    linkText: "Open and acknowledge in Tidemark",
    footer: lines[8]!,
  });
  return { subject, text: lines.join("\n"), html };
}

/**
 * The HTML part of a Tidemark notice: a title, the facts as a list, a note, the
 * link and an optional footer — every text escaped. Alerts and order notices share it.
 */
export function noticeHtml(n: {
  title: string;
  facts: readonly string[];
  note: string;
  link: string;
  linkText: string;
  footer?: string;
}): string {
  return `<!doctype html><html><body style="font-family:sans-serif">
<p><strong>${escapeHtml(n.title)}</strong></p>
<ul>
${n.facts.map((f) => `<li>${escapeHtml(f)}</li>`).join("\n")}
</ul>
<p>${escapeHtml(n.note)}</p>
<p><a href="${escapeHtml(n.link)}">${escapeHtml(n.linkText)}</a></p>
${n.footer ? `<p style="color:#555">${escapeHtml(n.footer)}</p>\n` : ""}</body></html>`;
}

/** Stable per alert, purpose and recipient: a retry sends the same Message-ID. */
export function alertMessageId(
  alertId: number,
  purpose: string,
  userId: number,
  domain: string,
): string {
  return `<alert-${alertId}.${purpose}.${userId}@${domain}>`;
}

/** Retry delay after `attempts` failed sends: 30 s doubling, capped at 15 min. */
export function retryDelayMs(attempts: number): number {
  return Math.min(30_000 * 2 ** Math.max(0, attempts - 1), 15 * 60_000);
}
