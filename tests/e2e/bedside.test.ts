import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { AdjustmentView } from "@/lib/adjustments/service";
import type { OrderView } from "@/lib/orders/queries";
import type { BedsideContext } from "@/lib/chart/bedside";
import { ARTIFACTS, BASE_URL, launchBrowser, signInThroughForm } from "../helpers/browser";
import { Session } from "../helpers/http";

const PHYSICIAN = "ines.varga@kestrel.example"; // MICU and RESP
const THERAPIST = "jonah.pell@kestrel.example"; // MICU
const NURSE = "hana.whitlock@kestrel.example"; // MICU
const REVIEWER = "edith.calloway@kestrel.example"; // MICU and RESP, reads only

// Other test files write orders on seeded patients; these three are this file's own.
const ADJUSTMENT_PATIENT = 4;
const READING_PATIENT = 5;
const BLOOD_GAS_PATIENT = 6;

type ApiErrorBody = { error: { message: string; fieldErrors?: Record<string, string[]> } };

const minutesAgo = (minutes: number) => new Date(Date.now() - minutes * 60_000).toISOString();

async function bedside(session: Session, patientId: number): Promise<BedsideContext> {
  const res = await session.fetch(`/api/v1/patients/${patientId}/bedside`);
  expect(res.status).toBe(200);
  return (await res.json()) as BedsideContext;
}

/**
 * A fresh HFNC order (FiO2 0.30–0.60, flow 30–60 L/min, starting at 0.40 and
 * 40 L/min) superseding whatever is in effect, and an arterial gas on it.
 */
async function hfncOrderWithArterialGas(
  physician: Session,
  patientId: number,
): Promise<BedsideContext> {
  const before = await bedside(physician, patientId);
  const order = await physician.json("/api/v1/orders", "POST", {
    entryMode: "written",
    password: "tidemark-demo",
    patientId,
    device: "hfnc",
    spo2Lower: 92,
    spo2Upper: 96,
    fio2Min: 0.3,
    fio2Max: 0.6,
    flowMin: 30,
    flowMax: 60,
    initialFio2: 0.4,
    initialFlow: 40,
    reassessMinutes: 60,
    rationale: "Type 1 respiratory failure on HFNC (bedside e2e)",
    supersedesOrderId: before.order?.id ?? null,
  });
  expect(order.status, await order.clone().text()).toBe(201);
  expect(((await order.json()) as { order: OrderView }).order.device).toBe("hfnc");
  const gas = await physician.json("/api/v1/blood-gases", "POST", {
    patientId,
    // Earlier than anything the forms record (their times are to the minute).
    sampledAt: minutesAgo(30),
    sampleType: "arterial",
    pao2: 62,
    paco2: 40,
    hemoglobin: 12,
    device: "hfnc",
    flow: 40,
    fio2: 0.4,
  });
  expect(gas.status, await gas.clone().text()).toBe(201);
  return bedside(physician, patientId);
}

async function chartSpo2(session: Session, patientId: number, spo2: number): Promise<void> {
  const res = await session.json("/api/v1/readings", "POST", {
    patientId,
    takenAt: minutesAgo(20),
    spo2,
    respiratoryRate: 24,
    device: "hfnc",
    flow: 40,
    fio2: 0.4,
  });
  expect(res.status, await res.clone().text()).toBe(201);
}

/** The form is interactive once React has hydrated it (its controls are disabled until then). */
const formReady = (page: Page) => page.locator("form[data-ready]").waitFor();

// Browser stories sign in and open several pages; a dev server compiles each on first use.
const BROWSER_STORY_MS = 120_000;
/** How long to wait for what a server action or an API call brings back. */
const SERVER_ROUND_TRIP = { timeout: 20_000, interval: 200 };

const noSidewaysScroll = (page: Page) => page.evaluate(() => document.documentElement.scrollWidth);

let browser: Browser;
let physician: Session;
beforeAll(async () => {
  browser = await launchBrowser();
  physician = await Session.signIn(PHYSICIAN);
});
afterAll(async () => {
  await browser?.close();
});

