import { describe, expect, it } from "vitest";
import {
  ASSUMED_ARTERIOVENOUS_DIFFERENCE,
  ASSUMED_HEMOGLOBIN,
  forecastBaseline,
  forecastFio2Change,
  InconsistentBloodGasError,
  PEEP_NOT_FORECAST,
} from "@/lib/oxygen";

// The published equations, written out independently of the engine.
const saturation = (po2: number) => 1 / (23400 / (po2 ** 3 + 150 * po2) + 1); // Severinghaus 1979
const content = (hb: number, po2: number) => 1.34 * hb * saturation(po2) + 0.003 * po2;
const alveolar = (fio2: number, paco2: number, pb = 760) => fio2 * (pb - 47) - paco2 / 0.8;

const base = { fio2: 0.5, pao2: 70, paco2: 40, hemoglobin: 12 };

describe("forecastFio2Change", () => {
  it("constant P/F scales PaO2 with FiO2", () => {
    const { models } = forecastFio2Change({ ...base, nextFio2: 0.6 });
    expect(models.pf.pao2).toBeCloseTo((70 / 0.5) * 0.6, 10);
    expect(models.pf.spo2).toBeCloseTo(100 * saturation(84), 10);
  });

  it("constant a/A keeps PaO2/PAO2 as measured", () => {
    const { models, alveolarPO2 } = forecastFio2Change({ ...base, nextFio2: 0.7 });
    expect(alveolarPO2.current).toBeCloseTo(alveolar(0.5, 40), 10);
    expect(alveolarPO2.next).toBeCloseTo(alveolar(0.7, 40), 10);
    expect(models.alveolarArterialRatio.pao2).toBeCloseTo(
      (70 / alveolar(0.5, 40)) * alveolar(0.7, 40),
      10,
    );
  });

  it("the shunt model satisfies the content balance at the new FiO2 with the same shunt and a–v difference", () => {
    const input = { ...base, nextFio2: 0.8, barometricPressure: 700 };
    const { models, shuntFraction } = forecastFio2Change(input);
    const endCapillary = content(12, alveolar(0.5, 40, 700));
    const arterial = content(12, 70);
    const venous = arterial - ASSUMED_ARTERIOVENOUS_DIFFERENCE;
    const shunt = (endCapillary - arterial) / (endCapillary - venous);
    expect(shuntFraction).toBeCloseTo(shunt, 10);

    const newArterial = content(12, models.shunt.pao2);
    const newEndCapillary = content(12, alveolar(0.8, 40, 700));
    const newVenous = newArterial - ASSUMED_ARTERIOVENOUS_DIFFERENCE;
    expect(newArterial).toBeCloseTo((1 - shunt) * newEndCapillary + shunt * newVenous, 9);
  });

  it("forecasts a smaller rise with the shunt model than with constant P/F in a high-shunt lung", () => {
    const { models } = forecastFio2Change({
      fio2: 0.6,
      pao2: 55,
      paco2: 45,
      hemoglobin: 10,
      nextFio2: 0.9,
    });
    expect(models.shunt.pao2).toBeLessThan(models.pf.pao2);
    expect(models.shunt.pao2).toBeGreaterThan(55);
  });

  it("returns the measured PaO2 from every model when FiO2 does not change", () => {
    const { models } = forecastFio2Change({ ...base, nextFio2: 0.5 });
    for (const model of Object.values(models)) expect(model.pao2).toBeCloseTo(70, 8);
  });

  it("spans the models with its range", () => {
    const { models, range } = forecastFio2Change({ ...base, nextFio2: 0.4 });
    const values = Object.values(models).map((model) => model.pao2);
    expect(range.low.pao2).toBe(Math.min(...values));
    expect(range.high.pao2).toBe(Math.max(...values));
    expect(range.low.spo2).toBe(Math.min(...Object.values(models).map((model) => model.spo2)));
  });

  it("caps constant P/F at PAO2 and says so", () => {
    // Weaning a near-normal lung: P/F 500 projects 105 mmHg at FiO2 0.21,
    // above the 99.7 mmHg the alveolar gas equation allows.
    const { models, alveolarPO2, caveats } = forecastFio2Change({
      fio2: 0.6,
      pao2: 300,
      paco2: 40,
      hemoglobin: 14,
      nextFio2: 0.21,
    });
    expect((300 / 0.6) * 0.21).toBeGreaterThan(alveolar(0.21, 40));
    expect(models.pf.pao2).toBeCloseTo(alveolar(0.21, 40), 10);
    expect(alveolarPO2.next).toBeCloseTo(alveolar(0.21, 40), 10);
    expect(caveats.some((caveat) => caveat.includes("capped"))).toBe(true);
  });

  it("withholds the forecast when the measured PaO2 is above PAO2, never clamping to it", () => {
    // PAO2 at FiO2 0.21 and PaCO2 40 is 0.21 × 713 − 40 / 0.8 = 99.7 mmHg (alveolar gas equation).
    const inputs = { fio2: 0.21, pao2: 120, paco2: 40, hemoglobin: 14, nextFio2: 0.3 };
    expect(() => forecastFio2Change(inputs)).toThrow(InconsistentBloodGasError);
    expect(() => forecastFio2Change(inputs)).toThrow(
      /PaO2 120 mmHg is above the alveolar PO2 100 mmHg/,
    );
    // A wean from a high-PaO2 gas is the case that once read "PAO2": also withheld.
    expect(() =>
      forecastFio2Change({ fio2: 0.4, pao2: 260, paco2: 40, hemoglobin: 12, nextFio2: 0.3 }),
    ).toThrow(InconsistentBloodGasError);
    // At PAO2 itself the inputs still agree (no a–A difference): a forecast is made.
    const atAlveolar = alveolar(0.21, 40);
    const forecast = forecastFio2Change({ ...inputs, pao2: atAlveolar });
    expect(forecast.models.alveolarArterialRatio.pao2).toBeCloseTo(alveolar(0.3, 40), 6);
  });

  it("always says that PEEP changes are not forecast", () => {
    expect(forecastFio2Change({ ...base, nextFio2: 0.6 }).caveats).toContain(PEEP_NOT_FORECAST);
  });

  it("warns when the forecast sits on the flat part of the curve", () => {
    const flat = forecastFio2Change({
      fio2: 0.4,
      pao2: 100,
      paco2: 40,
      hemoglobin: 12,
      nextFio2: 0.6,
    });
    expect(flat.caveats.some((caveat) => caveat.includes("flat part"))).toBe(true);
    const steep = forecastFio2Change({
      fio2: 0.4,
      pao2: 50,
      paco2: 40,
      hemoglobin: 12,
      nextFio2: 0.45,
    });
    expect(steep.caveats.some((caveat) => caveat.includes("flat part"))).toBe(false);
  });
});

describe("forecastBaseline", () => {
  it("starts from the gas at its own FiO2, with the unit's pressure and the assumed haemoglobin when none was measured", () => {
    const gas = { fio2: 0.45, pao2: 68, paco2: 44, hemoglobin: null, peep: 10 };
    expect(forecastBaseline(gas, 700)).toEqual({
      fio2: 0.45,
      pao2: 68,
      paco2: 44,
      hemoglobin: ASSUMED_HEMOGLOBIN,
      barometricPressure: 700,
    });
    expect(forecastBaseline({ ...gas, hemoglobin: 9.5 })).toEqual({
      fio2: 0.45,
      pao2: 68,
      paco2: 44,
      hemoglobin: 9.5,
    });
  });
});
