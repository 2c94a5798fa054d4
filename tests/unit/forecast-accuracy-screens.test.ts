import { describe, expect, it } from "vitest";
import {
  calibrationSeries,
  deviceTable,
  fio2StepTable,
  forecastReportPeriod,
  forecastTiles,
  modelTable,
  pairsTable,
  reasonTable,
  uncheckedTable,
} from "@/lib/forecast-accuracy/report-tables";
import {
  coverageText,
  deviceLabel,
  fio2StepText,
  hasStoredForecast,
  intervalStateText,
  pressureText,
  pressureValue,
  rangeVerdict,
  signedPressureText,
} from "@/lib/forecast-accuracy/words";
import { csvFileName, tableToCsv } from "@/lib/reports/csv";
import { formatCell } from "@/lib/reports/tables";
import { parseReportSearch, REPORT_LABELS, REPORT_PAGES } from "@/lib/reports/period";
import { REPORT_KINDS } from "@/lib/reports/types";
import { summarizeByFio2Step } from "@/lib/forecast-accuracy";
import { FIXTURE_PAIRS, patientFixture, reportFixture } from "../fixtures/forecast-accuracy";

// The fixture's figures are worked by hand in tests/fixtures/forecast-accuracy.ts.
// 1 kPa = 7.50062 mmHg.

const cells = (table: { rows: { key: string; cells: unknown[] }[] }, key: string) =>
  table.rows.find((r) => r.key === key)?.cells;

describe("forecast-accuracy words", () => {
  it("rounds pressures as shown: whole mmHg, kPa to one decimal, errors signed with a true minus", () => {
    expect(pressureValue(77.5, "mmHg")).toBe(78);
    expect(pressureValue(75, "kPa")).toBe(10); // 75 / 7.50062 = 9.9992
    expect(pressureValue(null, "kPa")).toBeNull();
    expect(pressureText(84, "kPa")).toBe("11.2"); // 11.199
    expect(signedPressureText(5, "mmHg")).toBe("+5");
    expect(signedPressureText(-12, "mmHg")).toBe("−12");
    expect(signedPressureText(-0.4, "mmHg")).toBe("0"); // rounds to zero: no sign
    expect(signedPressureText(-15, "kPa")).toBe("−2.0"); // −1.9998
  });

  it("places the measured PaO2 against the shown range, both ends inclusive", () => {
    const range = { low: 80, high: 90 };
    expect(rangeVerdict({ measured: 80, range })).toBe("within");
    expect(rangeVerdict({ measured: 90, range })).toBe("within");
    expect(rangeVerdict({ measured: 79.9, range })).toBe("below");
    expect(rangeVerdict({ measured: 90.1, range })).toBe("above");
  });

  it("words the coverage, the interval's state, a step and a device", () => {
    // 3 of 4 in range: 75.0 %; change 2 (95 against 100–120) below.
    expect(coverageText(patientFixture().summary.coverage)).toBe(
      "3 of 4 within the shown range (75.0 %); 1 below it, 0 above it.",
    );
    expect(coverageText(patientFixture(0).summary.coverage)).toBe("No checked forecast yet.");
    expect(intervalStateText(patientFixture(2).interval)).toBe(
      "2 of 3 checked forecasts needed before the range widens.",
    );
    expect(intervalStateText(patientFixture(3).interval)).toMatch(
      /^Active: .*from this patient's 3 checked forecasts\.$/,
    );
    expect(fio2StepText(0.4, 0.5)).toBe("0.40 → 0.50");
    expect(deviceLabel("hfnc")).toBe("High-flow nasal cannula");
    expect(deviceLabel("other")).toBe("other");
  });

  it("has a stored forecast once any change is paired or unchecked for a reason other than no forecast", () => {
    const none = { pairs: [], unchecked: [] };
    expect(hasStoredForecast(none)).toBe(false);
    const unchecked = patientFixture(0).unchecked;
    expect(hasStoredForecast({ pairs: [], unchecked })).toBe(true); // no_arterial_gas
    expect(
      hasStoredForecast({
        pairs: [],
        unchecked: unchecked.map((u) => ({ ...u, reason: "no_forecast" as const })),
      }),
    ).toBe(false);
  });
});

