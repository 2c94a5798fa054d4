import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { OrderView } from "@/lib/orders/queries";
import {
  ARTIFACTS,
  BASE_URL,
  DEMO_PASSWORD,
  launchBrowser,
  signInThroughForm,
} from "../helpers/browser";
import { Session } from "../helpers/http";

// The write side end to end, as one shift would live it, on one MICU patient
// that no other test file touches.
const PATIENT = 3;
const PHYSICIAN = "tobias.renwick@kestrel.example"; // MICU
const THERAPIST = "jonah.pell@kestrel.example"; // MICU
const NURSE = "hana.whitlock@kestrel.example"; // MICU
const REVIEWER = "edith.calloway@kestrel.example";
const STORY_TIMEOUT = 180_000;

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

async function typeInto(page: Page, label: string, text: string): Promise<void> {
  const field = page.getByLabel(label, { exact: true });
  await field.focus();
  await page.keyboard.press("Control+A");
  await page.keyboard.type(text);
}

async function asUser<T>(email: string, act: (page: Page) => Promise<T>): Promise<T> {
  const context = await browser.newContext({ viewport: { width: 1024, height: 900 } });
  const page = await context.newPage();
  try {
    await signInThroughForm(page, email);
    // A reviewer lands on Reports, everyone else on the Board.
    await page.waitForURL(`${BASE_URL}${email === REVIEWER ? "/reports" : "/board"}`);
    return await act(page);
  } finally {
    await context.close();
  }
}

describe("order, adjustment, reading, ledger", () => {
  it(
    "a physician signs an order, a therapist adjusts with a forecast, a nurse charts, and the ledger shows and verifies all three",
    async () => {
      const stamp = Date.now();
      const orderRationale = `Story order ${stamp}: hypoxaemic pneumonia, high flow`;
      const adjustmentRationale = `Story adjustment ${stamp}: SpO2 90 % on 0.40`;

      // 1. The physician writes and signs the order in the browser.
      await asUser(PHYSICIAN, async (page) => {
        await page.goto(`${BASE_URL}/patients/${PATIENT}/orders/new`);
        await page.getByRole("heading", { level: 1, name: /Oxygen order for/ }).waitFor();
        await page.getByLabel("Delivery device").selectOption("hfnc");
        await typeInto(page, "FiO2 minimum", "0.3");
        await typeInto(page, "FiO2 maximum", "0.6");
        await typeInto(page, "Flow minimum (L/min)", "30");
        await typeInto(page, "Flow maximum (L/min)", "60");
        await typeInto(page, "Starting FiO2", "0.4");
        await typeInto(page, "Starting flow (L/min)", "40");
        await page.getByRole("radio", { name: /92–96 %/ }).check();
        await typeInto(page, "Rationale", orderRationale);
        await typeInto(page, "Password to sign", DEMO_PASSWORD);
        await page.keyboard.press("Enter");
        await page.waitForURL(`${BASE_URL}/patients/${PATIENT}`);
        const summary = page.getByTestId("bedside-summary");
        await summary.waitFor();
        expect(await summary.innerText()).toContain(orderRationale);
        expect(await summary.innerText()).toMatch(/FiO2\s+0\.40/);
      });

      // A blood gas at the current settings gives the forecast something to start from.
      const therapistApi = await Session.signIn(THERAPIST);
      const gas = await therapistApi.json("/api/v1/blood-gases", "POST", {
        patientId: PATIENT,
        sampledAt: new Date().toISOString(),
        sampleType: "arterial",
        pao2: 60,
        paco2: 40,
        hemoglobin: 12,
        device: "hfnc",
        flow: 40,
        fio2: 0.4,
      });
      expect(gas.status).toBe(201);

      // 2. The therapist records an adjustment and sees its forecast as a range.
      await asUser(THERAPIST, async (page) => {
        await page.goto(`${BASE_URL}/patients/${PATIENT}/adjustments/new`);
        await page.getByRole("heading", { level: 1, name: "Record adjustment" }).waitFor();
        await page.locator("form[data-ready]").waitFor();
        await page.getByLabel("New FiO2").fill("0.5");
        await page.getByLabel("New flow (L/min)").fill("50");
        const range = page.getByTestId("forecast-range");
        await expect
          .poll(() => range.innerText(), { timeout: 20_000 })
          .toMatch(/PaO2 forecast \d+–\d+ mmHg/);
        await page.getByLabel("Reason").selectOption("below_band");
        await page.getByLabel("Rationale").fill(adjustmentRationale);
        await page.screenshot({ path: `${ARTIFACTS}/story-adjustment-day.png`, fullPage: true });
        await page.getByRole("button", { name: "Record adjustment" }).click();
        await page.waitForURL(`${BASE_URL}/patients/${PATIENT}`);
        expect(await page.getByTestId("bedside-summary").innerText()).toMatch(/FiO2\s+0\.50/);
      });

      // 3. The nurse charts a reading.
      await asUser(NURSE, async (page) => {
        await page.goto(`${BASE_URL}/patients/${PATIENT}/readings/new`);
        await page.getByRole("heading", { level: 1, name: "Chart SpO2" }).waitFor();
        await page.locator("form[data-ready]").waitFor();
        await page.getByLabel("SpO2 (%)").fill("94");
        await page.getByLabel("Respiratory rate (/min)").fill("24");
        await page.getByLabel("Respiratory rate (/min)").press("Enter");
        await page.waitForURL(`${BASE_URL}/patients/${PATIENT}`);
        expect(await page.getByTestId("bedside-summary").innerText()).toMatch(/94 %/);
      });

      // 4. A nurse trying to write (sign) an order is refused.
      const nurseApi = await Session.signIn(NURSE);
      const bedside = (await (
        await nurseApi.fetch(`/api/v1/patients/${PATIENT}/bedside`)
      ).json()) as { order: OrderView };
      const refused = await nurseApi.json("/api/v1/orders", "POST", {
        entryMode: "written",
        password: DEMO_PASSWORD,
        patientId: PATIENT,
        device: "room_air",
        spo2Lower: 92,
        spo2Upper: 96,
        fio2Min: 0.21,
        fio2Max: 0.21,
        initialFio2: 0.21,
        reassessMinutes: 60,
        rationale: "nurse tries to sign",
        supersedesOrderId: bedside.order.id,
      });
      expect(refused.status).toBe(400);
      const body = (await refused.json()) as { error: { fieldErrors: Record<string, string[]> } };
      expect(body.error.fieldErrors.entryMode?.[0]).toMatch(/verbal or telephone/);

      // 5. The reviewer finds all three in the ledger, with their rationale, and verifies the chain.
      await asUser(REVIEWER, async (page) => {
        await page.goto(`${BASE_URL}/ledger?patientId=${PATIENT}`);
        const table = page.getByRole("table").first();
        await table.waitFor();
        await expect.poll(() => table.innerText(), { timeout: 20_000 }).toContain(orderRationale);
        const text = await table.innerText();
        expect(text).toContain("Order written and signed");
        expect(text).toContain("Adjustment recorded");
        expect(text).toContain(adjustmentRationale);
        expect(text).toContain("Reading charted");
        await page.getByRole("button", { name: "Verify chain" }).click();
        await page.getByText(/Chain intact — [\d,]+ rows checked/).waitFor({ timeout: 30_000 });
        await page.screenshot({ path: `${ARTIFACTS}/story-ledger-day.png`, fullPage: true });
      });
    },
    STORY_TIMEOUT,
  );
});
