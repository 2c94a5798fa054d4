import type { Browser, BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/lib/db";
import {
  ARTIFACTS,
  BASE_URL,
  DEMO_PASSWORD,
  launchBrowser,
  signInThroughForm,
} from "../helpers/browser";
import { admitTestPatient, appDb, SEEDED, actorByEmail } from "../helpers/db";

// A physician writes a volume-control order at 6 mL/kg (the form shows the mL
// for this patient), a therapist records a check with plateau 33 cmH2O on the
// order's limit of 30, the lung-protection alert appears and the Chart shows
// the ventilation panel — at 390 px, in the day and the night theme.

const STORY_TIMEOUT = 180_000;

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await closeDb();
});

async function phone(theme: "day" | "night"): Promise<{ context: BrowserContext; page: Page }> {
  const context = await browser.newContext({ viewport: { width: 390, height: 844 } });
  await context.addCookies([{ name: "tm-theme", value: theme, url: BASE_URL }]);
  return { context, page: await context.newPage() };
}

async function fitsPhone(page: Page, what: string): Promise<void> {
  const [scroll, inner] = await page.evaluate(() => [
    document.documentElement.scrollWidth,
    window.innerWidth,
  ]);
  expect(scroll, `${what} at 390 px`).toBeLessThanOrEqual(inner!);
}

/** A fresh MICU patient (female, 165 cm: predicted body weight 57.0 kg) with this shift's therapist and physician. */
async function patientForVentilation() {
  const { patientId, bedId } = await admitTestPatient("MICU");
  const now = Date.now();
  const [therapist, physician] = await Promise.all([
    actorByEmail(SEEDED.therapist),
    actorByEmail(SEEDED.physician),
  ]);
  await appDb()("care_assignments").insert(
    (
      [
        ["therapist", therapist.id],
        ["physician", physician.id],
      ] as const
    ).map(([duty, userId]) => ({
      bed_id: bedId,
      user_id: userId,
      duty,
      starts_at: new Date(now - 3600_000),
      ends_at: new Date(now + 8 * 3600_000),
    })),
  );
  return patientId;
}

