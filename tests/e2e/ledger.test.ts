import { randomUUID } from "node:crypto";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { LedgerVerification } from "@/lib/ledger/verify";
import { ARTIFACTS, BASE_URL, launchBrowser, signInThroughForm } from "../helpers/browser";
import { appDb } from "../helpers/db";
import { Session } from "../helpers/http";

const PHYSICIAN = "ines.varga@kestrel.example"; // MICU and RESP
const REVIEWER = "edith.calloway@kestrel.example"; // MICU and RESP
const MICU_NURSE = "hana.whitlock@kestrel.example"; // MICU only
const MICU_PATIENT_ID = 2; // the demo seed admits patients 1–10 to MICU
const RESP_PATIENT_ID = 14; // and 11–26 to RESP

type ChartedReading = { reading: { id: number; patientId: number; spo2: number } };

/** Charts a reading through the API as the physician: one new ledger row on the patient's chain. */
async function chartReading(
  patientId: number,
  spo2: number,
  physician?: Session,
): Promise<ChartedReading["reading"]> {
  const session = physician ?? (await Session.signIn(PHYSICIAN));
  const res = await session.json("/api/v1/readings", "POST", {
    patientId,
    takenAt: new Date().toISOString(),
    spo2,
    device: "room_air",
    idempotencyKey: randomUUID(),
  });
  expect(res.status).toBe(201);
  return ((await res.json()) as ChartedReading).reading;
}

async function signInAndOpenLedger(page: Page, email: string): Promise<void> {
  await signInThroughForm(page, email);
  // A reviewer lands on Reports, everyone else on the Board; the Ledger is in the header of both.
  await page.waitForURL(new RegExp(`${BASE_URL}/(board|reports)$`));
  await page.getByRole("link", { name: "Ledger" }).click();
  await page.waitForURL(`${BASE_URL}/ledger`);
  await page.getByRole("heading", { name: "Ledger", level: 1 }).waitFor();
}

/** The patient as the ledger names them: name and MRN. */
async function patientOf(patientId: number): Promise<{ mrn: string; label: string }> {
  const p = (await appDb()("patients")
    .where({ id: patientId })
    .first("mrn", "family_name", "given_name")) as {
    mrn: string;
    family_name: string;
    given_name: string;
  };
  return { mrn: p.mrn, label: `${p.family_name.toUpperCase()}, ${p.given_name} · ${p.mrn}` };
}

/** Filters by the patient's MRN from the keyboard, as a person would; the filter lands in the address. */
async function filterByPatient(page: Page, patientId: number, alsoInAddress = ""): Promise<void> {
  const { mrn } = await patientOf(patientId);
  await page.getByLabel("Patient MRN", { exact: true }).fill(mrn);
  await page.getByLabel("Patient MRN", { exact: true }).press("Enter");
  await page.waitForURL(`${BASE_URL}/ledger?mrn=${mrn}${alsoInAddress}`);
}

