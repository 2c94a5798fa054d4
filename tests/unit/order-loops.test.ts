import { describe, expect, it } from "vitest";
import { reassessmentDueSoonMinutes, reassessmentOverdueMinutes } from "@/lib/alerts/due";
import { describeOrderChange, orderWords } from "@/lib/order-notices/words";
import { composeOrderRequestEmail, orderRequestMessageId } from "@/lib/order-requests/email";
import { orderRequestSchema } from "@/lib/order-requests/schema";
import { snapshotWords } from "@/lib/order-requests/snapshot";
import { composeOrderChangeEmail } from "@/lib/orders/supersede-email";
import { parseInput } from "@/lib/validation";

const MIN = 60_000;

const hfnc = {
  id: 7,
  device: "hfnc" as const,
  spo2Band: { lower: 92, upper: 96 },
  limits: { fio2Min: 0.3, fio2Max: 0.6, peepMin: null, peepMax: null, flowMin: 30, flowMax: 60 },
  reassessMinutes: 30,
};

describe("an order change in words", () => {
  it("names a new order whole", () => {
    expect(describeOrderChange("new", hfnc, null)).toBe(
      "New order #7: High-flow nasal cannula, target SpO2 92–96 %, FiO2 0.30–0.60, 30–60 L/min, reassess every 30 min.",
    );
  });

  it("names only what a superseding order changed, before → after", () => {
    const next = {
      ...hfnc,
      id: 8,
      spo2Band: { lower: 88, upper: 92 },
      limits: { ...hfnc.limits, fio2Max: 0.8 },
    };
    expect(describeOrderChange("supersede", next, hfnc)).toBe(
      "Order #8 replaces #7: band target SpO2 92–96 % → target SpO2 88–92 %; FiO2 limits FiO2 0.30–0.60 → FiO2 0.30–0.80.",
    );
  });

  it("names a device change with the limits it brings and drops", () => {
    const niv = {
      ...hfnc,
      id: 9,
      device: "niv" as const,
      limits: { fio2Min: 0.3, fio2Max: 0.6, peepMin: 5, peepMax: 10, flowMin: null, flowMax: null },
    };
    const words = describeOrderChange("supersede", niv, hfnc);
    expect(words).toContain(`device High-flow nasal cannula → ${orderWords(niv).split(",")[0]}`);
    expect(words).toContain("PEEP limits now 5–10 cmH2O");
    expect(words).toContain("no flow limits (was 30–60 L/min)");
  });

  it("says when nothing a bedside change is held to differs", () => {
    expect(describeOrderChange("supersede", { ...hfnc, id: 10 }, hfnc)).toBe(
      "Order #10 replaces #7 with the same device, band and limits.",
    );
  });

  it("gives a discontinued order's reason and what it means at the bedside", () => {
    expect(describeOrderChange("discontinue", hfnc, hfnc, "Weaned to room air")).toBe(
      "Order #7 was discontinued: Weaned to room air. No order is in effect now; settings may not be changed until a new one is written.",
    );
  });
});

describe("reassessment due soon", () => {
  const last = Date.UTC(2026, 11, 3, 8, 0);
  it("is listed from 60 minutes before the due time up to the due time itself", () => {
    expect(reassessmentDueSoonMinutes(last, 120, last + 59 * MIN, 60)).toBeNull();
    expect(reassessmentDueSoonMinutes(last, 120, last + 60 * MIN, 60)).toBe(60);
    expect(reassessmentDueSoonMinutes(last, 120, last + 119 * MIN, 60)).toBe(1);
    expect(reassessmentDueSoonMinutes(last, 120, last + 120 * MIN, 60)).toBe(0);
  });

  it("hands over to the overdue sweep the moment after the due time, never both", () => {
    for (const offset of [119, 120, 120.01, 121, 180]) {
      const now = last + offset * MIN;
      const soon = reassessmentDueSoonMinutes(last, 120, now, 60);
      const overdue = reassessmentOverdueMinutes(last, 120, now);
      expect(soon === null || overdue === null).toBe(true);
      expect(soon !== null || overdue !== null).toBe(true);
    }
  });
});