describe("ventilator orders and checks on the screens", () => {
  it(
    "a 6 mL/kg volume-control order shows its mL, a check with plateau 33 raises the lung-protection alert, and the Chart shows the ventilation panel at 390 px in both themes",
    async () => {
      const patientId = await patientForVentilation();

      // The physician writes the order on a phone, day theme.
      const doctor = await phone("day");
      try {
        const page = doctor.page;
        await signInThroughForm(page, SEEDED.physician);
        await page.waitForURL(`${BASE_URL}/board`);
        await page.goto(`${BASE_URL}/patients/${patientId}/orders/new`);
        await page.getByLabel("Delivery device").selectOption("invasive");
        await page.getByLabel("Mode").waitFor();
        expect(await page.getByLabel("Mode").inputValue()).toBe("volume_control");
        await page.getByLabel("Tidal volume target", { exact: true }).fill("6");
        // 6 mL/kg × 57.0 kg (45.5 + 0.91 × (165 − 152.4)) = 342 mL.
        expect(await page.getByTestId("order-vtTarget-ml").innerText()).toBe("342\u00a0mL");
        expect(await page.getByTestId("order-pbw").innerText()).toContain("57.0 kg");
        expect(await page.getByLabel("Plateau pressure limit (cmH2O)").inputValue()).toBe("30");
        await page
          .getByLabel("Rationale")
          .fill("ARDS: lung-protective ventilation, volume control");
        await page.getByLabel("Password to sign").fill(DEMO_PASSWORD);
        await fitsPhone(page, "the order form");
        await page.screenshot({
          path: `${ARTIFACTS}/ventilator-order-390-day.png`,
          fullPage: true,
        });
        await page.getByRole("button", { name: "Sign order" }).click();
        await page.waitForURL(`${BASE_URL}/patients/${patientId}`);
        const panel = page.getByTestId("ventilation-panel");
        await panel.waitFor();
        expect(await page.getByTestId("ventilation-order").innerText()).toContain("342 mL");
        expect(await panel.innerText()).toContain("No ventilator check yet");
      } finally {
        await doctor.context.close();
      }

      // The therapist records a check on a phone, night theme.
      const therapist = await phone("night");
      try {
        const page = therapist.page;
        await signInThroughForm(page, SEEDED.therapist);
        await page.waitForURL(/\/(board|assignments)/);
        await page.goto(`${BASE_URL}/patients/${patientId}`);
        await page.getByRole("link", { name: "Record ventilator check" }).click();
        await page.waitForURL(`${BASE_URL}/patients/${patientId}/ventilator-checks/new`);
        await page.locator("form[data-ready='true']").waitFor();
        expect(await page.getByTestId("check-order").innerText()).toContain("= 342 mL");
        await page.getByLabel("Set VT (mL)").fill("340");
        await page.getByLabel("Measured VT (mL)").fill("345");
        await page.getByLabel("Set rate (/min)").fill("22");
        await page.getByLabel("Measured rate (/min)").fill("22");
        await page.getByLabel("Minute ventilation (L/min)").fill("7.6");
        await page.getByLabel("Peak", { exact: true }).fill("38");
        await page.getByLabel("Plateau", { exact: true }).fill("33");
        await page.getByLabel("Total PEEP").fill("10");
        await fitsPhone(page, "the check form");
        await page.screenshot({
          path: `${ARTIFACTS}/ventilator-check-390-night.png`,
          fullPage: true,
        });
        await page.getByRole("button", { name: "Record check" }).click();
        await page.waitForURL(`${BASE_URL}/patients/${patientId}`);

        const latest = page.getByTestId("ventilation-latest");
        await latest.waitFor();
        expect(await latest.innerText()).toContain("Beyond lung-protective limits");
        expect(await latest.innerText()).toContain("plateau pressure 33 cmH2O (limit 30)");
        // The open alert, for the therapist and the physician.
        const alerts = page.locator("section[aria-labelledby='alerts-heading']");
        await alerts.getByText("Lung protection").first().waitFor();
        expect(await alerts.innerText()).toContain("plateau pressure 33 cmH2O (limit 30)");
        // A computed value's basis: inputs, formula, source.
        await page.getByRole("button", { name: "Basis of Driving pressure" }).click();
        await page.getByText("ΔP = Pplat − PEEP (total)").waitFor();
        expect(await page.getByTestId("ventilation-panel").innerText()).toContain("Amato");
        expect(await page.getByTestId("ventilation-trend").count()).toBe(1);
        expect(await page.evaluate(() => document.documentElement.dataset.theme)).toBe("night");
        await fitsPhone(page, "the Chart (night)");
        await page
          .getByTestId("ventilation-panel")
          .screenshot({ path: `${ARTIFACTS}/ventilation-panel-390-night.png` });
      } finally {
        await therapist.context.close();
      }

      // The physician reads the same Chart in the day theme.
      const reader = await phone("day");
      try {
        const page = reader.page;
        await signInThroughForm(page, SEEDED.physician);
        await page.waitForURL(`${BASE_URL}/board`);
        await page.goto(`${BASE_URL}/patients/${patientId}`);
        await page.getByTestId("ventilation-latest").waitFor();
        expect(await page.evaluate(() => document.documentElement.dataset.theme)).toBe("day");
        await fitsPhone(page, "the Chart (day)");
        await page
          .getByTestId("ventilation-panel")
          .screenshot({ path: `${ARTIFACTS}/ventilation-panel-390-day.png` });
      } finally {
        await reader.context.close();
      }

      const alert = (await appDb()("alerts")
        .where({ patient_id: patientId, kind: "lung_protection" })
        .select("state")) as { state: string }[];
      expect(alert).toHaveLength(1);
    },
    STORY_TIMEOUT,
  );
});