describe("recording an adjustment in the browser", () => {
  it(
    "shows the therapist the proposal, a forecast range and the limits, and records a change by keyboard",
    async () => {
      await hfncOrderWithArterialGas(physician, ADJUSTMENT_PATIENT);
      await chartSpo2(physician, ADJUSTMENT_PATIENT, 90); // below the 92–96 % band
      const context = await browser.newContext({ viewport: { width: 1024, height: 900 } });
      const page = await context.newPage();
      try {
        await signInThroughForm(page, THERAPIST);
        await page.waitForURL(`${BASE_URL}/board`);
        const response = await page.goto(
          `${BASE_URL}/patients/${ADJUSTMENT_PATIENT}/adjustments/new`,
        );
        expect(response?.status()).toBe(200);
        await page.getByRole("heading", { level: 1, name: "Record adjustment" }).waitFor();
        await formReady(page);

        // The order in effect, the applied settings and the engine's proposal.
        expect(await page.getByTestId("context-order").innerText()).toMatch(
          /FiO2 limits\s+0\.30–0\.60/,
        );
        expect(await page.getByTestId("context-settings").innerText()).toMatch(/FiO2\s+0\.40/);
        const proposal = await page.getByTestId("proposal").innerText();
        // No step table on this order: below the band the engine can only escalate.
        expect(proposal).toMatch(/Escalate to the prescriber/);
        expect(proposal).toMatch(/SpO2 90 % is below the target band 92–96 %/);

        const fio2 = page.getByLabel("New FiO2");
        await fio2.fill("0.5");
        const range = page.getByTestId("forecast-range");
        await expect.poll(() => range.innerText()).toMatch(/PaO2 forecast \d+–\d+ mmHg/);
        const [, low, high] = /PaO2 forecast (\d+)–(\d+) mmHg/.exec(await range.innerText()) ?? [];
        // Constant P/F (one of the three models): 62 / 0.40 × 0.50 = 77.5 mmHg lies inside the range.
        expect(Number(low)).toBeLessThanOrEqual(78);
        expect(Number(high)).toBeGreaterThanOrEqual(77);
        expect(Number(low)).toBeLessThan(Number(high));
        expect(await range.innerText()).toMatch(/at FiO2 0\.50/);
        await page.getByRole("button", { name: "Basis of Forecast range" }).click();
        await page.getByText("lowest to highest PaO2 of the three models").waitFor();
        expect(await page.getByRole("note").first().innerText()).toMatch(/decision support/);

        expect(await noSidewaysScroll(page)).toBeLessThanOrEqual(1024);
        await page.screenshot({ path: `${ARTIFACTS}/adjustment-form-day.png`, fullPage: true });
        await page.getByRole("radio", { name: "Night theme" }).click();
        expect(await page.evaluate(() => document.documentElement.dataset.theme)).toBe("night");
        await page.screenshot({ path: `${ARTIFACTS}/adjustment-form-night.png`, fullPage: true });
        await page.getByRole("radio", { name: "Day theme" }).click();

        // Outside the order's limits: warned while typing, refused beside the field when sent.
        await fio2.fill("0.7");
        const warning = page.getByTestId("limit-warning");
        await expect
          .poll(() => warning.innerText())
          .toBe(
            "FiO2 0.70 is above this order's maximum of 0.60 — ask the physician for a new order.",
          );
        await page.getByLabel("Rationale").fill("Desaturating on 0.40");
        await page.getByRole("button", { name: "Record adjustment" }).click();
        await page
          .getByText(
            "FiO2 0.70 is above this order's maximum of 0.60. To go beyond it, ask the physician for a new order.",
          )
          .waitFor();
        expect(await fio2.getAttribute("aria-invalid")).toBe("true");
        expect(await fio2.inputValue()).toBe("0.7");
        expect(await page.getByLabel("Rationale").inputValue()).toBe("Desaturating on 0.40");

        // A valid change by keyboard only.
        await fio2.focus();
        await page.keyboard.press("Control+A");
        await page.keyboard.type("0.5");
        await expect.poll(() => warning.count()).toBe(0);
        await page.getByLabel("Rationale").focus();
        await page.keyboard.press("Control+A");
        await page.keyboard.type("SpO2 90 % on 0.40; step up within the order");
        await page.keyboard.press("Tab");
        expect(await page.evaluate(() => document.activeElement?.textContent)).toBe(
          "Record adjustment",
        );
        await page.keyboard.press("Enter");

        await page.waitForURL(`${BASE_URL}/patients/${ADJUSTMENT_PATIENT}`);
        await page.getByRole("heading", { level: 2, name: "Oxygen now" }).waitFor();
        expect(await page.getByTestId("bedside-summary").innerText()).toMatch(/FiO2\s+0\.50/);
        const after = await bedside(physician, ADJUSTMENT_PATIENT);
        expect(after.settings).toMatchObject({ fio2: 0.5, flow: 40 });
      } finally {
        await context.close();
      }
    },
    BROWSER_STORY_MS,
  );

  it(
    "on a conflict keeps what was typed and reloads the current settings on request",
    async () => {
      const start = await hfncOrderWithArterialGas(physician, ADJUSTMENT_PATIENT);
      const context = await browser.newContext({ viewport: { width: 1024, height: 900 } });
      const page = await context.newPage();
      try {
        await signInThroughForm(page, THERAPIST);
        await page.waitForURL(`${BASE_URL}/board`);
        await page.goto(`${BASE_URL}/patients/${ADJUSTMENT_PATIENT}/adjustments/new`);
        await formReady(page);
        await page.getByLabel("New FiO2").fill("0.45");
        await page.getByLabel("Reason").selectOption("work_of_breathing");
        await page.getByLabel("Rationale").fill("Working hard at 0.40");

        // Meanwhile the physician changes the settings from the same version.
        const other = await physician.json("/api/v1/adjustments", "POST", {
          patientId: ADJUSTMENT_PATIENT,
          settingsVersion: start.settings?.version,
          toFio2: 0.35,
          toFlow: 50,
          reason: "wean",
          rationale: "Weaning at the bedside",
          appliedAt: new Date().toISOString(),
        });
        expect(other.status).toBe(201);

        await page.getByRole("button", { name: "Record adjustment" }).click();
        const status = page.getByTestId("form-status");
        await expect
          .poll(() => status.innerText(), SERVER_ROUND_TRIP)
          .toMatch(/changed by someone else.*now FiO2 0\.35, flow 50 L\/min/s);
        await page.getByRole("button", { name: "Reload current settings" }).click();
        await expect
          .poll(() => page.getByTestId("context-settings").innerText(), SERVER_ROUND_TRIP)
          .toMatch(/FiO2\s+0\.35/);
        expect(await page.getByLabel("New FiO2").inputValue()).toBe("0.45");
        expect(await page.getByLabel("Rationale").inputValue()).toBe("Working hard at 0.40");

        await page.getByRole("button", { name: "Record adjustment" }).click();
        await page.waitForURL(`${BASE_URL}/patients/${ADJUSTMENT_PATIENT}`);
        const after = await bedside(physician, ADJUSTMENT_PATIENT);
        expect(after.settings).toMatchObject({
          fio2: 0.45,
          flow: 40,
          version: (start.settings?.version ?? 0) + 2,
        });
      } finally {
        await context.close();
      }
    },
    BROWSER_STORY_MS,
  );
});

