import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { TimelinePage } from "@/lib/chart/timeline";
import type { Trend } from "@/lib/chart/trend";
import { ARTIFACTS, BASE_URL, launchBrowser, signInThroughForm } from "../helpers/browser";
import { Session } from "../helpers/http";

const PHYSICIAN = "ines.varga@kestrel.example"; // MICU and RESP
const THERAPIST = "jonah.pell@kestrel.example"; // MICU
const MICU_NURSE = "hana.whitlock@kestrel.example"; // MICU
const RESP_NURSE = "greta.sorensen@kestrel.example"; // RESP
const REVIEWER = "edith.calloway@kestrel.example"; // MICU and RESP, reads only
const ADMIN = "wren.achterberg@kestrel.example"; // MICU and RESP

// This file's own patients: 9 and 10 on MICU, 15 on RESP.
const MICU_PATIENT = 9;
const MICU_PATIENT_2 = 10;
const RESP_PATIENT = 15;

// A respiratory rate no seeded reading has, so this file's rows are recognisable.
const MARK_RR = 37;
const READINGS_PER_PATIENT = 27;

const minutesAgo = (minutes: number) => new Date(Date.now() - minutes * 60_000).toISOString();
const BROWSER_STORY_MS = 150_000;
const noSidewaysScroll = (page: Page) => page.evaluate(() => document.documentElement.scrollWidth);

/** More readings than one timeline page (25), all within the last hour. */
async function chartReadings(session: Session, patientId: number): Promise<void> {
  for (let i = 0; i < READINGS_PER_PATIENT; i++) {
    const res = await session.json("/api/v1/readings", "POST", {
      patientId,
      takenAt: minutesAgo(2 + i * 2),
      spo2: 90 + (i % 6),
      respiratoryRate: MARK_RR,
      device: "nasal_cannula",
      flow: 2,
    });
    expect(res.status, await res.clone().text()).toBe(201);
  }
}

/**
 * A fresh HFNC order superseding whatever is in effect (target band 92–96 %,
 * FiO2 0.30–0.60 starting at 0.40, flow 40 L/min), and an arterial gas on it.
 */
async function hfncOrderWithGas(session: Session, patientId: number): Promise<void> {
  const bedside = (await (await session.fetch(`/api/v1/patients/${patientId}/bedside`)).json()) as {
    order: { id: number } | null;
  };
  const order = await session.json("/api/v1/orders", "POST", {
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
    rationale: "HFNC for the Chart trend (chart e2e)",
    supersedesOrderId: bedside.order?.id ?? null,
  });
  expect(order.status, await order.clone().text()).toBe(201);
  const gas = await session.json("/api/v1/blood-gases", "POST", {
    patientId,
    sampledAt: minutesAgo(25),
    sampleType: "arterial",
    pao2: 64,
    paco2: 41,
    hemoglobin: 12,
    device: "hfnc",
    flow: 40,
    fio2: 0.4,
  });
  expect(gas.status, await gas.clone().text()).toBe(201);
}

let browser: Browser;
let physician: Session;
beforeAll(async () => {
  browser = await launchBrowser();
  physician = await Session.signIn(PHYSICIAN);
  for (const patientId of [MICU_PATIENT, MICU_PATIENT_2, RESP_PATIENT]) {
    await chartReadings(physician, patientId);
    await hfncOrderWithGas(physician, patientId);
  }
}, 120_000);

afterAll(async () => {
  await browser?.close();
});

describe("api/v1/patients/[patientId]/timeline and trend", () => {
  it("pages the timeline newest first without repeats, filtered by kind", async () => {
    const first = await physician.fetch(
      `/api/v1/patients/${MICU_PATIENT}/timeline?kinds=reading&limit=10`,
    );
    expect(first.status).toBe(200);
    const page1 = (await first.json()) as TimelinePage;
    expect(page1.items).toHaveLength(10);
    expect(page1.items.every((i) => i.kind === "reading")).toBe(true);
    expect(page1.items[0]!.values.respiratoryRatePerMin).toBe(MARK_RR);
    const second = (await (
      await physician.fetch(
        `/api/v1/patients/${MICU_PATIENT}/timeline?kinds=reading&limit=10&before=${encodeURIComponent(page1.nextCursor!)}`,
      )
    ).json()) as TimelinePage;
    const cursors = [...page1.items, ...second.items].map((i) => i.cursor);
    expect(new Set(cursors).size).toBe(20);
    expect(Date.parse(second.items[0]!.at)).toBeLessThanOrEqual(Date.parse(page1.items[9]!.at));
  });

  it("answers another unit's patient as 404 and refuses bad queries naming the field", async () => {
    const nurse = await Session.signIn(MICU_NURSE);
    expect((await nurse.fetch(`/api/v1/patients/${RESP_PATIENT}/timeline`)).status).toBe(404);
    const to = new Date().toISOString();
    const from = minutesAgo(60);
    expect(
      (await nurse.fetch(`/api/v1/patients/${RESP_PATIENT}/trend?from=${from}&to=${to}`)).status,
    ).toBe(404);
    const tooMany = await physician.fetch(`/api/v1/patients/${MICU_PATIENT}/timeline?limit=201`);
    expect(tooMany.status).toBe(400);
    const backwards = await physician.fetch(
      `/api/v1/patients/${MICU_PATIENT}/trend?from=${to}&to=${from}`,
    );
    expect(backwards.status).toBe(400);
    const body = (await backwards.json()) as { error: { fieldErrors?: Record<string, string[]> } };
    expect(body.error.fieldErrors?.to).toEqual(["To must be after from."]);
    const tooLong = await physician.fetch(
      `/api/v1/patients/${MICU_PATIENT}/trend?from=${minutesAgo(32 * 24 * 60)}&to=${to}`,
    );
    expect(tooLong.status).toBe(400);
  });

  it("gives the trend of the range asked, clamped to the stay", async () => {
    const res = await physician.fetch(
      `/api/v1/patients/${RESP_PATIENT}/trend?from=${minutesAgo(60)}&to=${new Date().toISOString()}`,
    );
    expect(res.status).toBe(200);
    const trend = (await res.json()) as Trend;
    expect(trend.spo2.length).toBeGreaterThanOrEqual(READINGS_PER_PATIENT);
    expect(trend.spo2.length).toBeLessThanOrEqual(500);
    expect(trend.settings.at(-1)).toMatchObject({ cause: "order", fio2: 0.4, flowLMin: 40 });
    expect(trend.bands.at(-1)).toMatchObject({ lowerPct: 92, upperPct: 96 });
    expect(trend.gases.at(-1)).toMatchObject({ pao2MmHg: 64 });
  });
});

