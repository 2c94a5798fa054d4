import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ARTIFACTS, BASE_URL, launchBrowser, signInThroughForm } from "../helpers/browser";
import { Session } from "../helpers/http";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("step-table library", () => {
  it("an admin builds a unit table from the keyboard; a falling step is refused beside its field", async () => {
    const context = await browser.newContext({ viewport: { width: 1024, height: 900 } });
    const page = await context.newPage();
    try {
      await signInThroughForm(page, "wren.achterberg@kestrel.example");
      await page.waitForURL(`${BASE_URL}/board`);
      await page.goto(`${BASE_URL}/admin/step-tables`);
      await page.getByRole("heading", { name: "ARDS Network lower PEEP / higher FiO2" }).waitFor();
      await page.getByRole("link", { name: "New unit table" }).click();
      const name = `MICU CPAP ladder ${Date.now()}`;
      await page.getByLabel("Name", { exact: true }).fill(name);
      // Other tests add units: name the one this table is for.
      await page.getByLabel("Unit", { exact: true }).selectOption({ label: "MICU · Medical ICU" });
      // Step 2 starts below step 1: refused, named by step.
      await page.locator("#rows-1-fio2Min").fill("0.25");
      await page.getByLabel(/Reason for the change/).fill("Unit CPAP protocol");
      await page.getByRole("button", { name: "Create table" }).click();
      await page.getByText("Step 2: FiO2 must not fall from one step to the next.").waitFor();
      await page.locator("#rows-1-fio2Min").fill("0.4");
      await page.getByRole("button", { name: "Add step" }).click();
      await page.locator("#rows-2-fio2Min").fill("0.5");
      await page.locator("#rows-2-fio2Max").fill("0.5");
      await page.locator("#rows-2-peepMin").fill("10");
      await page.locator("#rows-2-peepMax").press("Enter");
      await page.waitForURL(/\/admin\/step-tables\/\d+$/);
      await page.getByRole("heading", { name, level: 1 }).waitFor();
      await page.screenshot({ path: `${ARTIFACTS}/step-table-editor-day.png`, fullPage: true });

      const api = await Session.signIn("hana.whitlock@kestrel.example"); // MICU nurse reads the library
      const library = (await (await api.fetch("/api/v1/step-tables")).json()) as {
        stepTables: { name: string; rows: unknown[] }[];
      };
      expect(library.stepTables.find((t) => t.name === name)?.rows).toHaveLength(3);
    } finally {
      await context.close();
    }
  });

  it("is closed to other roles", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    try {
      await signInThroughForm(page, "ines.varga@kestrel.example");
      await page.waitForURL(`${BASE_URL}/board`);
      const response = await page.goto(`${BASE_URL}/admin/step-tables/new`);
      expect(response?.status()).toBe(403);
    } finally {
      await context.close();
    }
  });
});