/** Row ids shown, in order, read from each row's before/after button. */
function shownRowIds(page: Page): Promise<number[]> {
  return page
    .getByTestId("ledger-entry")
    .getByRole("button", { name: /Before \/ after of row/ })
    .evaluateAll((buttons) =>
      buttons.map((b) => Number(/row (\d+)$/.exec(b.getAttribute("aria-label") ?? "")?.[1])),
    );
}

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("the Ledger page", () => {
  it("lets a reviewer find a charted reading, open its before/after and verify the chain", async () => {
    const spo2 = 90 + Math.floor(Math.random() * 9);
    const reading = await chartReading(MICU_PATIENT_ID, spo2);

    const context = await browser.newContext({ viewport: { width: 1024, height: 800 } });
    const page = await context.newPage();
    try {
      await signInAndOpenLedger(page, REVIEWER);
      await filterByPatient(page, MICU_PATIENT_ID);

      // Newest first by when each row happened (rows other tests dated later come
      // before it); the reading just charted is on the first page.
      const first = page
        .getByTestId("ledger-entry")
        .filter({ has: page.getByText(`Reading #${reading.id} · MICU`, { exact: true }) });
      await first.waitFor();
      const times = await page
        .getByTestId("ledger-entry")
        .locator("time")
        .evaluateAll((ts) => ts.map((t) => Date.parse(t.getAttribute("datetime") ?? "")));
      expect(times).toEqual([...times].sort((a, b) => b - a));
      await first.getByText("Reading charted").waitFor();
      await first.getByText("Dr Ines Varga").waitFor();
      await first.getByText("Physician", { exact: true }).waitFor();
      // Stored in UTC, shown in the unit's zone (the demo units keep UTC), the zone named.
      const time = first.locator("time");
      await time.getByText("UTC", { exact: true }).waitFor();
      const stored = (await time.getAttribute("datetime")) ?? "";
      expect(await time.innerText()).toBe(`${stored.slice(0, 10)}\n${stored.slice(11, 19)} UTC`);
      const { label } = await patientOf(MICU_PATIENT_ID);
      expect(await first.getByRole("link", { name: label }).getAttribute("href")).toBe(
        `/patients/${MICU_PATIENT_ID}`,
      );
      // Every row shown belongs to the filtered patient, named as people know them.
      const links = await page.getByTestId("ledger-entry").getByRole("link").allInnerTexts();
      expect(links.length).toBeGreaterThan(0);
      expect(new Set(links)).toEqual(new Set([label]));

      // Before/after opens from the keyboard and shows the stored JSON, pretty-printed.
      const disclosure = first.getByRole("button", { name: "Before / after of row" });
      expect(await disclosure.getAttribute("aria-expanded")).toBe("false");
      await disclosure.focus();
      await page.keyboard.press("Enter");
      await expect.poll(() => disclosure.getAttribute("aria-expanded")).toBe("true");
      // Field by field first; the stored JSON, as hashed, one click further.
      const diff = first.getByTestId("ledger-diff");
      await diff.getByText("Created with these fields").waitFor();
      expect(
        await diff
          .locator("tr", { has: page.getByRole("rowheader", { name: "spo2" }) })
          .innerText(),
      ).toContain(String(spo2));
      await first.getByText("Stored JSON, as hashed").click();
      const after = first.getByLabel("After (JSON)");
      await after.waitFor();
      expect(await after.innerText()).toContain(`"spo2": ${spo2}`);
      await first.getByText("Nothing before: this row created the record.").waitFor();
      await first.getByText(`patient:${MICU_PATIENT_ID}`).waitFor();

      // The table fits a 1024 px tablet: nothing scrolls sideways.
      const overflow = await page.evaluate(
        () => document.documentElement.scrollWidth - window.innerWidth,
      );
      expect(overflow).toBeLessThanOrEqual(0);
      await page.screenshot({ path: `${ARTIFACTS}/ledger-day.png` });

      await page.getByRole("button", { name: "Verify chain" }).click();
      const verdict = page.getByTestId("verify-result");
      await verdict.getByText(/^Chain intact — [\d,]+ rows? checked$/).waitFor();

      await page.getByRole("radio", { name: "Night theme" }).click();
      expect(await page.evaluate(() => document.documentElement.dataset.theme)).toBe("night");
      await page.screenshot({ path: `${ARTIFACTS}/ledger-night.png` });
    } finally {
      await context.close();
    }
  });

  it("offers the filtered rows as CSV with the same filters", async () => {
    const reading = await chartReading(MICU_PATIENT_ID, 94);
    const context = await browser.newContext({ viewport: { width: 1024, height: 800 } });
    const page = await context.newPage();
    try {
      await signInAndOpenLedger(page, REVIEWER);
      await page.getByLabel("Action", { exact: true }).selectOption({ label: "Reading charted" });
      await filterByPatient(page, MICU_PATIENT_ID, "&action=reading.chart");
      await expect
        .poll(() =>
          page.getByTestId("ledger-entry").first().getByTestId("ledger-entity").innerText(),
        )
        .toBe(`Reading #${reading.id} · MICU`);
      const href = await page.getByRole("link", { name: "Download CSV" }).getAttribute("href");
      const { mrn } = await patientOf(MICU_PATIENT_ID);
      expect(href).toBe(`/api/v1/ledger/export?mrn=${mrn}&action=reading.chart`);
    } finally {
      await context.close();
    }

    const reviewer = await Session.signIn(REVIEWER);
    const res = await reviewer.fetch(
      `/api/v1/ledger/export?patientId=${MICU_PATIENT_ID}&action=reading.chart`,
    );
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toMatch(/^text\/csv/);
    expect(res.headers.get("content-disposition")).toMatch(
      /^attachment; filename="tidemark-ledger-.*\.csv"$/,
    );
    const lines = (await res.text()).trimEnd().split("\r\n");
    expect(lines[0]).toBe(
      "id,occurred_at_utc,actor,actor_role,action,entity_type,entity_id,patient_id,unit_id,rationale,before_json,after_json,chain_key,chain_seq,hash",
    );
    const row = lines.find((line) =>
      line.includes(`,reading.chart,reading,${reading.id},${MICU_PATIENT_ID},`),
    );
    expect(row).toContain("Dr Ines Varga,physician,reading.chart");
    // Filtered: every data row is a charted reading of that patient.
    for (const line of lines.slice(1)) {
      expect(line).toMatch(new RegExp(`,reading\\.chart,reading,\\d+,${MICU_PATIENT_ID},`));
    }
  });

  it("follows the cursor with Load older, without repeating or skipping rows", async () => {
    // One page holds 50 rows: chart 51 after a known second, then filter to that period by address.
    const since = new Date(Math.floor(Date.now() / 1000) * 1000 - 1000);
    const physician = await Session.signIn(PHYSICIAN);
    const charted: number[] = [];
    for (let i = 0; i < 51; i += 1)
      charted.push((await chartReading(MICU_PATIENT_ID, 90 + (i % 10), physician)).id);

    const context = await browser.newContext({ viewport: { width: 1024, height: 800 } });
    const page = await context.newPage();
    try {
      await signInThroughForm(page, REVIEWER);
      await page.waitForURL(`${BASE_URL}/reports`);
      const { mrn } = await patientOf(MICU_PATIENT_ID);
      const address = `${BASE_URL}/ledger?mrn=${mrn}&action=reading.chart&from=${since.toISOString()}`;
      await page.goto(address);
      // The shared address fills the form: the period shows in the units' zone.
      await expect
        .poll(() => page.getByLabel("Patient MRN", { exact: true }).inputValue())
        .toBe(mrn);
      await expect
        .poll(() => page.getByLabel("From", { exact: true }).inputValue())
        .toBe(since.toISOString().slice(0, 19).replace(/:00$/, ""));
      const rows = page.getByTestId("ledger-entry");
      await expect.poll(() => rows.count()).toBe(50);
      await page.getByRole("button", { name: "Load older" }).click();
      await expect.poll(() => rows.count()).toBeGreaterThanOrEqual(51);
      await page.getByText(/the oldest row is shown/).waitFor();
      expect(await page.getByRole("button", { name: "Load older" }).count()).toBe(0);

      const ids = await shownRowIds(page);
      expect(new Set(ids).size).toBe(ids.length);
      // Newest first by when each row happened.
      const times = await rows
        .locator("time")
        .evaluateAll((ts) => ts.map((t) => Date.parse(t.getAttribute("datetime") ?? "")));
      expect(times).toEqual([...times].sort((a, b) => b - a));
      const entities = await rows.getByTestId("ledger-entity").allInnerTexts();
      for (const id of charted) expect(entities).toContain(`Reading #${id} · MICU`);
    } finally {
      await context.close();
    }
  });

  it("shows a MICU-only nurse no rows of a RESP patient, and says so", async () => {
    await chartReading(RESP_PATIENT_ID, 95);
    const context = await browser.newContext({ viewport: { width: 1024, height: 800 } });
    const page = await context.newPage();
    try {
      await signInAndOpenLedger(page, MICU_NURSE);
      await filterByPatient(page, RESP_PATIENT_ID);
      await page.getByText("No ledger rows match these filters").waitFor();
      expect(await page.getByTestId("ledger-entry").count()).toBe(0);
      await page.screenshot({ path: `${ARTIFACTS}/ledger-empty-day.png`, fullPage: true });
    } finally {
      await context.close();
    }
  });

  it("names a mistyped filter beside its field, from the form and from a shared address", async () => {
    const context = await browser.newContext({ viewport: { width: 1024, height: 800 } });
    const page = await context.newPage();
    try {
      await signInAndOpenLedger(page, REVIEWER);
      await page.getByLabel("Patient MRN", { exact: true }).fill("KH 402");
      await page.getByLabel("From", { exact: true }).fill("2026-03-04T10:00");
      await page.getByLabel("To", { exact: true }).fill("2026-03-04T09:00");
      await page.getByRole("button", { name: "Apply filters" }).click();
      await page
        .getByText("MRN must be 1 to 32 letters, digits or dashes, such as KH402150.")
        .waitFor();
      await page.getByText("To must be later than From.").waitFor();
      expect(
        await page.getByLabel("Patient MRN", { exact: true }).getAttribute("aria-invalid"),
      ).toBe("true");
      expect(page.url()).toBe(`${BASE_URL}/ledger`);

      await page.goto(`${BASE_URL}/ledger?patientId=-3&action=order.erase`);
      await page.getByText("Patient id must be a whole number above 0, such as 12.").waitFor();
      await page.getByText("Choose an action from the list.").waitFor();
      await page.getByText(/Some filters in this address cannot be read/).waitFor();
      expect(await page.getByRole("link", { name: "Download CSV" }).count()).toBe(0);
      await page.screenshot({ path: `${ARTIFACTS}/ledger-filter-errors-day.png`, fullPage: true });
    } finally {
      await context.close();
    }
  });
});

describe("api/v1/ledger/verify", () => {
  it("reports an intact chain after new writes, counting them", async () => {
    const reviewer = await Session.signIn(REVIEWER);
    const before = (await (
      await reviewer.fetch("/api/v1/ledger/verify")
    ).json()) as LedgerVerification;
    await chartReading(MICU_PATIENT_ID, 96);
    const res = await reviewer.fetch("/api/v1/ledger/verify");
    expect(res.status).toBe(200);
    const after = (await res.json()) as LedgerVerification;
    expect(after).toMatchObject({ ok: true, firstBroken: null });
    expect(after.checked).toBeGreaterThan(before.checked);
  });
});
