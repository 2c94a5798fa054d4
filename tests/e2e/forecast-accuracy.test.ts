import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { recordAdjustmentOperation } from "@/lib/adjustments/operations";
import { recordBloodGasOperation } from "@/lib/blood-gases/operations";
import { closeDb } from "@/lib/db";
import { EMPIRICAL_INTERVAL_RULE } from "@/lib/forecast-accuracy/interval";
import type { ForecastModel } from "@/lib/forecast-accuracy/types";
import { writeOrderOperation } from "@/lib/orders/operations";
import type {
  ForecastAccuracyReport,
  PatientForecastAccuracy,
} from "@/lib/forecast-accuracy/views";
import { ARTIFACTS, BASE_URL, launchBrowser, signInThroughForm } from "../helpers/browser";
import { Session } from "../helpers/http";
import { actorByEmail, admitTestPatient, appDb, SEEDED } from "../helpers/db";
import { hfncOrder } from "../helpers/orders";

// The care is written in-process through the same operations the routes run,
// with backdated clocks (as the demo seed does): through HTTP the server's
// clock would put an order after the gas it is checked against. The people
// then read it through the browser, against the production build.

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await closeDb();
});

const MODELS: ForecastModel[] = ["pf", "alveolarArterialRatio", "shunt"];

/**
 * A fresh MICU patient admitted six hours ago on an HFNC order (FiO2
 * 0.30–0.60 from 0.40, written five hours ago), and the therapist's writers
 * of arterial gases and FiO2 changes at a given number of minutes ago.
 */
async function patientOnHfnc() {
  const { patientId, unitId, bedId } = await admitTestPatient("MICU");
  const T0 = Date.now();
  const at = (minutesAgo: number) => new Date(T0 - minutesAgo * 60_000);
  await appDb()("admissions")
    .where({ patient_id: patientId })
    .update({ admitted_at: at(360) });
  await appDb()("admission_stays")
    .where({ patient_id: patientId })
    .update({ started_at: at(360) });
  const physician = await actorByEmail(SEEDED.physician);
  const therapist = await actorByEmail(SEEDED.therapist);
  await writeOrderOperation.invoke(appDb(), physician, hfncOrder(patientId), at(300));
  const bed = (await appDb()("beds").where({ id: bedId }).first("label")) as { label: string };

  const gas = (minutesAgo: number, pao2: number, fio2: number) =>
    recordBloodGasOperation.invoke(
      appDb(),
      therapist,
      {
        patientId,
        sampledAt: at(minutesAgo).toISOString(),
        sampleType: "arterial",
        pao2,
        paco2: 40,
        hemoglobin: 12,
        device: "hfnc",
        flow: 40,
        fio2,
      },
      at(minutesAgo),
    );
  const change = async (minutesAgo: number, toFio2: number) => {
    const { version } = (await appDb()("bedside_settings as s")
      .join("admissions as a", "a.id", "s.admission_id")
      .where("a.patient_id", patientId)
      .whereNull("a.discharged_at")
      .first("s.version")) as { version: number };
    return recordAdjustmentOperation.invoke(
      appDb(),
      therapist,
      {
        patientId,
        settingsVersion: version,
        toFio2,
        toFlow: 40,
        reason: "below_band",
        rationale: "SpO2 below the band (forecast e2e)",
        appliedAt: at(minutesAgo).toISOString(),
      },
      at(minutesAgo),
    );
  };
  return { patientId, unitId, bedLabel: bed.label, gas, change };
}

/** Whole mmHg as the screens show them, errors signed with a true minus. */
const whole = (v: number) => String(Math.round(v)).replace("-", "−");
const signed = (v: number) => (Math.round(v) > 0 ? `+${whole(v)}` : whole(v));

async function fitsPhone(page: Page, what: string): Promise<void> {
  const [scroll, inner] = await page.evaluate(() => [
    document.documentElement.scrollWidth,
    window.innerWidth,
  ]);
  expect(scroll, `${what} at 390 px`).toBeLessThanOrEqual(inner!);
}

