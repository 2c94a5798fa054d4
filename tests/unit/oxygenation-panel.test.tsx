import { fireEvent, render, screen, within } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import { OxygenationPanel } from "@/components/oxygenation/OxygenationPanel";
import { assessBloodGas, type BloodGasInput, forecastFio2Change, SOURCES } from "@/lib/oxygen";

// A ventilated patient at sea level (PB 760 mmHg, the engine's default):
// P/F = 80 / 0.4 = 200 mmHg (Horovitz 1974);
// PAO2 = 0.4 × (760 − 47) − 40 / 0.8 = 235.2 mmHg (simplified alveolar gas equation);
// A–a = 235.2 − 80 = 155.2 mmHg; a/A = 80 / 235.2 = 0.34 (Gilbert & Keighley 1974).
const input: BloodGasInput = {
  fio2: 0.4,
  pao2: 80,
  paco2: 40,
  hemoglobin: 12,
  spo2: 95,
  peep: 10,
  support: "invasive",
  respiratoryRate: 20,
  meanAirwayPressure: 15,
  ageYears: 60,
};
const assessment = assessBloodGas(input);

function card(label: string): HTMLElement {
  const item = screen.getByText(label, { selector: "p" }).closest("li");
  if (!item) throw new Error(`no card for ${label}`);
  return item;
}