describe("charting a reading in the browser", () => {
  it(
    "lets the nurse chart SpO2 and rate, which the Chart then shows as the latest observation",
    async () => {
      await hfncOrderWithArterialGas(physician, READING_PATIENT);
      const context = await browser.newContext({ viewport: { width: 1024, height: 800 } });
      const page = await context.newPage();
      try {
        await signInThroughForm(page, NURSE);
        await page.waitForURL(`${BASE_URL}/board`);

        // HFNC settings are not the nurse's to change: the page says who records them.
        await page.goto(`${BASE_URL}/patients/${READING_PATIENT}/adjustments/new`);
        await page
          .getByText("High-flow nasal cannula changes are recorded by a therapist or physician")
          .waitFor();
        expect(await page.getByLabel("New FiO2").count()).toBe(0);

        await page.goto(`${BASE_URL}/patients/${READING_PATIENT}/readings/new`);
        await page.getByRole("heading", { level: 1, name: "Chart SpO2" }).waitFor();
        await formReady(page);
        // Device and oxygen prefilled from the applied settings.
        expect(await page.getByLabel("Device").inputValue()).toBe("hfnc");
        expect(await page.getByLabel("Flow (L/min)").inputValue()).toBe("40");
        expect(await page.getByLabel("FiO2", { exact: true }).inputValue()).toBe("0.4");

        await page.getByLabel("SpO2 (%)").focus();
        await page.keyboard.type("130");
        await page.keyboard.press("Tab");
        await page.keyboard.type("22");
        await page.keyboard.press("Enter");
        await page.getByText("SpO2 must be between 0 and 100 %.").waitFor();
        expect(await page.getByLabel("Respiratory rate (/min)").inputValue()).toBe("22");

        await page.getByLabel("SpO2 (%)").fill("93");
        await page.getByLabel("Respiratory rate (/min)").press("Enter");
        await page.waitForURL(`${BASE_URL}/patients/${READING_PATIENT}`);
        const summary = page.getByTestId("bedside-summary");
        await expect
          .poll(() => summary.innerText(), SERVER_ROUND_TRIP)
          .toMatch(/SpO2\s+93 % · \d+ min ago/);
        const after = await bedside(physician, READING_PATIENT);
        expect(after.latestReading).toMatchObject({
          spo2: 93,
          respiratoryRate: 22,
          device: "hfnc",
          fio2: 0.4,
        });
        expect(Date.now() - Date.parse(after.latestReading?.takenAt ?? "")).toBeLessThan(
          5 * 60_000,
        );
      } finally {
        await context.close();
      }
    },
    BROWSER_STORY_MS,
  );
});

