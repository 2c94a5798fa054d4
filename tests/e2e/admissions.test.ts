import { randomUUID } from "node:crypto";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ARTIFACTS, BASE_URL, launchBrowser, signInThroughForm } from "../helpers/browser";
import { appDb } from "../helpers/db";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("a unit's day", () => {
  it("a nurse admits a patient into a free bed, finds her from the header, and discharges her home", async () => {
    // A bed of its own on the ward, so the seeded free beds stay free for the other tests.
    const tag = randomUUID().slice(0, 6).toUpperCase();
    const ward = (await appDb()("units").where({ code: "RESP" }).first("id")) as { id: number };
    await appDb()("beds").insert({
      unit_id: ward.id,
      label: `E${tag.slice(0, 4)}`,
      sort_order: 990,
    });
    const mrn = `KE${tag}`;
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    try {
      await signInThroughForm(page, "greta.sorensen@kestrel.example");
      await page.waitForURL(`${BASE_URL}/board`);
      await page
        .getByRole("navigation", { name: "Main" })
        .getByRole("link", { name: "Admit" })
        .click();
      await page.waitForSelector("form[data-ready=true]");
      // Nothing chosen: every missing field is named.
      await page.getByRole("button", { name: "Admit" }).click();
      await page.getByText("Choose a free bed.").waitFor();
      await page.getByText("MRN must be 4 to 20 letters, digits or dashes.").waitFor();

      await page
        .getByLabel("Bed", { exact: true })
        .selectOption({ label: `RESP · E${tag.slice(0, 4)} (Respiratory Ward)` });
      await page.getByLabel("MRN", { exact: true }).fill(mrn);
      await page.getByLabel("Family name", { exact: true }).fill("Brightwater");
      await page.getByLabel("Given name", { exact: true }).fill("Lumi");
      await page.getByLabel("Date of birth", { exact: true }).fill("1964-03-09");
      await page.getByLabel("Sex at birth", { exact: true }).selectOption("female");
      await page.getByLabel("Height (cm)", { exact: true }).fill("301");
      await page.getByRole("button", { name: "Admit" }).click();
      await page.getByText(/Height must be .*250/).waitFor();
      await page.getByLabel("Height (cm)", { exact: true }).fill("166");
      await page.getByLabel("Reason or source (optional)", { exact: true }).press("Enter");
      await page.waitForURL(/\/patients\/\d+$/);
      await page.getByRole("heading", { name: "Lumi Brightwater" }).waitFor();
      const chartUrl = page.url();

      // The header's search finds her by MRN; Enter opens the Chart.
      await page.goto(`${BASE_URL}/board`);
      const search = page.getByRole("combobox", { name: /Find a patient/ });
      await search.fill(mrn.slice(0, 6));
      await page.getByRole("option", { name: /Brightwater, Lumi/ }).waitFor();
      await search.press("ArrowDown");
      await search.press("Enter");
      await page.waitForURL(chartUrl);

      await page.getByRole("link", { name: "Discharge" }).click();
      await page.waitForSelector("form[data-ready=true]");
      await expect(page.getByTestId("discharge-consequences").textContent()).resolves.toMatch(
        /no order is in effect/,
      );
      await page.getByLabel("Discharged to", { exact: true }).selectOption("home");
      await page.getByRole("button", { name: "Discharge" }).click();
      await page.waitForURL(chartUrl);
      await page.getByTestId("discharged-banner").waitFor();
      expect(await page.getByTestId("discharged-banner").textContent()).toMatch(
        /Discharged \(home\)/,
      );
      // A record now: no Move, Discharge or bedside buttons.
      expect(await page.getByRole("link", { name: "Discharge" }).count()).toBe(0);
      expect(await page.getByRole("navigation", { name: "Bedside actions" }).count()).toBe(0);
      await page.screenshot({ path: `${ARTIFACTS}/chart-discharged-day.png`, fullPage: true });

      const rows = (await appDb()("ledger_entries as l")
        .join("patients as p", "p.id", "l.patient_id")
        .where("p.mrn", mrn)
        .orderBy("l.chain_seq")
        .pluck("l.action")) as string[];
      expect(rows).toEqual(["patient.admit", "patient.discharge"]);
    } finally {
      await context.close();
    }
  });
});
