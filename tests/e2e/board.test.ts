import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ARTIFACTS, BASE_URL, launchBrowser, signInThroughForm } from "../helpers/browser";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const ROLES = [
  { role: "physician", email: "ines.varga@kestrel.example", units: 2 },
  { role: "therapist", email: "jonah.pell@kestrel.example", units: 1 },
  { role: "nurse", email: "greta.sorensen@kestrel.example", units: 1 },
  { role: "reviewer", email: "rafael.ostrowski@kestrel.example", units: 1 },
  { role: "admin", email: "kofi.marchetti@kestrel.example", units: 2 },
] as const;

const rows = (page: Page) => page.getByTestId("board-row");
const bedOrder = (page: Page) => rows(page).locator("th").allInnerTexts();

async function openBoard(page: Page, email: string, role: string) {
  await signInThroughForm(page, email);
  // A reviewer lands on Reports (their home) and opens the Board from there.
  if (role === "reviewer") {
    await page.waitForURL(`${BASE_URL}/reports`);
    await page.goto(`${BASE_URL}/board`);
  }
  await page.waitForURL(`${BASE_URL}/board`);
  await page.getByRole("heading", { name: "Board", level: 1 }).waitFor();
  await rows(page).first().waitFor();
}

describe.each(ROLES)("$role", ({ role, email, units }) => {
  it("opens the Board of their units, sorts it, filters it and opens a Chart", async () => {
    const context = await browser.newContext({ viewport: { width: 1024, height: 768 } });
    const page = await context.newPage();
    try {
      await openBoard(page, email, role);
      // One section per unit; above them, what waits for this person.
      expect(await page.locator("h2[id^='unit-']").count()).toBe(units);
      const panels = { physician: ["waiting-requests"], therapist: ["due-soon", "order-notices"] };
      for (const panel of panels[role as keyof typeof panels] ??
        (role === "nurse" ? panels.therapist : []))
        await page.getByTestId(panel).waitFor();
      // Fits a tablet: no sideways scroll at 1024 px.
      expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
        1024,
      );

      // Sort by SpO2, then reverse it: the header says so, and the order follows.
      const before = await bedOrder(page);
      await page.getByRole("button", { name: /^SpO2/ }).first().click();
      expect(await page.locator("th[aria-sort='ascending']").count()).toBe(units);
      await page.getByRole("button", { name: /^SpO2/ }).first().click();
      expect(await page.locator("th[aria-sort='descending']").count()).toBe(units);
      const values = await rows(page)
        .locator("td:nth-child(6) .font-semibold")
        .allInnerTexts()
        .then((texts) => texts.map((t) => Number.parseFloat(t)));
      if (units === 1) expect(values).toEqual([...values].sort((a, b) => b - a));
      await page.getByRole("button", { name: /^Bed/ }).first().click();
      await expect.poll(() => bedOrder(page)).toEqual(before);

      // Filter by status: every row left shows that status; "Any status" brings all back.
      const total = await rows(page).count();
      await page.getByLabel("Status", { exact: true }).selectOption("in-band");
      const inBand = await rows(page).count();
      expect(inBand).toBeLessThanOrEqual(total);
      if (inBand > 0)
        expect(await rows(page).getByText("In band", { exact: true }).count()).toBe(inBand);
      await page.getByLabel("Status", { exact: true }).selectOption("all");
      await expect.poll(() => rows(page).count()).toBe(total);

      // Filter by unit: one unit's section only.
      const unitSelect = page.getByLabel("Unit", { exact: true });
      const firstUnit = await unitSelect.locator("option").nth(1).getAttribute("value");
      await unitSelect.selectOption(firstUnit!);
      expect(await page.locator("h2[id^='unit-']").count()).toBe(1);
      await unitSelect.selectOption("all");

      if (role === "physician") {
        await page.screenshot({ path: `${ARTIFACTS}/board-1024-day.png`, fullPage: true });
      }

      // The patient cell opens the Chart, with the full name.
      await rows(page)
        .first()
        .getByRole("link", { name: /open the Chart/ })
        .click();
      await page.waitForURL(/\/patients\/\d+$/);
      await page.getByRole("heading", { level: 1 }).waitFor();
    } finally {
      await context.close();
    }
  });
});

describe("Board look", () => {
  it("fits 1024 px in the night theme too", async () => {
    const context = await browser.newContext({ viewport: { width: 1024, height: 768 } });
    await context.addCookies([{ name: "tm-theme", value: "night", url: BASE_URL }]);
    const page = await context.newPage();
    try {
      await openBoard(page, ROLES[0].email, ROLES[0].role);
      expect(await page.evaluate(() => document.documentElement.dataset.theme)).toBe("night");
      expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
        1024,
      );
      await page.screenshot({ path: `${ARTIFACTS}/board-1024-night.png`, fullPage: true });
    } finally {
      await context.close();
    }
  });
});