describe("forecast-accuracy report tables", () => {
  const report = reportFixture();

  it("tiles: changes, checked, coverage, the closest model and its median absolute error", () => {
    const tiles = Object.fromEntries(
      forecastTiles(report, "mmHg").map((t) => [t.key, `${t.value}${t.unit ? ` ${t.unit}` : ""}`]),
    );
    expect(tiles).toEqual({
      changes: "5",
      checked: "4",
      coverage: "75.0 %",
      closest: "Virtual shunt",
      // 5.5 mmHg shown whole
      closestError: "6 mmHg",
    });
    // 5.5 / 7.50062 = 0.733 kPa
    expect(forecastTiles(report, "kPa").find((t) => t.key === "closestError")?.value).toBe("0.7");
    expect(forecastTiles(report, "mmHg").every((t) => t.tone === "neutral")).toBe(true);
  });

  it("names every model at a tie, and shows a dash without pairs", () => {
    const tie = {
      ...report,
      summary: {
        ...report.summary,
        closest: { models: ["pf", "shunt"] as ("pf" | "shunt")[], medianAbsoluteError: 10 },
      },
    };
    expect(forecastTiles(tie, "mmHg").find((t) => t.key === "closest")?.value).toBe(
      "Constant P/F and Virtual shunt (tie)",
    );
    const empty = { ...report, summary: { ...report.summary, closest: null } };
    expect(forecastTiles(empty, "mmHg").find((t) => t.key === "closestError")?.value).toBe("–");
  });

  it("per model: pairs, median absolute error, bias and mean error in the reader's unit", () => {
    const mmHg = modelTable(report.summary, "mmHg");
    expect(mmHg.columns.map((c) => c.label)).toEqual([
      "Model",
      "Pairs",
      "Median absolute error (mmHg)",
      "Bias, median error (mmHg)",
      "Mean error (mmHg)",
    ]);
    // pf 11, 3, 4.75 → 5; a/A 6, −0.5 → 0 (not −0), 1; shunt 5.5 → 6, 4, −0.25 → 0
    expect(cells(mmHg, "pf")).toEqual(["Constant P/F", 4, 11, 3, 5]);
    expect(cells(mmHg, "alveolarArterialRatio")).toEqual(["Constant a/A ratio", 4, 6, 0, 1]);
    expect(Object.is(cells(mmHg, "alveolarArterialRatio")?.[3], 0)).toBe(true);
    expect(cells(mmHg, "shunt")).toEqual(["Virtual shunt", 4, 6, 4, 0]);
    // kPa: 11 / 7.50062 = 1.467 → 1.5; 3 → 0.4; 4.75 → 0.6
    const kPa = modelTable(report.summary, "kPa");
    expect(cells(kPa, "pf")).toEqual(["Constant P/F", 4, 1.5, 0.4, 0.6]);
    expect(kPa.columns[2]).toMatchObject({ label: "Median absolute error (kPa)", format: "dec1" });
  });

  it("by device and by FiO2 step: pairs, coverage, each model's error and bias, the closest model", () => {
    const byDevice = deviceTable(report, "mmHg");
    expect(byDevice.columns.map((c) => c.key)).toEqual([
      "group",
      "n",
      "coverage",
      "mae-pf",
      "mae-alveolarArterialRatio",
      "mae-shunt",
      "bias-pf",
      "bias-alveolarArterialRatio",
      "bias-shunt",
      "closest",
    ]);
    // hfnc (changes 1, 2): pf |e| 4, 25 → 14.5 → 15; a/A 1, 15 → 8; shunt 6, 5 → 5.5 → 6;
    //   bias pf (−4 + 25)/2 = 10.5 → 11; a/A (1 + 15)/2 = 8; shunt (6 + 5)/2 = 5.5 → 6; 1 of 2 in range.
    expect(cells(byDevice, "hfnc")).toEqual([
      "High-flow nasal cannula",
      2,
      50,
      15,
      8,
      6,
      11,
      8,
      6,
      "Virtual shunt",
    ]);
    // niv (changes 3, 4): pf |e| 12, 10 → 11; a/A 2, 10 → 6; shunt 3, 15 → 9; both in range.
    expect(cells(byDevice, "niv")?.slice(0, 6)).toEqual(["NIV / CPAP", 2, 100, 11, 6, 9]);
    expect(cells(byDevice, "niv")?.at(-1)).toBe("Constant a/A ratio");

    const bySteps = fio2StepTable(report, "mmHg");
    expect(bySteps.rows.map((r) => [r.cells[0], r.cells[1]])).toEqual([
      ["FiO2 step up to 0.05", 1],
      ["FiO2 step over 0.05, up to 0.15", 2],
      ["FiO2 step over 0.15", 1],
    ]);
    // An empty band keeps its row, with no values rather than zeros.
    const oneBand = fio2StepTable(
      { ...report, byFio2Step: summarizeByFio2Step(FIXTURE_PAIRS.slice(3)) },
      "mmHg",
    );
    expect(oneBand.rows[0]?.cells.slice(1)).toEqual([
      0,
      null,
      null,
      null,
      null,
      null,
      null,
      null,
      null,
    ]);
  });

  it("unchecked changes: counted by reason with its meaning, and listed with the case in words", () => {
    const reasons = reasonTable(report);
    expect(reasons.rows).toHaveLength(1);
    expect(reasons.rows[0]?.cells.slice(0, 2)).toEqual(["No arterial gas in the window", 1]);
    const list = uncheckedTable(report, "Europe/Oslo");
    // change 5 at 08:00 UTC + 480 min = 16:00 UTC, 17:00 in Oslo (UTC+1 in March)
    expect(list.rows[0]).toMatchObject({
      key: "5",
      patientId: 100,
      cells: [
        "Testcase, Iris",
        "M4",
        "2026-03-02 17:00",
        "0.50 → 0.55",
        "No arterial gas in the window",
        "No arterial gas was sampled after the change; the latest (gas 14) was sampled before it.",
      ],
    });
  });

  it("pairs: patient with a Chart link, bed, time on the unit's clock, step, measured and each forecast", () => {
    const table = pairsTable(report, "mmHg", "Europe/Oslo");
    expect(table.columns.map((c) => c.label)).toEqual([
      "Patient",
      "Bed",
      "Change applied",
      "FiO2",
      "Gas after (min)",
      "Measured PaO2 (mmHg)",
      "P/F forecast (mmHg)",
      "a/A forecast (mmHg)",
      "Shunt forecast (mmHg)",
      "Shown range (mmHg)",
      "Measured against the range",
      "Note",
    ]);
    expect(table.rows).toHaveLength(4);
    expect(table.rows[1]).toEqual({
      key: "2-12",
      patientId: 100,
      // change 2 at 10:00 UTC, 11:00 in Oslo; gas 60 min later
      cells: [
        "Testcase, Iris",
        "M4",
        "2026-03-02 11:00",
        "0.40 → 0.50",
        60,
        95,
        120,
        110,
        100,
        "100–120",
        "Below the range",
        null,
      ],
    });
    const kPa = pairsTable(report, "kPa", "Europe/Oslo");
    // 95 / 7.50062 = 12.67 → 12.7; range 100–120 → 13.3–16.0
    expect(kPa.rows[1]?.cells[5]).toBe(12.7);
    expect(kPa.rows[1]?.cells[9]).toBe("13.3–16.0");
  });

  it("writes a table as CSV under the report's name, unit and period", () => {
    const period = forecastReportPeriod(report, "Europe/Oslo");
    const table = pairsTable(report, "mmHg", "Europe/Oslo");
    const lines = tableToCsv(table, period, "Forecast accuracy").trim().split("\r\n");
    // One quoted field: the heading holds commas.
    expect(lines[0]).toBe(
      '"Forecast accuracy: Checked forecasts, MICU (Medical ICU), 2026-02-24 09:00 to 2026-03-03 09:00 (Europe/Oslo), generated 2026-03-03 09:00"',
    );
    expect(lines[1]).toBe(
      "Patient,Bed,Change applied,FiO2,Gas after (min),Measured PaO2 (mmHg),P/F forecast (mmHg),a/A forecast (mmHg),Shunt forecast (mmHg),Shown range (mmHg),Measured against the range,Note",
    );
    expect(lines[3]).toBe(
      '"Testcase, Iris",M4,2026-03-02 11:00,0.40 → 0.50,60,95,120,110,100,100–120,Below the range,',
    );
    expect(lines).toHaveLength(6);
    expect(csvFileName(table, period)).toBe("tidemark-forecast-accuracy-pairs-MICU-2026-02-24.csv");
  });

  it("calibration: one series per model in the reader's unit, both axes to a whole step above the largest value", () => {
    const { series, axisMax } = calibrationSeries(report.calibration, "mmHg");
    expect(series.map((s) => [s.model, s.points.length])).toEqual([
      ["pf", 4],
      ["alveolarArterialRatio", 4],
      ["shunt", 4],
    ]);
    expect(series[0]?.points[0]).toEqual({ measured: 84, predicted: 80, key: "1-11" });
    // largest value 150 mmHg → 150; in kPa 20.0 → 20
    expect(axisMax).toBe(150);
    expect(calibrationSeries(report.calibration, "kPa").axisMax).toBe(20);
    expect(calibrationSeries([], "mmHg")).toEqual({
      series: [
        { model: "pf", label: "Constant P/F", points: [] },
        { model: "alveolarArterialRatio", label: "Constant a/A ratio", points: [] },
        { model: "shunt", label: "Virtual shunt", points: [] },
      ],
      axisMax: 25,
    });
  });
});

describe("report cells", () => {
  it("show a negative value with a true minus, and one that rounds to zero without a sign", () => {
    expect(formatCell(-1.25, "dec1")).toBe("−1.3");
    expect(formatCell(-1200, "int")).toBe("−1,200");
    expect(formatCell(-0.04, "dec1")).toBe("0.0");
    expect(formatCell(-0.4, "int")).toBe("0");
    expect(formatCell(12.5, "pct")).toBe("12.5");
  });
});

describe("the Reports page's list", () => {
  it("offers forecast accuracy after the four grouped reports, which stay as they were", () => {
    expect(REPORT_KINDS).toEqual(["time-in-band", "alerts", "oxygen-exposure", "orders"]);
    expect(REPORT_PAGES).toEqual([...REPORT_KINDS, "forecast-accuracy"]);
    expect(REPORT_LABELS["forecast-accuracy"]).toBe("Forecast accuracy");
    expect(parseReportSearch({ report: "forecast-accuracy" }).report).toBe("forecast-accuracy");
  });
});
