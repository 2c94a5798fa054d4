import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { AlertSummary, AlertView } from "@/lib/alerts/queries";
import { closeDb } from "@/lib/db";
import { ARTIFACTS, BASE_URL, launchBrowser, signInThroughForm } from "../helpers/browser";
import { admitTestPatient } from "../helpers/db";
import { Session } from "../helpers/http";

const PHYSICIAN = "ines.varga@kestrel.example"; // MICU and RESP
const NURSE = "hana.whitlock@kestrel.example"; // MICU
const REVIEWER = "edith.calloway@kestrel.example"; // reads only

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await closeDb();
});

async function summary(session: Session): Promise<AlertSummary> {
  const res = await session.fetch("/api/v1/alerts/summary");
  expect(res.status).toBe(200);
  return (await res.json()) as AlertSummary;
}

describe("alerts", () => {
  it("a low SpO2 charted by the nurse shows in the header; the nurse acknowledges it with a note", async () => {
    // A patient of this test's own (admitted as a fixture), with a fresh order.
    const { patientId } = await admitTestPatient("MICU");
    const physician = await Session.signIn(PHYSICIAN);
    const order = await physician.json("/api/v1/orders", "POST", {
      entryMode: "written",
      password: "tidemark-demo",
      patientId,
      device: "venturi_mask",
      spo2Lower: 92,
      spo2Upper: 96,
      fio2Min: 0.24,
      fio2Max: 0.6,
      initialFio2: 0.35,
      reassessMinutes: 60,
      rationale: "Alert e2e: COPD excluded, pneumonia",
      supersedesOrderId: null,
    });
    expect(order.status, await order.clone().text()).toBe(201);

    const nurse = await Session.signIn(NURSE);
    const before = await summary(nurse);
    const reading = await nurse.json("/api/v1/readings", "POST", {
      patientId,
      takenAt: new Date().toISOString(),
      spo2: 87,
      device: "venturi_mask",
      fio2: 0.35,
    });
    expect(reading.status, await reading.clone().text()).toBe(201);
    const after = await summary(nurse);
    expect(after.unacknowledged).toBe(before.unacknowledged + 1);

    const context = await browser.newContext({ viewport: { width: 1024, height: 900 } });
    const page = await context.newPage();
    try {
      await signInThroughForm(page, NURSE);
      await page.waitForURL(`${BASE_URL}/board`);
      const bell = page.getByTestId("alert-bell");
      expect(await bell.getAttribute("aria-label")).toContain(`${after.unacknowledged} alert`);
      expect(await bell.textContent()).toContain(String(after.unacknowledged));

      // The Board row links to the patient's alerts; the header link to all of them.
      await bell.click();
      await page.waitForURL(`${BASE_URL}/alerts`);
      await page.goto(`${BASE_URL}/alerts?patientId=${patientId}`);
      const card = page.getByTestId("alert-card").filter({ hasText: "SpO2 below target" });
      await card.waitFor();
      expect(await card.textContent()).toContain("SpO2 87 %, below the target 92–96 %");
      await card.getByLabel("Note (optional)").fill("Mask refitted, rechecking in 10 min");
      await card.getByRole("button", { name: "Acknowledge" }).press("Enter");
      await card.getByText("Acknowledged", { exact: true }).first().waitFor();
      await page.screenshot({ path: `${ARTIFACTS}/alerts-acknowledged.png`, fullPage: true });
      await page.waitForFunction(
        (n) =>
          document
            .querySelector("[data-testid=alert-bell]")
            ?.getAttribute("aria-label")
            ?.includes(n),
        after.unacknowledged - 1 === 0 ? "No open alerts" : `${after.unacknowledged - 1} alert`,
        { timeout: 20_000 },
      );
    } finally {
      await context.close();
    }

    const res = await nurse.fetch(`/api/v1/alerts?patientId=${patientId}`);
    const { alerts } = (await res.json()) as { alerts: AlertView[] };
    expect(alerts).toHaveLength(1);
    expect(alerts[0]).toMatchObject({
      state: "acknowledged",
      acknowledged: { note: "Mask refitted, rechecking in 10 min" },
    });
    // Acknowledging twice is refused with who did it; the reviewer may not acknowledge at all.
    const again = await nurse.json(`/api/v1/alerts/${alerts[0]!.id}/acknowledge`, "POST", {});
    expect(again.status).toBe(409);
    const reviewer = await Session.signIn(REVIEWER);
    const refused = await reviewer.json(`/api/v1/alerts/${alerts[0]!.id}/acknowledge`, "POST", {});
    expect(refused.status).toBe(403);
  });
});