describe("forecast accountability on the screens", () => {
  it("a therapist's gas, FiO2 change and the gas 40 min later: the physician reads the pair on the Chart and in the unit's report", async () => {
    const care = await patientOnHfnc();
    await care.gas(280, 60, 0.4);
    const adjustment = await care.change(240, 0.5);
    const forecast = adjustment.forecast!;
    expect(forecast).not.toBeNull();
    await care.gas(200, 70, 0.5); // 40 min after the change: its check
    // Constant P/F by hand: 60 / 0.40 × 0.50 = 75 mmHg, so its error against 70 is +5.
    expect(forecast.models.pf.pao2).toBeCloseTo(75, 6);

    // Both routes answer the pair, one row per model.
    const api = await Session.signIn(SEEDED.physician);
    const mine = (await (
      await api.fetch(`/api/v1/patients/${care.patientId}/forecast-accuracy`)
    ).json()) as PatientForecastAccuracy;
    expect(mine.pairs.map((p) => [p.adjustmentId, p.measured, p.minutesAfter])).toEqual([
      [adjustment.id, 70, 40],
    ]);
    for (const m of MODELS)
      expect(mine.pairs[0]!.models[m].error).toBeCloseTo(forecast.models[m].pao2 - 70, 9);
    const q = new URLSearchParams({
      unitId: String(care.unitId),
      from: new Date(Date.now() - 6 * 3600_000).toISOString(),
      to: new Date().toISOString(),
    });
    const report = (await (
      await api.fetch(`/api/v1/reports/forecast-accuracy?${q.toString()}`)
    ).json()) as ForecastAccuracyReport;
    expect(
      report.pairs
        .filter((p) => p.patientId === care.patientId)
        .map((p) => [p.adjustmentId, p.models.pf.error]),
    ).toEqual([[adjustment.id, mine.pairs[0]!.models.pf.error]]);

    for (const width of [1280, 390]) {
      const context = await browser.newContext({ viewport: { width, height: 900 } });
      const page = await context.newPage();
      try {
        await signInThroughForm(page, SEEDED.physician);
        await page.waitForURL(`${BASE_URL}/board`);

        // The Chart's panel: the pair, its measured PaO2 and each model's forecast and error.
        await page.goto(`${BASE_URL}/patients/${care.patientId}`);
        const panel = page.getByTestId("forecast-accuracy");
        await panel.getByRole("heading", { name: "How the forecasts did" }).waitFor();
        const row = panel.getByTestId(`forecast-pair-${adjustment.id}`);
        await row.waitFor();
        const cells = await row.locator("td").allInnerTexts();
        expect(cells[0]).toBe("0.40 → 0.50");
        expect(cells[1]).toBe("40 min");
        expect(cells[2]).toBe("70");
        expect(cells[3]).toBe("75 (+5)");
        MODELS.forEach((m, i) => {
          const predicted = forecast.models[m].pao2;
          expect(cells[3 + i], m).toBe(`${whole(predicted)} (${signed(predicted - 70)})`);
        });
        expect(await panel.getByTestId("forecast-interval-state").innerText()).toBe(
          "1 of 3 checked forecasts needed before the range widens.",
        );
        expect(await panel.getByTestId("forecast-coverage").innerText()).toMatch(
          /^[01] of 1 within the shown range/,
        );
        expect(await panel.getByText(/Tidemark is decision support/).isVisible()).toBe(true);
        // The basis, one click away: the window and each definition with its source.
        await panel.getByText("Basis", { exact: true }).click();
        await panel.getByText(/Window: an arterial gas 20 to 240 min after the change/).waitFor();
        const basis = await panel.getByTestId("forecast-accuracy-basis").innerText();
        expect(basis).toContain("Median absolute error");
        // The production build's text is the source's, whole (a minifier once cut it short).
        expect(basis).toContain(EMPIRICAL_INTERVAL_RULE);
        if (width === 390) await fitsPhone(page, "the Chart");
        await panel.screenshot({ path: `${ARTIFACTS}/forecast-accuracy-chart-${width}.png` });

        // Reports → Forecast accuracy, MICU, the last 24 h: the pair with its patient and bed.
        await page.goto(`${BASE_URL}/reports?unit=${care.unitId}&period=24h`);
        await page.getByRole("link", { name: "Forecast accuracy" }).click();
        await page.waitForURL(/report=forecast-accuracy/);
        const view = page.getByTestId("report-view");
        await view.getByRole("heading", { name: /^Forecast accuracy — MICU/ }).waitFor();
        const pairs = page.getByTestId("table-forecast-accuracy-pairs");
        const ours = pairs
          .locator("tbody tr")
          .filter({ has: page.locator(`a[href="/patients/${care.patientId}"]`) });
        expect(await ours.count()).toBe(1);
        const reportCells = await ours.locator("td").allInnerTexts();
        // Bed, change applied, FiO2, gas after, measured, P/F, a/A, shunt, range, verdict, note.
        expect(reportCells[0]).toBe(care.bedLabel);
        expect(reportCells.slice(2, 5)).toEqual(["0.40 → 0.50", "40", "70"]);
        expect(reportCells.slice(5, 8)).toEqual(MODELS.map((m) => whole(forecast.models[m].pao2)));
        await page.getByTestId("calibration-chart").locator("svg").first().waitFor();
        expect(await page.getByTestId("tile-checked").innerText()).toMatch(/\d/);
        if (width === 390) await fitsPhone(page, "the Forecast accuracy report");
        await page.screenshot({
          path: `${ARTIFACTS}/forecast-accuracy-report-${width}.png`,
          fullPage: true,
        });
      } finally {
        await context.close();
      }
    }
  });

  it("the adjustment form shows the patient's empirical interval beside the range once three forecasts are checked", async () => {
    const care = await patientOnHfnc();
    await care.gas(290, 60, 0.4);
    await care.change(280, 0.45);
    await care.gas(240, 64, 0.45);
    await care.change(200, 0.5);
    await care.gas(160, 71, 0.5);
    await care.change(120, 0.55);
    await care.gas(80, 74, 0.55); // three pairs; this gas is fresh for the next forecast

    const context = await browser.newContext({ viewport: { width: 1280, height: 1000 } });
    const page = await context.newPage();
    try {
      await signInThroughForm(page, SEEDED.therapist);
      await page.waitForURL(`${BASE_URL}/board`);
      await page.goto(`${BASE_URL}/patients/${care.patientId}`);
      expect(await page.getByTestId("forecast-interval-state").innerText()).toMatch(
        /^Active: .*3 checked forecasts\.$/,
      );

      await page.goto(`${BASE_URL}/patients/${care.patientId}/adjustments/new`);
      await page.locator("form[data-ready='true']").waitFor();
      await page.getByLabel("New FiO2").fill("0.6");
      const range = await page.getByTestId("forecast-range").innerText();
      const [, low, high] = /PaO2 forecast (\d+)–(\d+) mmHg/.exec(range) ?? [];
      const interval = page.getByTestId("empirical-interval");
      await interval.waitFor();
      const text = await interval.innerText();
      expect(text).toContain("Empirical interval (3 pairs)");
      const [, iLow, iHigh] = /PaO2 (\d+)–(\d+) mmHg/.exec(text) ?? [];
      // Never narrower than the models' range.
      expect(Number(iLow)).toBeLessThanOrEqual(Number(low));
      expect(Number(iHigh)).toBeGreaterThanOrEqual(Number(high));
      expect(text).toMatch(/SpO2 \d+–\d+ %/);
      expect(text).toContain("at least about 50 %"); // (3 − 1)/(3 + 1)

      await interval.getByRole("button", { name: "Basis of the empirical interval" }).click();
      await interval.getByText(/Once the patient has at least 3 checked forecasts/).waitFor();
      await page.getByTestId("adjustment-forecast").screenshot({
        path: `${ARTIFACTS}/forecast-accuracy-empirical-interval.png`,
      });
    } finally {
      await context.close();
    }
  });
});