describe("the order request's e-mail", () => {
  const snapshot = {
    settings: { device: "hfnc" as const, fio2: 0.6, fio2Estimated: false, peep: null, flow: 60 },
    latestSpo2: { pct: 88, takenAt: "2026-12-03T08:00:00.000Z" },
    order: { id: 7, band: { lower: 92, upper: 96 }, fio2Max: 0.6, peepMax: null, flowMax: 60 },
  };

  it("attaches the settings, the latest SpO2 and the order's ceilings", () => {
    expect(snapshotWords(snapshot)).toBe(
      "High-flow nasal cannula, FiO2 0.60, flow 60 L/min; latest SpO2 88 %; order #7: target 92–96 %, FiO2 ≤ 0.60, flow ≤ 60",
    );
  });

  it("carries what is needed, why, where and a link — never the patient's name", () => {
    const mail = composeOrderRequestEmail({
      requestId: 3,
      purpose: "ask",
      requestedBy: "Jonah Pell",
      need: "FiO2 up to 0.80",
      reason: "SpO2 88 % at the maximum",
      snapshot,
      unitCode: "MICU",
      unitName: "Medical ICU",
      bedLabel: "4",
      timeZone: "Europe/London",
      askedAt: new Date("2026-12-03T08:05:00Z"),
      asWho: "responsible physician of the shift",
      baseUrl: "https://tidemark.example/",
    });
    expect(mail.subject).toBe("New order requested — MICU bed 4");
    expect(mail.text).toContain("Needed: FiO2 up to 0.80");
    expect(mail.text).toContain("Why: SpO2 88 % at the maximum");
    expect(mail.text).toContain("https://tidemark.example/order-requests?request=3");
    expect(mail.html).toContain("Jonah Pell asks for a new order");
    expect(orderRequestMessageId(3, "ask", 12, "kestrel.example")).toBe(
      "<order-request-3.ask.12@kestrel.example>",
    );
  });

  it("names an order change for the bed's nurse with a link to mark it read", () => {
    const mail = composeOrderChangeEmail({
      orderId: 8,
      event: "supersede",
      words: "Order #8 replaces #7: FiO2 limits FiO2 0.30–0.60 → FiO2 0.30–0.80.",
      by: "Ines Varga",
      duty: "nurse",
      unitCode: "MICU",
      unitName: "Medical ICU",
      bedLabel: "4",
      timeZone: "UTC",
      at: new Date("2026-12-03T08:05:00Z"),
      baseUrl: "https://tidemark.example",
    });
    expect(mail.subject).toBe("Order changed — MICU bed 4");
    expect(mail.text).toContain("What: Order #8 replaces #7");
    expect(mail.text).toContain("https://tidemark.example/orders/8");
  });
});

describe("the order request's schema", () => {
  it("names the field and its range when refusing", () => {
    expect(() =>
      parseInput(orderRequestSchema, {
        patientId: 1,
        source: "chart",
        need: "x",
        reason: "Long enough",
        fio2Max: 1.5,
      }),
    ).toThrow(
      expect.objectContaining({
        fieldErrors: expect.objectContaining({
          need: ["Say what is needed (5 to 500 characters)."],
          fio2Max: [expect.stringContaining("Proposed FiO2 maximum")],
        }) as unknown,
      }) as Error,
    );
  });
});

describe("the composer started from a request", () => {
  it("takes the request's device, maxima and a rationale that quotes it", async () => {
    const { initialValues, prefillFromRequest } = await import("@/components/orders/order-form");
    const current = initialValues(null, "mmHg");
    const next = prefillFromRequest(current, {
      id: 4,
      requestedBy: "Jonah Pell",
      need: "FiO2 up to 0.80",
      reason: "SpO2 88 % at the maximum",
      device: "hfnc",
      fio2Max: 0.8,
      peepMax: null,
      flowMax: 60,
    });
    expect(next).toMatchObject({
      device: "hfnc",
      fio2Max: "0.80",
      flowMax: "60",
      rationale: "Order request #4 from Jonah Pell: FiO2 up to 0.80. SpO2 88 % at the maximum",
    });
    // The device's other starting limits come with it, for the physician to review.
    expect(next.fio2Min).not.toBe("");
  });
});
