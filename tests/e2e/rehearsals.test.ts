import { readFile } from "node:fs/promises";
import type { Browser, Page } from "playwright-core";
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

/** The two runs the first test makes; the later tests read them. */
const made: { unitId: number; lower: number; ladder: number } = { unitId: 0, lower: 0, ladder: 0 };

const RUN_TIMEOUT = 60_000;

async function openMicu(page: Page, email: string): Promise<void> {
  await signInThroughForm(page, email);
  await page.waitForURL((url) => !url.pathname.startsWith("/sign-in"));
  await page
    .getByRole("navigation", { name: "Main" })
    .getByRole("link", { name: "Rehearsals" })
    .click();
  await page.getByRole("heading", { name: "Protocol rehearsal", level: 1 }).waitFor();
  await page.getByLabel("Unit", { exact: true }).selectOption({ label: "MICU · Medical ICU" });
  await page.getByRole("button", { name: "Show", exact: true }).click();
  await page.waitForURL(/\/rehearsals\?unit=\d+/);
}

/** Fills the form for a small cohort on one seed (the same patients for every run) and sends it. */
async function runRehearsal(page: Page, name: string, table: string): Promise<number> {
  await page.locator("form[data-ready='true']").waitFor();
  await page.getByLabel("Name of the run").fill(name);
  await page
    .getByLabel("Ventilated patients' step table (FiO2/PEEP)")
    .selectOption({ label: table });
  await page.getByLabel("SpO2 upper bound (%)").fill("96");
  await page.getByLabel("Patients", { exact: true }).fill("12");
  await page.getByLabel("Length of each stay (h)").fill("24");
  await page.getByLabel("Seed (optional)").fill("2021");
  const before = new URL(page.url()).searchParams.get("run");
  await page.getByRole("button", { name: "Run rehearsal" }).click();
  // The new run is chosen in the address and its progress shows while the worker has it.
  await page.waitForURL((url) => (url.searchParams.get("run") ?? before) !== before);
  const id = Number(new URL(page.url()).searchParams.get("run"));
  const view = page.getByTestId(`run-view-${id}`);
  await view.getByRole("progressbar", { name: "Rehearsal progress" }).waitFor();
  await view.getByTestId("model-tile-tidemark").waitFor({ timeout: RUN_TIMEOUT });
  expect(await view.getByRole("progressbar").count()).toBe(0);
  expect(await view.getByTestId("run-status").innerText()).toBe("Done");
  return id;
}

