import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { BASE_URL, launchBrowser, signInThroughForm } from "../helpers/browser";

const NURSE = "lior.brandt@kestrel.example";
const PRINT_SHOT = "tests/artifacts/handoff-print.png";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("the shift handoff", () => {
  it("a nurse acknowledges a bed from the keyboard, and the print view keeps only the sheet", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    try {
      await signInThroughForm(page, NURSE);
      await page.waitForURL(`${BASE_URL}/board`);
      await page.getByRole("link", { name: "Handoff", exact: true }).click();
      await page.waitForURL(`${BASE_URL}/handoff`);
      await page.getByRole("heading", { level: 1, name: /^Handoff · MICU/ }).waitFor();
      await page.getByText("Tidemark is decision support.").waitFor();

      // The first bed this nurse has not acknowledged yet.
      const button = page.getByRole("button", { name: /^Acknowledge the handoff of bed / }).first();
      const name = (await button.getAttribute("aria-label"))!;
      const bedLabel = name.replace("Acknowledge the handoff of bed ", "");
      const block = page
        .getByTestId("handoff-bed")
        .filter({ has: page.getByRole("heading", { name: new RegExp(`^Bed ${bedLabel} ·`) }) });
      await expect(block.getByTestId("handoff-acknowledged").count()).resolves.toBe(0);

      await button.focus();
      await page.keyboard.press("Enter");
      await block.getByTestId("handoff-acknowledged").waitFor();
      expect(await block.getByTestId("handoff-acknowledged").textContent()).toMatch(/by you at/);

      // Still acknowledged after a reload, and no button to acknowledge it again.
      await page.reload();
      await block.getByTestId("handoff-acknowledged").waitFor();
      expect(await block.getByTestId("handoff-acknowledged").textContent()).toMatch(/by you at/);
      expect(await block.getByRole("button", { name }).count()).toBe(0);

      // Paper: no header or navigation, no buttons; the sheet and the caution stay.
      await page.emulateMedia({ media: "print" });
      expect(await page.locator("header nav").first().isVisible()).toBe(false);
      expect(await page.getByRole("button", { name: "Print" }).isVisible()).toBe(false);
      expect(await page.getByText("Printed", { exact: true }).isVisible()).toBe(true);
      expect(await page.getByText("Tidemark is decision support.").isVisible()).toBe(true);
      expect(await page.getByTestId("handoff-bed").first().isVisible()).toBe(true);
      const ink = await page
        .getByRole("heading", { level: 1 })
        .evaluate((el) => getComputedStyle(el).color);
      expect(ink).toBe("rgb(0, 0, 0)");
      await page.screenshot({ path: PRINT_SHOT, fullPage: true });
    } finally {
      await context.close();
    }
  }, 60_000);
});
