import { readFile } from "node:fs/promises";
import type { Browser } from "playwright-core";
import { extractText, getDocumentProxy } from "unpdf";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ARTIFACTS, BASE_URL, launchBrowser, signInThroughForm } from "../helpers/browser";
import { SEEDED } from "../helpers/db";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

/** PDF text runs split words and lines their own way: compare without white space. */
const squeeze = (s: string) => s.replace(/\s+/g, "");

describe("Reports", () => {
  it("lets a reviewer report 7 days of MICU, download a table as CSV and print it with the unit and period on every sheet", async () => {
    const context = await browser.newContext({
      viewport: { width: 1280, height: 900 },
      acceptDownloads: true,
    });
    const page = await context.newPage();
    try {
      // The reviewer's home is Reports.
      await signInThroughForm(page, SEEDED.reviewer);
      await page.waitForURL(/\/reports$/);
      await page.getByRole("heading", { name: "Reports", level: 1 }).waitFor();

      // Unit and period, from the keyboard-usable form; the choice lands in the address.
      await page.getByLabel("Unit", { exact: true }).selectOption({ label: "MICU · Medical ICU" });
      await page.getByRole("radio", { name: "7 days" }).check();
      await page.getByRole("button", { name: "Show", exact: true }).click();
      await page.waitForURL(/\/reports\?.*period=7d/);
      expect(new URL(page.url()).searchParams.get("report")).toBe("time-in-band");
      const view = page.getByTestId("report-view");
      await view.waitFor();
      await expect
        .poll(() => view.getByRole("heading", { level: 2 }).innerText())
        .toContain("MICU");
      const periodText = await page.getByTestId("report-period").innerText();
      const periodLine = periodText.split(". Generated")[0]!;
      expect(periodLine).toMatch(/^MICU \(Medical ICU\), \d{4}-\d\d-\d\d \d\d:\d\d to /);
      await page
        .getByText(/Tidemark is decision support/)
        .first()
        .waitFor();
      await page.screenshot({ path: `${ARTIFACTS}/reports-micu-7d.png`, fullPage: true });

      // The table per patient links each row to the Chart.
      const patients = page.getByTestId("table-time-in-band-patient");
      await patients.waitFor();
      const firstRow = patients.locator("tbody tr").first();
      const firstLabel = (await firstRow.locator("th").innerText()).trim();
      expect(await firstRow.locator("th a").getAttribute("href")).toMatch(/^\/patients\/\d+$/);

      // CSV: a heading line naming the unit and period, the column header, then the rows.
      const [download] = await Promise.all([
        page.waitForEvent("download"),
        page.getByRole("button", { name: "Download CSV: Time in band by patient" }).click(),
      ]);
      expect(download.suggestedFilename()).toMatch(/^tidemark-time-in-band-patient-MICU-.*\.csv$/);
      const csv = await readFile((await download.path())!, "utf8");
      const lines = csv.trim().split(/\r\n/);
      expect(lines[0]).toContain("Time in band: Time in band by patient");
      expect(lines[0]).toContain(periodLine);
      expect(lines[1]).toMatch(/^Patient,Bed,Patient time \(h\),In band \(%\),Below \(%\)/);
      expect(lines[2]!.startsWith(`"${firstLabel}"`) || lines[2]!.startsWith(firstLabel)).toBe(
        true,
      );
      expect(lines.length).toBe(2 + (await patients.locator("tbody tr").count()));

      // Print: Chromium's PDF, every sheet headed by the unit and the period.
      const pdf = await page.pdf({ format: "A4", printBackground: true });
      const doc = await getDocumentProxy(new Uint8Array(pdf));
      const { totalPages, text } = await extractText(doc, { mergePages: false });
      expect(totalPages).toBeGreaterThan(1);
      for (const [i, sheet] of text.entries()) {
        expect(squeeze(sheet), `sheet ${i + 1}`).toContain(
          squeeze(`Tidemark · Time in band · ${periodLine}`),
        );
      }
      const all = squeeze(text.join(" "));
      expect(all).toContain(squeeze("Tidemark is decision support"));
      expect(all).toContain("Generated");
      // The app's header and buttons stay off the paper.
      expect(all).not.toContain("DownloadCSV");
      expect(all).not.toContain("Signout");
    } finally {
      await context.close();
    }
  });

  it("keeps another unit's report away from a reviewer of one unit", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    try {
      await signInThroughForm(page, "rafael.ostrowski@kestrel.example");
      await page.waitForURL(/\/reports$/);
      await page.getByTestId("report-view").waitFor();
      expect(await page.getByTestId("report-period").innerText()).toMatch(/^RESP /);
      const micu = await page.goto(`${BASE_URL}/reports?unit=1&period=7d`);
      expect(micu?.status()).toBe(404);
    } finally {
      await context.close();
    }
  });

  it("fits a phone: no page wider than 390 px, charts and tables included, in both themes", async () => {
    for (const theme of ["day", "night"]) {
      const context = await browser.newContext({ viewport: { width: 390, height: 844 } });
      await context.addCookies([{ name: "tm-theme", value: theme, url: BASE_URL }]);
      const page = await context.newPage();
      try {
        await signInThroughForm(page, SEEDED.reviewer);
        await page.waitForURL(/\/reports$/);
        for (const tab of ["time-in-band", "alerts", "oxygen-exposure", "orders"]) {
          await page.goto(`${BASE_URL}/reports?unit=1&period=7d&report=${tab}`);
          await page.getByTestId("report-view").waitFor();
          const [scroll, inner] = await page.evaluate(() => [
            document.documentElement.scrollWidth,
            window.innerWidth,
          ]);
          expect(scroll, `${tab} at 390 px, ${theme}`).toBeLessThanOrEqual(inner!);
        }
        await page.screenshot({ path: `${ARTIFACTS}/reports-390-${theme}.png`, fullPage: true });
      } finally {
        await context.close();
      }
    }
  });
});
