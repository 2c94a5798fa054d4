import { describe, expect, it } from "vitest";
import { ASSUMED_ARTERIOVENOUS_DIFFERENCE, forecastFio2Change } from "@/lib/oxygen";

// The shunt model of the FiO2 forecast, checked against one blood gas worked by hand.
//
// Shunt equation (Berggren, Acta Physiol Scand 1942;4 Suppl 11):
//   Qs/Qt = (Cc'O2 − CaO2) / (Cc'O2 − CvO2)
// with end-capillary PO2 taken as PAO2 and, as in the iso-shunt approach of
// Benatar, Hewlett & Nunn (Br J Anaesth 1973;45:711; recollection for details),
// an assumed arterio-venous O2 content difference CaO2 − CvO2 of 5 mL/dL, so that
//   Qs/Qt = (Cc'O2 − CaO2) / (Cc'O2 − CaO2 + 5).
// Alveolar gas equation, simplified (Fenn, Rahn & Otis, Am J Physiol 1946;146:637):
//   PAO2 = FiO2 × (PB − PH2O) − PaCO2 / R, PB 760, PH2O 47, R 0.8.
// Saturation (Severinghaus, J Appl Physiol 1979;46:599):
//   S = 1 / (23400 / (PO2³ + 150 × PO2) + 1).
// Content (textbook convention): C = 1.34 × Hb × S + 0.003 × PO2 mL/dL.
//
// The blood gas: FiO2 0.5, PaO2 80 mmHg, PaCO2 40 mmHg, Hb 12 g/dL. PaO2 is
// far below PAO2 (306.5 mmHg), so the case stays clear of the inconsistent
// PaO2 > PAO2 inputs.
//
//   PAO2   = 0.5 × (760 − 47) − 40 / 0.8 = 356.5 − 50 = 306.5 mmHg
//   Sc'    = 1 / (23400 / (306.5³ + 150 × 306.5) + 1)
//          = 1 / (23400 / (28 793 299.6 + 45 975) + 1) = 1 / 1.000 811 39 = 0.999 189
//   Cc'O2  = 1.34 × 12 × 0.999 189 + 0.003 × 306.5 = 16.066 96 + 0.919 50 = 16.986 46 mL/dL
//   SaO2   = 1 / (23400 / (80³ + 150 × 80) + 1) = 1 / (23400 / 524 000 + 1) = 0.957 252
//   CaO2   = 1.34 × 12 × 0.957 252 + 0.003 × 80 = 15.392 62 + 0.240 00 = 15.632 62 mL/dL
//   Cc'O2 − CaO2 = 1.353 84 mL/dL
//   Qs/Qt  = 1.353 84 / (1.353 84 + 5) = 1.353 84 / 6.353 84 = 0.2131
// (With a 4 or 6 mL/dL difference it would be 0.2529 or 0.1841: the tolerance
// below tells them apart.)
const BLOOD_GAS = { fio2: 0.5, pao2: 80, paco2: 40, hemoglobin: 12 } as const;
const HAND_SHUNT_FRACTION = 0.2131;

// At a new FiO2 the model keeps Qs/Qt and the 5 mL/dL difference and balances
//   CaO2' = (1 − Qs/Qt) × Cc'O2' + Qs/Qt × (CaO2' − 5),
// i.e. CaO2' × (1 − Qs/Qt) = (1 − Qs/Qt) × Cc'O2' − 5 × Qs/Qt, so
//   CaO2' = Cc'O2' − 5 × Qs/Qt / (1 − Qs/Qt) = Cc'O2' − (Cc'O2 − CaO2) = Cc'O2' − 1.353 84.
//
// FiO2 0.7:
//   PAO2'  = 0.7 × 713 − 50 = 499.1 − 50 = 449.1 mmHg
//   Sc'    = 1 / (23400 / (449.1³ + 150 × 449.1) + 1) = 1 / (23400 / 90 646 708 + 1) = 0.999 742
//   Cc'O2' = 16.08 × 0.999 742 + 0.003 × 449.1 = 16.075 85 + 1.347 30 = 17.423 15 mL/dL
//   CaO2'  = 17.423 15 − 1.353 84 = 16.069 31 mL/dL
//   PaO2' solves 16.08 × S(P) + 0.003 × P = 16.069 31:
//     P 104: S 0.979 895, C = 15.756 70 + 0.312 = 16.068 70 (below)
//     P 105: S 0.980 447, C = 15.765 60 + 0.315 = 16.080 60 (above)
//     linear between them: 104 + (16.069 31 − 16.068 70) / (16.080 60 − 16.068 70) = 104.05 mmHg
//   (constant P/F would give 80 / 0.5 × 0.7 = 112, constant a/A 80 / 306.5 × 449.1 = 117.2)
//
// FiO2 0.35:
//   PAO2'  = 0.35 × 713 − 50 = 249.55 − 50 = 199.55 mmHg
//   Sc'    = 0.997 075;  Cc'O2' = 16.08 × 0.997 075 + 0.598 65 = 16.631 61 mL/dL
//   CaO2'  = 16.631 61 − 1.353 84 = 15.277 77 mL/dL
//     P 69: S 0.935 405, C = 15.041 32 + 0.207 = 15.248 32 (below)
//     P 70: S 0.937 915, C = 15.081 67 + 0.210 = 15.291 67 (above)
//     linear: 69 + (15.277 77 − 15.248 32) / (15.291 67 − 15.248 32) = 69.68 mmHg
//   (constant P/F would give 56, constant a/A 52.1)

