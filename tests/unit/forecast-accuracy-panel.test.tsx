import { fireEvent, render, screen, within } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import { EmpiricalInterval } from "@/components/adjustments/EmpiricalInterval";
import {
  ForecastAccuracyPanel,
  RECENT_PAIRS,
} from "@/components/forecast-accuracy/ForecastAccuracyPanel";
import { ForecastAccuracyReportView } from "@/components/forecast-accuracy/ForecastAccuracyReportView";
import { pairView, uncheckedView } from "@/lib/forecast-accuracy/views";
import {
  FIXTURE_PAIRS,
  FIXTURE_UNCHECKED,
  patientFixture,
  reportFixture,
} from "../fixtures/forecast-accuracy";
import { forecast } from "./forecast-accuracy-fixture";

// Figures worked by hand in tests/fixtures/forecast-accuracy.ts; times are
// 08:00 UTC on 2026-03-02 plus the change's minutes, shown here on a UTC clock.

const cellTexts = (row: HTMLElement) =>
  within(row)
    .getAllByRole("cell")
    .map((c) => c.textContent);

describe("ForecastAccuracyPanel (the Chart)", () => {
  it("lists the checked forecasts newest first with each model's forecast and error, and the range they were shown", () => {
    render(<ForecastAccuracyPanel data={patientFixture()} pressureUnit="mmHg" timeZone="UTC" />);
    const panel = screen.getByRole("region", { name: "How the forecasts did" });
    const rows = within(panel).getAllByTestId(/^forecast-pair-/);
    expect(rows.map((r) => r.dataset.testid)).toEqual([
      "forecast-pair-4",
      "forecast-pair-3",
      "forecast-pair-2",
      "forecast-pair-1",
    ]);
    // Change 2 at 10:00: 0.40 → 0.50, gas 60 min later, 95 measured; 120/110/100 forecast,
    // errors +25/+15/+5; range 100–120, measured below it.
    const row = within(panel).getByTestId("forecast-pair-2");
    expect(within(row).getByRole("rowheader").textContent).toBe("02 Mar, 10:00");
    expect(cellTexts(row)).toEqual([
      "0.40 → 0.50",
      "60 min",
      "95",
      "120 (+25)",
      "110 (+15)",
      "100 (+5)",
      "100–120",
      "Below the range",
    ]);
    // Change 3: errors −12/−2/+3 with a true minus.
    expect(cellTexts(within(panel).getByTestId("forecast-pair-3")).slice(3, 6)).toEqual([
      "60 (−12)",
      "70 (−2)",
      "75 (+3)",
    ]);
  });

  it("gives each model's median absolute error and bias, the closest model, the coverage and the interval's state", () => {
    render(<ForecastAccuracyPanel data={patientFixture()} pressureUnit="mmHg" timeZone="UTC" />);
    const table = screen.getByTestId("forecast-model-summary");
    const row = (name: string) => within(table).getByRole("row", { name: new RegExp(`^${name}`) });
    // pf: 4 pairs, |e| median 11, bias 3, mean 4.75 → 5; a/A bias −0.5 shows as 0; shunt mean −0.25 → 0.
    expect(cellTexts(row("Constant P/F"))).toEqual(["4", "11", "+3", "+5"]);
    expect(cellTexts(row("Constant a/A ratio"))).toEqual(["4", "6", "0", "+1"]);
    expect(cellTexts(row("Virtual shunt"))).toEqual(["4", "6", "+4", "0"]);
    expect(screen.getByTestId("forecast-closest").textContent).toBe(
      "Virtual shunt: median absolute error 6 mmHg",
    );
    expect(screen.getByTestId("forecast-coverage").textContent).toBe(
      "3 of 4 within the shown range (75.0 %); 1 below it, 0 above it.",
    );
    expect(screen.getByTestId("forecast-interval-state").textContent).toMatch(
      /^Active: .*4 checked forecasts\.$/,
    );
    expect(screen.getByText(/Tidemark is decision support/)).toBeTruthy();
  });

  it("keeps the unchecked changes in a closed list with their count, reason and case", () => {
    render(<ForecastAccuracyPanel data={patientFixture()} pressureUnit="mmHg" timeZone="UTC" />);
    const list = screen.getByTestId("forecast-unchecked") as HTMLDetailsElement;
    expect(list.open).toBe(false);
    expect(within(list).getByText("Unchecked changes (1)").tagName).toBe("SUMMARY");
    // Change 5 at 16:00, 0.50 → 0.55.
    expect(list.textContent).toContain(
      "02 Mar, 16:00 · FiO2 0.50 → 0.55 · No arterial gas in the window",
    );
    expect(list.textContent).toContain("the latest (gas 14) was sampled before it");
  });

  it("puts the window and every definition with its source in the basis", () => {
    render(<ForecastAccuracyPanel data={patientFixture()} pressureUnit="mmHg" timeZone="UTC" />);
    const basis = screen.getByTestId("forecast-accuracy-basis");
    expect(within(basis).getByText("Basis").tagName).toBe("SUMMARY");
    expect(basis.textContent).toContain("Window: an arterial gas 20 to 240 min after the change");
    for (const b of patientFixture().basis) {
      expect(within(basis).getByText(b.label)).toBeTruthy();
    }
    expect(basis.textContent).toContain("Source: Karbing DS");
  });

  it("shows pressures in kPa for a reader who uses them", () => {
    render(<ForecastAccuracyPanel data={patientFixture()} pressureUnit="kPa" timeZone="UTC" />);
    // 95 → 12.7; 120 → 16.0 and +25 → +3.3; range 100–120 → 13.3–16.0.
    expect(cellTexts(screen.getByTestId("forecast-pair-2")).slice(2, 4)).toEqual([
      "12.7",
      "16.0 (+3.3)",
    ]);
    expect(screen.getByRole("columnheader", { name: "Measured PaO2 (kPa)" })).toBeTruthy();
    expect(screen.getByTestId("forecast-closest").textContent).toBe(
      "Virtual shunt: median absolute error 0.7 kPa",
    );
  });

  it("says how many checked forecasts the interval still needs", () => {
    render(<ForecastAccuracyPanel data={patientFixture(2)} pressureUnit="mmHg" timeZone="UTC" />);
    expect(screen.getByTestId("forecast-interval-state").textContent).toBe(
      "2 of 3 checked forecasts needed before the range widens.",
    );
  });

  it("shows the most recent pairs only, saying how many there are", () => {
    const data = patientFixture();
    const many = Array.from({ length: RECENT_PAIRS + 2 }, (_, i) => ({
      ...data.pairs[0]!,
      adjustmentId: 100 + i,
    }));
    render(
      <ForecastAccuracyPanel data={{ ...data, pairs: many }} pressureUnit="mmHg" timeZone="UTC" />,
    );
    expect(screen.getAllByTestId(/^forecast-pair-/)).toHaveLength(RECENT_PAIRS);
    expect(screen.getByText(/The 10 most recent of 12/)).toBeTruthy();
  });

  it("has an empty state when no change had a forecast stored, and still lists those changes", () => {
    const data = patientFixture(0);
    const noForecast = {
      ...data,
      unchecked: data.unchecked.map((u) => ({
        ...u,
        reason: "no_forecast" as const,
        label: "No forecast stored",
      })),
    };
    render(<ForecastAccuracyPanel data={noForecast} pressureUnit="mmHg" timeZone="UTC" />);
    expect(screen.getByText("No recorded FiO2 change with a forecast yet")).toBeTruthy();
    expect(screen.queryByTestId("forecast-model-summary")).toBeNull();
    expect(screen.getByText("Unchecked changes (1)")).toBeTruthy();

    render(
      <ForecastAccuracyPanel
        data={{ ...data, pairs: [], unchecked: [] }}
        pressureUnit="mmHg"
        timeZone="UTC"
      />,
    );
    expect(screen.getByText(/No settings change has been recorded in this stay/)).toBeTruthy();
  });
});