describe("Protocol rehearsal", () => {
  it("lets a physician run two protocols on MICU, compare them side by side and download the CSV", async () => {
    const context = await browser.newContext({
      viewport: { width: 1280, height: 900 },
      acceptDownloads: true,
    });
    const page = await context.newPage();
    const posts: string[] = [];
    page.on("request", (r) => {
      if (r.method() === "POST" && r.url().includes("/api/v1/rehearsals")) posts.push(r.url());
    });
    try {
      await openMicu(page, SEEDED.physician);
      made.unitId = Number(new URL(page.url()).searchParams.get("unit"));
      await page
        .getByText(
          "A rehearsal is a model, not evidence about a real patient; local protocols and licensed clinicians decide.",
        )
        .waitFor();
      await page.getByText(/Tidemark is decision support/).waitFor();

      // A value out of range is refused beside its field and nothing is sent.
      await page.locator("form[data-ready='true']").waitFor();
      await page.getByLabel("Name of the run").fill("Band too high");
      const upper = page.getByLabel("SpO2 upper bound (%)");
      await upper.fill("101");
      await page.getByRole("button", { name: "Run rehearsal" }).click();
      await page.getByText("SpO2 upper bound must be between 70 and 100 %.").waitFor();
      expect(await upper.getAttribute("aria-invalid")).toBe("true");
      const describedBy = (await upper.getAttribute("aria-describedby")) ?? "";
      expect(await page.locator(`[id="${describedBy.split(" ").at(-1)}"]`).innerText()).toBe(
        "SpO2 upper bound must be between 70 and 100 %.",
      );
      expect(posts).toEqual([]);

      made.lower = await runRehearsal(
        page,
        "ARDS lower PEEP, 92–96 %",
        "ARDS Network lower PEEP / higher FiO2",
      );
      made.ladder = await runRehearsal(
        page,
        "MICU ladder, 92–96 %",
        "MICU conservative PEEP ladder",
      );
      expect(posts).toHaveLength(2);

      // Both in the unit's list, newest first, with the Tidemark workflow's time in band.
      const newest = page.getByTestId(`run-${made.ladder}`);
      await expect.poll(() => newest.innerText()).toMatch(/Tidemark workflow in band: \d+\.\d %/);
      expect(await newest.innerText()).toContain("12 patients × 24 h · seed 2021");
      expect(await newest.innerText()).toMatch(/\d{4}-\d\d-\d\d \d\d:\d\d/);

      // Choose the first run too: the address keeps both, the side by side shows both.
      await page
        .getByRole("checkbox", { name: `Choose “ARDS lower PEEP, 92–96 %” (#${made.lower})` })
        .check();
      await page.waitForURL(new RegExp(`run=${made.ladder}&compare=${made.lower}`));
      const compare = page.getByTestId("side-by-side");
      const table = compare.getByTestId("rehearsal-table-compare");
      await table.waitFor();
      const headers = await table.getByRole("columnheader").allInnerTexts();
      expect(headers).toEqual([
        "Measure",
        "Care model",
        `Run A (#${made.ladder})`,
        `Run B (#${made.lower})`,
        "B − A",
      ]);
      // Both runs by name, beside the table and in the heading.
      expect(await table.innerText()).toContain(
        `Run A: MICU ladder, 92–96 % (#${made.ladder}). Run B: ARDS lower PEEP, 92–96 % (#${made.lower}).`,
      );
      const pooled = table
        .getByRole("row")
        .filter({ hasText: "In band, pooled (%)" })
        .filter({ hasText: "Tidemark workflow" });
      const cells = await pooled.getByRole("cell").allInnerTexts();
      expect(cells[0]).toBe("Tidemark workflow");
      expect(cells[1]).toMatch(/^\d+\.\d$/);
      expect(cells[2]).toMatch(/^\d+\.\d$/);
      expect(cells[3]).toMatch(/^([+−]\d+\.\d|0\.0)$/);
      // What differs: the ventilated table, nothing else (same seed, band and cohort).
      const differs = await compare.locator("dl dt").allInnerTexts();
      expect(differs).toEqual(["Ventilated step table"]);
      await compare.getByRole("figure").waitFor();
      await page.screenshot({ path: `${ARTIFACTS}/rehearsals-1280.png`, fullPage: true });

      // CSV of a run's care models: a line naming the run, then the header and one row per model.
      const [download] = await Promise.all([
        page.waitForEvent("download"),
        page
          .getByRole("button", { name: `Download CSV: Care models, run #${made.ladder}` })
          .click(),
      ]);
      expect(download.suggestedFilename()).toBe(`rehearsal-${made.ladder}-models.csv`);
      const lines = (await readFile((await download.path())!, "utf8")).trim().split(/\r\n/);
      expect(lines[0]).toContain(
        `Protocol rehearsal: Care models; Run #${made.ladder} “MICU ladder, 92–96 %”, MICU, seed 2021, 12 patients × 24 h, asked for `,
      );
      expect(lines[1]).toMatch(
        /^Care model,"In band, median \(%\)","In band, pooled \(%\)",Below \(%\)/,
      );
      expect(lines.slice(2).map((l) => l.split(",")[0])).toEqual([
        "Fixed-interval routine",
        "Tidemark workflow",
        "Instant reference",
      ]);

      // The side by side's CSV names both runs.
      const [both] = await Promise.all([
        page.waitForEvent("download"),
        compare.getByRole("button", { name: "Download CSV: Measures of run A and run B" }).click(),
      ]);
      expect(both.suggestedFilename()).toBe(
        `rehearsal-${made.ladder}-vs-${made.lower}-compare.csv`,
      );
      const bothLines = (await readFile((await both.path())!, "utf8")).trim().split(/\r\n/);
      expect(bothLines[0]).toContain(`; A: Run #${made.ladder} “MICU ladder, 92–96 %”, MICU,`);
      expect(bothLines[0]).toContain(`; B: Run #${made.lower} “ARDS lower PEEP, 92–96 %”, MICU,`);
      expect(bothLines[1]).toBe(
        `Measure,Care model,Run A (#${made.ladder}),Run B (#${made.lower}),B − A`,
      );
      expect(bothLines).toHaveLength(2 + 11 * 3);
    } finally {
      await context.close();
    }
  }, 150_000);

  it("shows a nurse the unit's runs and results, without the form", async () => {
    expect(made.lower).toBeGreaterThan(0);
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    try {
      await openMicu(page, SEEDED.nurse);
      await page.getByText("Physicians and admins run rehearsals").waitFor();
      expect(await page.getByRole("button", { name: "Run rehearsal" }).count()).toBe(0);
      expect(await page.getByLabel("Name of the run").count()).toBe(0);
      await page.getByRole("link", { name: "ARDS lower PEEP, 92–96 %" }).first().click();
      await page.waitForURL(new RegExp(`run=${made.lower}`));
      const view = page.getByTestId(`run-view-${made.lower}`);
      await view.getByTestId("model-tile-tidemark").waitFor();
      await view.getByText("Basis: the figures, settings and tables this run used").click();
      await view.getByTestId("rehearsal-basis").getByText("Figures and their sources").waitFor();
    } finally {
      await context.close();
    }
  });

  it("keeps another unit's runs away from a reviewer of one unit", async () => {
    expect(made.lower).toBeGreaterThan(0);
    const context = await browser.newContext();
    const page = await context.newPage();
    try {
      await signInThroughForm(page, "rafael.ostrowski@kestrel.example");
      await page.waitForURL((url) => !url.pathname.startsWith("/sign-in"));
      const own = await page.goto(`${BASE_URL}/rehearsals`);
      expect(own?.status()).toBe(200);
      await page.getByRole("heading", { name: "Runs on RESP" }).waitFor();
      expect((await page.goto(`${BASE_URL}/rehearsals?unit=${made.unitId}`))?.status()).toBe(404);
      expect((await page.goto(`${BASE_URL}/rehearsals?run=${made.lower}`))?.status()).toBe(404);
    } finally {
      await context.close();
    }
  });

  it("fits a phone: nothing wider than 390 px with two runs side by side, in both themes", async () => {
    expect(made.ladder).toBeGreaterThan(0);
    for (const theme of ["day", "night"]) {
      const context = await browser.newContext({ viewport: { width: 390, height: 844 } });
      await context.addCookies([{ name: "tm-theme", value: theme, url: BASE_URL }]);
      const page = await context.newPage();
      try {
        await signInThroughForm(page, SEEDED.physician);
        await page.waitForURL((url) => !url.pathname.startsWith("/sign-in"));
        await page.goto(
          `${BASE_URL}/rehearsals?unit=${made.unitId}&run=${made.ladder}&compare=${made.lower}`,
        );
        await page.getByTestId("rehearsal-table-compare").waitFor();
        await page
          .getByTestId(`run-view-${made.lower}`)
          .getByTestId("model-tile-tidemark")
          .waitFor();
        const [scroll, inner] = await page.evaluate(() => [
          document.documentElement.scrollWidth,
          window.innerWidth,
        ]);
        expect(scroll, `390 px, ${theme}`).toBeLessThanOrEqual(inner!);
        await page.screenshot({ path: `${ARTIFACTS}/rehearsals-390-${theme}.png`, fullPage: true });
      } finally {
        await context.close();
      }
    }
  });
});