describe("entering a blood gas in the browser", () => {
  it(
    "takes kPa and g/L, converts them, and shows the stored P/F at once",
    async () => {
      await hfncOrderWithArterialGas(physician, BLOOD_GAS_PATIENT);
      const context = await browser.newContext({ viewport: { width: 1024, height: 900 } });
      const page = await context.newPage();
      try {
        await signInThroughForm(page, PHYSICIAN);
        await page.waitForURL(`${BASE_URL}/board`);
        await page.goto(`${BASE_URL}/patients/${BLOOD_GAS_PATIENT}/blood-gases/new`);
        await page.getByRole("heading", { level: 1, name: "Enter blood gas" }).waitFor();
        await formReady(page);
        expect(await page.getByLabel("Pressures in").inputValue()).toBe("mmHg"); // the physician's preference
        await page.getByLabel("Pressures in").selectOption("kPa");
        await page.getByLabel("PaO2 (kPa)").fill("100");
        await page.getByLabel("PaCO2 (kPa)").fill("5.3");
        await page.getByLabel("Haemoglobin", { exact: true }).fill("120");
        await page.getByLabel("Haemoglobin unit").selectOption("g/L");
        await page.getByRole("button", { name: "Save blood gas" }).click();
        // Refused before sending, in the unit typed: 10–700 mmHg is 1.34–93.32 kPa.
        await page.getByText("PaO2 must be between 1.34 and 93.32 kPa.").waitFor();

        await page.getByLabel("PaO2 (kPa)").fill("8.0");
        await page.getByLabel("PaO2 (kPa)").press("Enter");
        await page.getByTestId("blood-gas-saved").waitFor();
        // 8.0 kPa × 7.50062 = 60.0 mmHg at FiO2 0.40: P/F = 150 mmHg (Horovitz 1974).
        const pf = page.getByTestId("oxygenation-index").filter({ hasText: "P/F ratio" });
        expect(await pf.innerText()).toContain("150 mmHg");
        const after = await bedside(physician, BLOOD_GAS_PATIENT);
        expect(after.latestBloodGas).toMatchObject({
          pao2: 60,
          paco2: 39.8,
          hb: 12,
          fio2: 0.4,
          pfRatio: 150,
        });
        expect(await noSidewaysScroll(page)).toBeLessThanOrEqual(1024);
        await page.screenshot({ path: `${ARTIFACTS}/blood-gas-saved-day.png`, fullPage: true });
      } finally {
        await context.close();
      }
    },
    BROWSER_STORY_MS,
  );
});

describe("bedside writes over the API", () => {
  it("answers a nurse's adjustment on an HFNC patient with 403, and two changes from one version with 201 and 409", async () => {
    const start = await hfncOrderWithArterialGas(physician, BLOOD_GAS_PATIENT);
    const version = start.settings?.version;
    const change = (toFio2: number) => ({
      patientId: BLOOD_GAS_PATIENT,
      settingsVersion: version,
      toFio2,
      toFlow: 40,
      reason: "below_band",
      rationale: "Racing change",
      appliedAt: new Date().toISOString(),
    });

    const nurse = await Session.signIn(NURSE);
    const refused = await nurse.json("/api/v1/adjustments", "POST", change(0.45));
    expect(refused.status).toBe(403);
    expect(((await refused.json()) as ApiErrorBody).error.message).toMatch(
      /Nurses record changes on low-flow devices only/,
    );

    const therapist = await Session.signIn(THERAPIST);
    const [first, second] = await Promise.all([
      therapist.json("/api/v1/adjustments", "POST", change(0.45)),
      physician.json("/api/v1/adjustments", "POST", change(0.5)),
    ]);
    expect([first.status, second.status].sort()).toEqual([201, 409]);
    const loser = first.status === 409 ? first : second;
    const winner = first.status === 201 ? first : second;
    const won = ((await winner.json()) as { adjustment: AdjustmentView }).adjustment;
    expect(won.settingsVersion).toBe((version ?? 0) + 1);
    expect(((await loser.json()) as ApiErrorBody).error.message).toContain(
      `now FiO2 ${won.to.fio2.toFixed(2)}, flow 40 L/min`,
    );
    const after = await bedside(physician, BLOOD_GAS_PATIENT);
    expect(after.settings?.version).toBe((version ?? 0) + 1);
  });

  it(
    "shows a reviewer the 403 page on every bedside form",
    async () => {
      const context = await browser.newContext();
      const page = await context.newPage();
      try {
        await signInThroughForm(page, REVIEWER);
        await page.waitForURL(`${BASE_URL}/reports`);
        for (const form of ["adjustments", "readings", "blood-gases"]) {
          const response = await page.goto(
            `${BASE_URL}/patients/${ADJUSTMENT_PATIENT}/${form}/new`,
          );
          expect(response?.status(), form).toBe(403);
          await page.getByRole("heading", { name: "Not available to your role" }).waitFor();
        }
      } finally {
        await context.close();
      }
    },
    BROWSER_STORY_MS,
  );
});