describe("OxygenationPanel", () => {
  it("shows each index with its unit beside the value", () => {
    render(<OxygenationPanel assessment={assessment} input={input} pressureUnit="mmHg" />);
    expect(card("P/F ratio").textContent).toContain("200 mmHg");
    expect(card("Alveolar PO2 (PAO2)").textContent).toContain("235 mmHg");
    expect(card("A–a gradient").textContent).toContain("155 mmHg");
    expect(card("a/A ratio").textContent).toContain("0.34");
    // CaO2 = 1.34 × 12 × SaO2 + 0.003 × 80 with SaO2 from SpO2 0.95: 15.28 + 0.24 = 15.5 mL/dL.
    const content = card("Arterial O2 content (CaO2)");
    expect(content.textContent).toContain("15.5 mL/dL");
    expect(within(content).getByText("Dissolved").nextElementSibling?.textContent).toBe(
      "0.24 mL/dL",
    );
    expect(within(content).getByText("Bound : dissolved").nextElementSibling?.textContent).toBe(
      "64 : 1",
    );
    expect(card("ROX index")).toBeTruthy();
    // Berlin 2012: 100 < P/F 200 ≤ 200 with PEEP 10 cmH2O, intubated → moderate.
    expect(screen.getByTestId("berlin-category").textContent).toContain("Moderate");
    expect(screen.getByTestId("berlin-category").textContent).toContain("Decided by:");
  });

  it("shows which ratio classified the global category, and the other ratio's band", () => {
    render(<OxygenationPanel assessment={assessment} input={input} pressureUnit="mmHg" />);
    // Global definition 2023 (Matthay et al., AJRCCM 2024), intubated: P/F 80 / 0.4 = 200
    // (100 < 200 ≤ 200: moderate); S/F 95 / 0.4 = 237.5 (235 < 237.5 ≤ 315: mild).
    // The worse band, moderate by P/F, is reported.
    const global = screen.getByTestId("global-category");
    expect(global.textContent).toContain("Moderate");
    expect(within(global).getByTestId("global-classified-by").textContent).toBe(
      "Classified by: P/F ratio",
    );
    expect(global.textContent).toContain("S/F 238 would be mild");
  });

  it("shows S/F as the classifier when its band is the worse", () => {
    // FiO2 0.6: P/F 62 / 0.6 = 103.3 (moderate); S/F 88 / 0.6 = 146.7 (≤ 148: severe).
    const sfWorse: BloodGasInput = { ...input, fio2: 0.6, pao2: 62, spo2: 88 };
    render(
      <OxygenationPanel assessment={assessBloodGas(sfWorse)} input={sfWorse} pressureUnit="mmHg" />,
    );
    const global = screen.getByTestId("global-category");
    expect(global.textContent).toContain("Severe");
    expect(within(global).getByTestId("global-classified-by").textContent).toBe(
      "Classified by: S/F ratio",
    );
  });

  it("shows no classifier when the global definition cannot classify", () => {
    // Low-flow oxygen is outside the global definition's respiratory support.
    const lowFlow: BloodGasInput = { ...input, support: "conventional", peep: undefined };
    render(
      <OxygenationPanel assessment={assessBloodGas(lowFlow)} input={lowFlow} pressureUnit="mmHg" />,
    );
    const global = screen.getByTestId("global-category");
    expect(global.textContent).toContain("Not classifiable");
    expect(within(global).queryByTestId("global-classified-by")).toBeNull();
  });

  it("shows pressures in kPa for a kPa user", () => {
    render(<OxygenationPanel assessment={assessment} input={input} pressureUnit="kPa" />);
    // 200 mmHg / 7.50062 = 26.7 kPa (1 kPa = 7.50062 mmHg).
    expect(card("P/F ratio").textContent).toContain("26.7 kPa");
    expect(card("Alveolar PO2 (PAO2)").textContent).toContain("31.4 kPa");
  });

  it("opens the basis of an index from its button, showing formula, inputs and source", () => {
    render(<OxygenationPanel assessment={assessment} input={input} pressureUnit="mmHg" />);
    const button = screen.getByRole("button", { name: "Basis of P/F ratio" });
    expect(button.getAttribute("aria-expanded")).toBe("false");
    expect(screen.queryByText("P/F = PaO2 / FiO2")).toBeNull();
    fireEvent.click(button);
    expect(button.getAttribute("aria-expanded")).toBe("true");
    expect(screen.getByText("P/F = PaO2 / FiO2")).toBeTruthy();
    expect(screen.getByText(SOURCES.pfRatio)).toBeTruthy();
    expect(screen.getByText("PaO2 = 80 mmHg")).toBeTruthy();
  });

  it("shows the forecast as a range for the proposed FiO2 and updates it", () => {
    render(<OxygenationPanel assessment={assessment} input={input} pressureUnit="mmHg" />);
    const range = screen.getByTestId("forecast-range");
    // The default proposal is one 0.10 step below the measured FiO2.
    const at30 = forecastFio2Change({ ...input, hemoglobin: 12, nextFio2: 0.3 }).range;
    expect(range.textContent).toContain(
      `PaO2 forecast ${Math.round(at30.low.pao2)}–${Math.round(at30.high.pao2)} mmHg`,
    );
    expect(range.textContent).toMatch(/SpO2 forecast \d+–\d+ %/);

    fireEvent.change(screen.getByLabelText("Proposed FiO2 (%)"), { target: { value: "60" } });
    const at60 = forecastFio2Change({ ...input, hemoglobin: 12, nextFio2: 0.6 }).range;
    expect(range.textContent).toContain(
      `PaO2 forecast ${Math.round(at60.low.pao2)}–${Math.round(at60.high.pao2)} mmHg`,
    );
    expect(at60.high.pao2).toBeGreaterThan(at60.low.pao2);

    fireEvent.change(screen.getByLabelText("Proposed FiO2 (%)"), { target: { value: "15" } });
    expect(range.textContent).toBe("Proposed FiO2 must be between 21 and 100 %.");
  });

  it("carries the caution, says PEEP is not forecast, and lists the engine's caveats", () => {
    render(<OxygenationPanel assessment={assessment} input={input} pressureUnit="mmHg" />);
    expect(screen.getByRole("note").textContent).toMatch(/decision support/);
    expect(screen.getByText(/A PEEP change is not forecast numerically/)).toBeTruthy();
    // ROX without HFNC support: the engine's caveat is shown as given.
    expect(
      screen.getByText("The ROX index is validated on high-flow nasal oxygen only."),
    ).toBeTruthy();
  });

  it("gives both charts a title, a description and a table of the plotted values", () => {
    render(<OxygenationPanel assessment={assessment} input={input} pressureUnit="mmHg" />);
    const forecastChart = screen.getByRole("img", { name: /PaO2 forecast against FiO2/ });
    expect(forecastChart.querySelector("desc")?.textContent).toMatch(
      /At the proposed FiO2 0\.30 the models give PaO2 \d+–\d+ mmHg/,
    );
    expect(screen.getByRole("img", { name: /Oxyhaemoglobin dissociation curve/ })).toBeTruthy();
    const table = screen.getByRole("table", { name: "Forecast PaO2 (mmHg) by model at each FiO2" });
    expect(within(table).getByRole("columnheader", { name: "Shunt model" })).toBeTruthy();
    expect(within(table).getByRole("rowheader", { name: "0.40 (measured)" })).toBeTruthy();
    expect(screen.getByRole("table", { name: /Points on the dissociation curve/ })).toBeTruthy();
  });
});