// The published equations, written out here independently of the engine.
const saturation = (po2: number) => 1 / (23400 / (po2 ** 3 + 150 * po2) + 1);
const content = (hb: number, po2: number) => 1.34 * hb * saturation(po2) + 0.003 * po2;
const alveolar = (fio2: number, paco2: number) => fio2 * (760 - 47) - paco2 / 0.8;

/** PO2 at which the content equation reaches `target`, by plain bisection on [0, high]. */
function po2ForContent(hb: number, target: number, high: number): number {
  let low = 0;
  for (let i = 0; i < 60; i++) {
    const middle = (low + high) / 2;
    if (content(hb, middle) < target) low = middle;
    else high = middle;
  }
  return (low + high) / 2;
}

describe("forecastFio2Change — the shunt model (Berggren 1942; Benatar, Hewlett, Nunn 1973)", () => {
  it("assumes a 5 mL/dL arterio-venous O2 content difference (Benatar, Hewlett, Nunn 1973; recollection)", () => {
    expect(ASSUMED_ARTERIOVENOUS_DIFFERENCE).toBe(5);
  });

  it("estimates the virtual shunt of FiO2 0.5, PaO2 80, PaCO2 40, Hb 12 as 0.2131 (± 0.0005)", () => {
    const forecast = forecastFio2Change({ ...BLOOD_GAS, nextFio2: 0.7 });
    // PAO2 306.5 mmHg, far above the measured 80 mmHg.
    expect(forecast.alveolarPO2.current).toBeCloseTo(306.5, 8);
    // toBeCloseTo(x, 3): |difference| < 0.0005
    expect(forecast.shuntFraction).toBeCloseTo(HAND_SHUNT_FRACTION, 3);
    // The shunt fraction is a property of the blood gas, not of the proposed FiO2.
    expect(forecastFio2Change({ ...BLOOD_GAS, nextFio2: 0.35 }).shuntFraction).toBeCloseTo(
      HAND_SHUNT_FRACTION,
      3,
    );
  });

  it.each([
    // next FiO2, PAO2' by hand, PaO2' by hand (interpolated, ± 0.05 mmHg)
    [0.7, 449.1, 104.05],
    [0.35, 199.55, 69.68],
  ] as const)(
    "at FiO2 %s (PAO2 %s mmHg) forecasts PaO2 %s mmHg by the shunt model (± 0.1 mmHg)",
    (nextFio2, handAlveolar, handPao2) => {
      const { models, alveolarPO2 } = forecastFio2Change({ ...BLOOD_GAS, nextFio2 });
      expect(alveolarPO2.next).toBeCloseTo(handAlveolar, 8);
      // toBeCloseTo(x, 1): |difference| < 0.05; the hand value is rounded to 0.01 and
      // linearly interpolated over 1 mmHg, so allow one more 0.05.
      expect(Math.abs(models.shunt.pao2 - handPao2)).toBeLessThan(0.1);

      // The same balance solved here, from the equations above, by bisection.
      const deficit = content(12, alveolar(0.5, 40)) - content(12, 80);
      const target = content(12, alveolar(nextFio2, 40)) - deficit;
      const solved = po2ForContent(12, target, alveolar(nextFio2, 40));
      expect(Math.abs(solved - handPao2)).toBeLessThan(0.1);
      expect(models.shunt.pao2).toBeCloseTo(solved, 6);
      // SpO2 of the forecast from the same curve.
      expect(models.shunt.spo2).toBeCloseTo(100 * saturation(solved), 6);
    },
  );

  it("keeps the shunt model apart from constant P/F and constant a/A in this case", () => {
    // FiO2 0.7: P/F 112, a/A 117.2, shunt 104.05; FiO2 0.35: P/F 56, a/A 52.1, shunt 69.68.
    const up = forecastFio2Change({ ...BLOOD_GAS, nextFio2: 0.7 }).models;
    expect(up.pf.pao2).toBeCloseTo(112, 8);
    expect(up.alveolarArterialRatio.pao2).toBeCloseTo(117.22, 2);
    expect(up.shunt.pao2).toBeLessThan(up.pf.pao2 - 7);
    const down = forecastFio2Change({ ...BLOOD_GAS, nextFio2: 0.35 }).models;
    expect(down.pf.pao2).toBeCloseTo(56, 8);
    expect(down.alveolarArterialRatio.pao2).toBeCloseTo(52.08, 2);
    expect(down.shunt.pao2).toBeGreaterThan(down.pf.pao2 + 13);
  });
});
