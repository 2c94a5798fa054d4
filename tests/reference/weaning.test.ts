import { describe, expect, it } from "vitest";
import {
  OxygenChoiceError,
  OxygenInputError,
  weaningScreen,
  type WeaningCriterionId,
  type WeaningScreenInput,
} from "@/lib/oxygen";

// Thresholds: FiO2 ≤ 0.5 (MacIntyre et al., Chest 2001: FiO2 ≤ 0.4–0.5 —
// recalled from memory); PEEP ≤ 8 cmH2O, P/F ≥ 150 mmHg, adequate cough,
// stable haemodynamics and no sedation or adequate mentation on it (Boles et
// al., Eur Respir J 2007, Table 5); f/VT < 105 breaths/min/L (Yang & Tobin,
// NEJM 1991).

const ready: Required<Omit<WeaningScreenInput, "pfImputed">> = {
  fio2: 0.4,
  peep: 5,
  pf: 220,
  respiratoryRate: 24, // 24 / 0.4 = 60 breaths/min/L
  tidalVolumeMl: 400,
  haemodynamicallyStable: true,
  sedationHeld: true,
  adequateCough: true,
};

const criterion = (input: WeaningScreenInput, id: WeaningCriterionId) => {
  const found = weaningScreen(input).criteria.find((c) => c.id === id);
  if (!found) throw new Error(`no criterion ${id}`);
  return found;
};

describe("weaningScreen — readiness for a spontaneous breathing trial", () => {
  it("passes when every criterion is recorded and met, naming each criterion's source", () => {
    const screen = weaningScreen(ready);
    expect(screen.overall).toMatchObject({
      pass: true,
      status: "pass",
      failed: [],
      notRecorded: [],
    });
    expect(screen.criteria.map((c) => c.id)).toEqual([
      "fio2",
      "peep",
      "pf",
      "rsbi",
      "haemodynamics",
      "sedation",
      "cough",
    ]);
    for (const c of screen.criteria) {
      expect(c.status).toBe("pass");
      expect(c.source.length).toBeGreaterThan(20);
    }
    expect(criterion(ready, "rsbi").source).toMatch(/Yang KL, Tobin MJ/);
    expect(criterion(ready, "peep").source).toMatch(/Boles/);
    expect(criterion(ready, "fio2").source).toMatch(/MacIntyre/);
    // RSBI 24 / 0.4 = 60
    expect(criterion(ready, "rsbi").value).toBeCloseTo(60, 10);
  });

  it.each([
    // id, passing edge, failing value
    ["fio2", { fio2: 0.5 }, { fio2: 0.51 }], // FiO2 ≤ 0.5 (MacIntyre 2001)
    ["peep", { peep: 8 }, { peep: 8.5 }], // PEEP ≤ 8 (Boles 2007)
    ["pf", { pf: 150 }, { pf: 149 }], // P/F ≥ 150 (Boles 2007)
    // 20 / 0.192 = 104.17 passes; 21 / 0.2 = 105 is not below 105 (Yang & Tobin 1991)
    [
      "rsbi",
      { respiratoryRate: 20, tidalVolumeMl: 192 },
      { respiratoryRate: 21, tidalVolumeMl: 200 },
    ],
  ] as const)("%s: passes on its edge and fails just past it", (id, edge, past) => {
    expect(criterion({ ...ready, ...edge }, id).status).toBe("pass");
    const failing = weaningScreen({ ...ready, ...past });
    expect(failing.criteria.find((c) => c.id === id)?.status).toBe("fail");
    expect(failing.overall).toMatchObject({ pass: false, status: "fail", failed: [id] });
  });

  it("fails on a clinician's no: haemodynamics, sedation or cough", () => {
    for (const [field, id] of [
      ["haemodynamicallyStable", "haemodynamics"],
      ["sedationHeld", "sedation"],
      ["adequateCough", "cough"],
    ] as const) {
      const screen = weaningScreen({ ...ready, [field]: false });
      expect(screen.overall.failed).toEqual([id]);
      expect(screen.overall.pass).toBe(false);
    }
  });

  it("never passes an item not recorded: it is 'not recorded', and the screen is incomplete, not passed", () => {
    const screen = weaningScreen({ ...ready, adequateCough: undefined, peep: null });
    expect(criterion({ ...ready, peep: null }, "peep")).toMatchObject({
      status: "not-recorded",
      pass: false,
      value: null,
      note: "not recorded",
    });
    expect(screen.overall).toMatchObject({
      pass: false,
      status: "incomplete",
      failed: [],
      notRecorded: ["peep", "cough"],
    });
    expect(screen.overall.summary).toMatch(/Not recorded: PEEP ≤ 8 cmH2O; Adequate cough/);
    expect(weaningScreen({}).overall.notRecorded).toHaveLength(7);
  });

  it("says 'fail' when one item fails and another is not recorded", () => {
    const screen = weaningScreen({ ...ready, fio2: 0.6, tidalVolumeMl: undefined });
    expect(screen.overall).toMatchObject({
      status: "fail",
      failed: ["fio2"],
      notRecorded: ["rsbi"],
    });
  });

  it("marks an imputed P/F as imputed, in the criterion and its label", () => {
    const imputed = criterion({ ...ready, pf: 180, pfImputed: true }, "pf");
    expect(imputed).toMatchObject({ status: "pass", imputed: true, value: 180 });
    expect(imputed.label).toMatch(/imputed from S\/F/);
    expect(imputed.source).toMatch(/Rice TW/);
    expect(criterion(ready, "pf").imputed).toBeUndefined();
  });

  it("refuses impossible values with the engine's typed errors (engine contract)", () => {
    expect(() => weaningScreen({ ...ready, fio2: 40 })).toThrow(OxygenInputError);
    expect(() => weaningScreen({ ...ready, peep: Number.NaN })).toThrow(OxygenInputError);
    expect(() => weaningScreen({ ...ready, pf: 5 })).toThrow(OxygenInputError);
    // A rate without a volume is still checked.
    expect(() =>
      weaningScreen({ ...ready, respiratoryRate: 200, tidalVolumeMl: undefined }),
    ).toThrow(OxygenInputError);
    expect(() => weaningScreen({ ...ready, adequateCough: "yes" as unknown as boolean })).toThrow(
      OxygenChoiceError,
    );
  });
});