describe("EmpiricalInterval (the adjustment form)", () => {
  // The first three fixture pairs. Errors, forecast − measured:
  //   pf −4, +25, −12   a/A +1, +15, −2   shunt +6, +5, +3
  // New forecast pf 100, a/A 110, shunt 120 (shown 100–120). Each model P − max e … P − min e:
  //   pf 75 … 112   a/A 95 … 112   shunt 114 … 117   → with the shown range: 75 … 120.
  const three = FIXTURE_PAIRS.slice(0, 3).map(pairView);

  it("shows the empirical interval with its pairs, SpO2 and chance, and its basis", () => {
    render(
      <EmpiricalInterval forecast={forecast(100, 110, 120)} pairs={three} pressureUnit="mmHg" />,
    );
    const box = screen.getByTestId("empirical-interval");
    expect(within(box).getByText("Empirical interval (3 pairs)")).toBeTruthy();
    expect(box.textContent).toContain("PaO2 75–120 mmHg");
    expect(box.textContent).toMatch(/SpO2 \d+–\d+ % \(standard curve\)/);
    // (n − 1)/(n + 1) = 2/4
    expect(box.textContent).toContain("at least about 50 % of the time");
    fireEvent.click(within(box).getByRole("button", { name: "Basis of the empirical interval" }));
    expect(box.textContent).toContain("Constant P/F: largest past error = 25 mmHg");
    expect(box.textContent).toContain("Virtual shunt: smallest past error = 3 mmHg");
    expect(box.textContent).toContain("Once the patient has at least 3 checked forecasts");
  });

  it("in kPa", () => {
    render(
      <EmpiricalInterval forecast={forecast(100, 110, 120)} pairs={three} pressureUnit="kPa" />,
    );
    // 75 / 7.50062 = 10.0; 120 / 7.50062 = 16.0
    expect(screen.getByTestId("empirical-interval").textContent).toContain("PaO2 10.0–16.0 kPa");
  });

  it("with fewer than three pairs, says how many are still needed instead", () => {
    render(
      <EmpiricalInterval
        forecast={forecast(100, 110, 120)}
        pairs={three.slice(0, 2)}
        pressureUnit="mmHg"
      />,
    );
    expect(screen.queryByTestId("empirical-interval")).toBeNull();
    expect(screen.getByTestId("empirical-interval-pending").textContent).toBe(
      "Empirical interval: 2 of 3 checked forecasts needed before the range widens.",
    );
  });
});

