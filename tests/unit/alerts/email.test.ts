import { describe, expect, it } from "vitest";
import {
  alertMessageId,
  composeAlertEmail,
  retryDelayMs,
  type AlertEmailInput,
} from "@/lib/alerts/email";

const input: AlertEmailInput = {
  alertId: 41,
  kind: "below_band",
  grade: "urgent",
  purpose: "notify",
  escalationLevel: 0,
  unitCode: "MICU",
  unitName: "Medical ICU <north>",
  bedLabel: "7",
  timeZone: "Europe/London",
  startedAt: new Date(Date.UTC(2026, 11, 1, 14, 5)),
  band: { lower: 92, upper: 96 },
  spo2: 84,
  baseUrl: "http://localhost:3000/",
};

describe("composeAlertEmail", () => {
  const mail = composeAlertEmail(input);

  it("says where, what and when, with a link, in both parts", () => {
    for (const part of [mail.text, mail.html]) {
      expect(part).toContain("MICU");
      expect(part).toContain("bed 7");
      expect(part).toContain("SpO2 84 %");
      expect(part).toContain("92–96 %");
      expect(part).toContain("14:05");
      expect(part).toContain("http://localhost:3000/alerts?alert=41");
    }
    expect(mail.subject).toBe("Urgent: SpO2 below target — MICU bed 7");
  });

  it("escapes the HTML part", () => {
    expect(mail.html).toContain("Medical ICU &lt;north&gt;");
    expect(mail.html).not.toContain("<north>");
  });

  it("names the escalation in the subject and body", () => {
    const esc = composeAlertEmail({
      ...input,
      grade: "routine",
      purpose: "escalate",
      escalationLevel: 1,
    });
    expect(esc.subject).toBe("Escalated: SpO2 below target — MICU bed 7");
    expect(esc.text).toContain("assigned therapist because it was not acknowledged in time");
  });

  it("describes limits reached and overdue reassessment", () => {
    expect(
      composeAlertEmail({ ...input, kind: "limits_exhausted", limitsAtMax: ["fio2"] }).text,
    ).toContain("fio2 at the order's maximum");
    expect(
      composeAlertEmail({
        ...input,
        kind: "reassessment_overdue",
        band: null,
        spo2: null,
        overdueMinutes: 12,
      }).text,
    ).toContain("12 min past");
  });

  it("says an overdue reassessment under a minute past the interval is due now, not 0 min past", () => {
    const overdue = { ...input, kind: "reassessment_overdue" as const, band: null, spo2: null };
    expect(composeAlertEmail({ ...overdue, overdueMinutes: 0 }).text).toContain(
      "Reassessment is due now: the interval the order sets has passed.",
    );
    expect(composeAlertEmail({ ...overdue, overdueMinutes: 0 }).text).not.toContain("0 min");
    expect(composeAlertEmail({ ...overdue, overdueMinutes: 1 }).text).toContain(
      "Reassessment is 1 min past the interval the order sets.",
    );
  });
});

describe("alertMessageId and retryDelayMs", () => {
  it("gives one Message-ID per alert, purpose and recipient", () => {
    expect(alertMessageId(41, "notify", 3, "kestrel.example")).toBe(
      "<alert-41.notify.3@kestrel.example>",
    );
    expect(alertMessageId(41, "notify", 3, "x")).toBe(alertMessageId(41, "notify", 3, "x"));
    expect(alertMessageId(41, "escalate-1", 3, "x")).not.toBe(alertMessageId(41, "notify", 3, "x"));
  });
  it("backs off from 30 s, doubling, capped at 15 min", () => {
    expect([1, 2, 3, 4].map(retryDelayMs)).toEqual([30_000, 60_000, 120_000, 240_000]);
    expect(retryDelayMs(20)).toBe(900_000);
  });
});
