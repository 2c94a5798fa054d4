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

/** Presses Tab (or Shift+Tab) until the focused element matches the selector, as a keyboard user would. */
async function tabTo(page: Page, selector: string, key: "Tab" | "Shift+Tab" = "Tab") {
  for (let i = 0; i < 150; i++) {
    await page.keyboard.press(key);
    const there = await page.evaluate(
      (sel) => document.activeElement?.matches(sel) ?? false,
      selector,
    );
    if (there) return;
  }
  throw new Error(`Tab never reached ${selector}`);
}

describe("shift assignments", () => {
  it("the charge nurse assigns the next shift's nurse of a bed by keyboard; it stays after a reload", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    try {
      // The seed makes Hana Whitlock MICU's charge nurse of the current shift.
      await signInThroughForm(page, "hana.whitlock@kestrel.example");
      await page.waitForURL(`${BASE_URL}/board`);
      await page.goto(`${BASE_URL}/assignments`);
      await page.getByRole("heading", { name: /^Current shift/ }).waitFor();
      await page.getByText("You may edit this shift as the unit's charge nurse").waitFor();

      await tabTo(page, "a[href*='shift=next']");
      await page.keyboard.press("Enter");
      await page.waitForURL(/shift=next/);
      await page.getByRole("heading", { name: /^Next shift/ }).waitFor();
      await page.locator("form[data-ready='true']").waitFor();

      const cell = page.getByLabel("I01 nurse");
      const id = (await cell.getAttribute("id"))!;
      const before = await cell.inputValue();
      await tabTo(page, `#${id}`);
      // Arrow keys change a closed native select; up from the seeded nurse, down from "Nobody".
      await page.keyboard.press(before === "" ? "ArrowDown" : "ArrowUp");
      const chosen = await cell.inputValue();
      expect(chosen).not.toBe(before);
      const chosenName = await cell.evaluate(
        (el) => (el as HTMLSelectElement).selectedOptions[0]?.textContent ?? "",
      );

      // Save sits above the grid: back from the cell.
      await tabTo(page, "button[type='submit']", "Shift+Tab");
      await page.keyboard.press("Enter");
      await page
        .getByRole("status")
        .filter({ hasText: /Saved: 1 change/ })
        .waitFor();
      await page.screenshot({ path: `${ARTIFACTS}/assignments-next-shift.png`, fullPage: true });

      await page.reload();
      await page.locator("form[data-ready='true']").waitFor();
      expect(await page.getByLabel("I01 nurse").inputValue()).toBe(chosen);
      expect(chosenName.length).toBeGreaterThan(0);
    } finally {
      await context.close();
    }
  });

  it("shows another nurse the grid read-only, saying who assigns", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    try {
      await signInThroughForm(page, "felix.adeyemi@kestrel.example");
      await page.waitForURL(`${BASE_URL}/board`);
      await page.goto(`${BASE_URL}/assignments`);
      await page
        .getByText("Only the unit's charge nurse of the current shift or an administrator")
        .waitFor();
      expect(await page.locator("select[id^='cell-']").count()).toBe(0);
      expect(await page.getByRole("button", { name: "Save" }).count()).toBe(0);
    } finally {
      await context.close();
    }
  });
});