describe("ForecastAccuracyReportView (Reports)", () => {
  it("shows the tiles, the calibration plot, every table with its CSV, the basis and the caution", () => {
    render(
      <ForecastAccuracyReportView
        report={reportFixture()}
        timeZone="Europe/Oslo"
        pressureUnit="mmHg"
      />,
    );
    expect(
      screen.getByRole("heading", { name: "Forecast accuracy — MICU (Medical ICU)" }),
    ).toBeTruthy();
    expect(screen.getByTestId("tile-closest").textContent).toBe("Closest modelVirtual shunt");
    expect(screen.getByTestId("tile-coverage").textContent).toBe(
      "Measured within the shown range75.0%",
    );
    expect(screen.getByTestId("calibration-chart").textContent).toContain(
      "Calibration: forecast against measured PaO2",
    );
    for (const id of [
      "forecast-accuracy-models",
      "forecast-accuracy-device",
      "forecast-accuracy-fio2-step",
      "forecast-accuracy-unchecked-reasons",
      "forecast-accuracy-pairs",
      "forecast-accuracy-unchecked",
    ]) {
      const table = screen.getByTestId(`table-${id}`);
      expect(within(table).getByRole("button", { name: /^Download CSV: / })).toBeTruthy();
    }
    const pairs = screen.getByTestId("table-forecast-accuracy-pairs");
    const links = within(pairs).getAllByRole("link", { name: "Testcase, Iris" });
    expect(links).toHaveLength(4);
    expect(links[0]?.getAttribute("href")).toBe("/patients/100");
    // A negative bias with a true minus: niv's pf bias (−12 + 10)/2 = −1.
    const device = screen.getByTestId("table-forecast-accuracy-device");
    expect(within(device).getByRole("row", { name: /^NIV \/ CPAP/ }).textContent).toContain("−1");
    expect(screen.getByTestId("report-basis").textContent).toContain("Calibration points");
    expect(screen.getByText(/Tidemark is decision support/)).toBeTruthy();
    // The print header, repeated on every sheet.
    expect(document.querySelector(".report-print-head")?.textContent).toBe(
      "Tidemark · Forecast accuracy · MICU (Medical ICU), 2026-02-24 09:00 to 2026-03-03 09:00 (Europe/Oslo)",
    );
  });

  it("says so when no change was recorded, and keeps the basis", () => {
    const report = reportFixture();
    render(
      <ForecastAccuracyReportView
        report={{
          ...report,
          counts: { changes: 0, checked: 0, unchecked: 0, byReason: [] },
          pairs: [],
          unchecked: [],
          calibration: [],
        }}
        timeZone="Europe/Oslo"
        pressureUnit="mmHg"
      />,
    );
    expect(screen.getByText("No recorded change to check")).toBeTruthy();
    expect(screen.queryByTestId("calibration-chart")).toBeNull();
    expect(screen.getByTestId("report-basis")).toBeTruthy();
  });
});

// Keep the fixture honest: the unchecked view is what the API sends.
it("the fixture's unchecked change is change 5, with no arterial gas after it", () => {
  expect(FIXTURE_UNCHECKED.map(uncheckedView).map((u) => [u.adjustmentId, u.reason])).toEqual([
    [5, "no_arterial_gas"],
  ]);
});