async function openChartFromBoard(page: Page, email: string, patientId: number) {
  await signInThroughForm(page, email);
  // Each role lands on its home (a reviewer on Reports); the Board is one link away.
  await page.waitForURL(new RegExp(`${BASE_URL}/(board|reports)`), { timeout: 60_000 });
  if (!page.url().endsWith("/board")) {
    await page.getByRole("link", { name: "Board", exact: true }).first().click();
    await page.waitForURL(`${BASE_URL}/board`, { timeout: 60_000 });
  }
  await page.locator(`a[href="/patients/${patientId}"]`).first().click();
  await page.waitForURL(new RegExp(`/patients/${patientId}$`), { timeout: 60_000 });
  await page.getByRole("heading", { level: 2, name: "Trend" }).waitFor({ timeout: 60_000 });
  await page.getByTestId("trend-plot").waitFor({ timeout: 60_000 });
  await page.getByTestId("timeline-table").waitFor({ timeout: 60_000 });
}

async function chooseRange(page: Page, label: string) {
  const answered = page.waitForResponse((r) => r.url().includes("/trend?") && r.status() === 200, {
    timeout: 60_000,
  });
  await page.getByTestId("trend-range").locator("label", { hasText: label }).click();
  await answered;
  expect(await page.getByRole("radio", { name: label }).isChecked()).toBe(true);
}

const rows = (page: Page) => page.getByTestId("timeline-table").locator("tbody tr");
// A run of identical readings is one row standing for several (data-count).
const entries = async (page: Page) =>
  (
    await rows(page).evaluateAll((trs) => trs.map((tr) => Number(tr.getAttribute("data-count"))))
  ).reduce((a, b) => a + b, 0);

async function pageAndFilterTimeline(page: Page) {
  expect(await entries(page)).toBe(25);
  await page.getByRole("button", { name: "Load older" }).click();
  await expect.poll(() => entries(page), { timeout: 30_000 }).toBeGreaterThan(25);
  // Readings only: this file's readings come first, newest first.
  const filters = page.getByTestId("timeline-filters");
  for (const name of ["Orders", "Adjustments", "Blood gases"])
    await filters.getByRole("checkbox", { name }).uncheck();
  await expect
    .poll(
      async () =>
        (await rows(page).evaluateAll((trs) => trs.map((tr) => tr.getAttribute("data-kind")))).join(
          ",",
        ),
      {
        timeout: 30_000,
      },
    )
    .toMatch(/^reading(,reading)*$/);
  expect(await rows(page).first().innerText()).toContain(`RR ${MARK_RR} /min`);
}

describe("the Chart's trend and timeline in the browser", () => {
  it(
    "a physician opens a Chart from the Board, changes the range, pages and filters the timeline, in both themes",
    async () => {
      const context = await browser.newContext({ viewport: { width: 1024, height: 900 } });
      const page = await context.newPage();
      try {
        await openChartFromBoard(page, PHYSICIAN, MICU_PATIENT);
        await chooseRange(page, "6 h");
        // Hover and keyboard details.
        await page.getByTestId("trend-plot").focus();
        await page.keyboard.press("End");
        expect(await page.getByTestId("trend-details").innerText()).toMatch(/SpO2 \d+ %/);
        await pageAndFilterTimeline(page);
        expect(await noSidewaysScroll(page)).toBeLessThanOrEqual(1024);
        await page.getByTestId("trend").scrollIntoViewIfNeeded();
        await page.screenshot({ path: `${ARTIFACTS}/chart-day.png`, fullPage: true });
        await page.getByRole("radio", { name: "Night theme" }).click();
        expect(await page.evaluate(() => document.documentElement.dataset.theme)).toBe("night");
        await page.screenshot({ path: `${ARTIFACTS}/chart-night.png`, fullPage: true });
        await page.getByRole("radio", { name: "Day theme" }).click();
      } finally {
        await context.close();
      }
    },
    BROWSER_STORY_MS,
  );

  for (const [role, email, patientId, range] of [
    ["therapist", THERAPIST, MICU_PATIENT_2, "72 h"],
    ["nurse", RESP_NURSE, RESP_PATIENT, "Stay"],
    ["reviewer", REVIEWER, MICU_PATIENT, "Stay"],
    ["admin", ADMIN, RESP_PATIENT, "6 h"],
  ] as const) {
    it(
      `a ${role} opens a Chart from the Board, changes the range, pages and filters the timeline`,
      async () => {
        const context = await browser.newContext({ viewport: { width: 1024, height: 900 } });
        const page = await context.newPage();
        try {
          await openChartFromBoard(page, email, patientId);
          await chooseRange(page, range);
          await pageAndFilterTimeline(page);
          expect(await noSidewaysScroll(page)).toBeLessThanOrEqual(1024);
        } finally {
          await context.close();
        }
      },
      BROWSER_STORY_MS,
    );
  }
});
