import { OxygenChoiceError } from "./errors";
import { checkRange, RANGES } from "./ranges";
import { SOURCES } from "./sources";
import { rapidShallowBreathingIndex, RSBI_THRESHOLD } from "./ventilation";

/** The screen's thresholds, each from the source its criterion names. */
export const WEANING_THRESHOLDS = Object.freeze({
  /** FiO2 at most (MacIntyre 2001: 0.4–0.5) */
  fio2: 0.5,
  /** PEEP at most, cmH2O (Boles 2007) */
  peep: 8,
  /** P/F at least, mmHg (Boles 2007) */
  pf: 150,
  /** RSBI below, breaths/min/L (Yang & Tobin 1991) */
  rsbi: RSBI_THRESHOLD,
});

export type WeaningCriterionId =
  "fio2" | "peep" | "pf" | "rsbi" | "haemodynamics" | "sedation" | "cough";

/** Not recorded is its own state: it never passes, and it is not a recorded failure either. */
export type WeaningCriterionStatus = "pass" | "fail" | "not-recorded";

export interface WeaningCriterion {
  id: WeaningCriterionId;
  label: string;
  status: WeaningCriterionStatus;
  /** true only when the criterion was recorded and met */
  pass: boolean;
  /** The value judged; null when not recorded. */
  value: number | boolean | null;
  /** The value's unit ("" for the clinician's yes/no items). */
  unit: string;
  threshold: string;
  source: string;
  /** P/F only: the value was imputed from S/F, not measured. */
  imputed?: boolean;
  /** Why it did not pass, in words; absent when it passed. */
  note?: string;
}

export interface WeaningScreen {
  criteria: WeaningCriterion[];
  overall: {
    /** true only when every criterion was recorded and met */
    pass: boolean;
    /** "incomplete": nothing recorded failed, but something was not recorded. */
    status: "pass" | "fail" | "incomplete";
    failed: WeaningCriterionId[];
    notRecorded: WeaningCriterionId[];
    summary: string;
  };
}

export interface WeaningScreenInput {
  fio2?: number | null;
  /** cmH2O */
  peep?: number | null;
  /** P/F ratio, mmHg: measured, or imputed from S/F (then say so with pfImputed) */
  pf?: number | null;
  pfImputed?: boolean;
  /** /min, unassisted breathing */
  respiratoryRate?: number | null;
  /** mL, unassisted breathing */
  tidalVolumeMl?: number | null;
  /** The clinician's judgement: no or minimal vasopressors, heart rate and blood pressure stable. */
  haemodynamicallyStable?: boolean | null;
  /** Sedation stopped, or adequate mentation on sedation. */
  sedationHeld?: boolean | null;
  adequateCough?: boolean | null;
}

const NOT_RECORDED = "not recorded";

function present<T>(value: T | null | undefined): value is T {
  return value !== undefined && value !== null;
}

function checkFlag(field: string, value: unknown): boolean | null {
  if (!present(value)) return null;
  if (typeof value !== "boolean")
    throw new OxygenChoiceError({ field, value, allowed: ["true", "false"] });
  return value;
}

type Base = Pick<WeaningCriterion, "id" | "label" | "unit" | "threshold" | "source">;

function judged(base: Base, value: number | boolean | null, met: boolean, failNote: string) {
  if (value === null)
    return { ...base, status: "not-recorded", pass: false, value, note: NOT_RECORDED } as const;
  return met
    ? ({ ...base, status: "pass", pass: true, value } as const)
    : ({ ...base, status: "fail", pass: false, value, note: failNote } as const);
}

/**
 * A daily screen of readiness for a spontaneous breathing trial: each
 * criterion with its value, threshold and source, and the overall answer.
 * FiO2 ≤ 0.5 (MacIntyre 2001), PEEP ≤ 8 cmH2O and P/F ≥ 150 mmHg (Boles
 * 2007), RSBI < 105 breaths/min/L (Yang & Tobin 1991), and the clinician's
 * judgement of haemodynamics, sedation and cough (Boles 2007). A criterion
 * not recorded is "not recorded", never passed; the screen passes only when
 * every criterion was recorded and met. Values given are range-checked like
 * every engine input. It screens; the clinician decides on a trial.
 */
export function weaningScreen(input: WeaningScreenInput): WeaningScreen {
  const { fio2, peep, pf, pfImputed, respiratoryRate, tidalVolumeMl } = input;
  if (present(fio2)) checkRange("fio2", fio2, RANGES.fio2);
  if (present(peep)) checkRange("peep", peep, RANGES.peep);
  if (present(pf)) checkRange("pf", pf, RANGES.pfRatio);
  const imputedFlag = checkFlag("pfImputed", pfImputed);
  const imputed = present(pf) && imputedFlag === true;
  // A rate without a volume (or the reverse) is still checked.
  if (present(respiratoryRate))
    checkRange("respiratoryRate", respiratoryRate, RANGES.respiratoryRate);
  if (present(tidalVolumeMl)) checkRange("tidalVolumeMl", tidalVolumeMl, RANGES.tidalVolumeMl);
  const rsbi =
    present(respiratoryRate) && present(tidalVolumeMl)
      ? rapidShallowBreathingIndex({ respiratoryRate, tidalVolumeMl })
      : null;
  const haemodynamics = checkFlag("haemodynamicallyStable", input.haemodynamicallyStable);
  const sedation = checkFlag("sedationHeld", input.sedationHeld);
  const cough = checkFlag("adequateCough", input.adequateCough);
  const t = WEANING_THRESHOLDS;
  const yes = (base: Omit<Base, "unit" | "threshold">, value: boolean | null, failNote: string) =>
    judged({ ...base, unit: "", threshold: "yes" }, value, value === true, failNote);

  const criteria: WeaningCriterion[] = [
    judged(
      {
        id: "fio2",
        label: `FiO2 ≤ ${t.fio2.toFixed(2)}`,
        unit: "fraction",
        threshold: `≤ ${t.fio2.toFixed(2)}`,
        source: SOURCES.weaningFio2,
      },
      fio2 ?? null,
      present(fio2) && fio2 <= t.fio2,
      `FiO2 ${fio2} is above ${t.fio2.toFixed(2)}`,
    ),
    judged(
      {
        id: "peep",
        label: `PEEP ≤ ${t.peep} cmH2O`,
        unit: "cmH2O",
        threshold: `≤ ${t.peep}`,
        source: SOURCES.weaningReadiness,
      },
      peep ?? null,
      present(peep) && peep <= t.peep,
      `PEEP ${peep} cmH2O is above ${t.peep} cmH2O`,
    ),
    {
      ...judged(
        {
          id: "pf",
          label: imputed ? `P/F ≥ ${t.pf} mmHg (imputed from S/F)` : `P/F ≥ ${t.pf} mmHg`,
          unit: "mmHg",
          threshold: `≥ ${t.pf}`,
          source: imputed
            ? `${SOURCES.weaningReadiness}; imputed P/F: ${SOURCES.linearPfImputation} or ${SOURCES.nonlinearPfImputation}`
            : SOURCES.weaningReadiness,
        },
        pf ?? null,
        present(pf) && pf >= t.pf,
        `P/F ${present(pf) ? Math.round(pf) : ""} mmHg${imputed ? " (imputed)" : ""} is below ${t.pf} mmHg`,
      ),
      ...(imputed ? { imputed: true } : {}),
    },
    judged(
      {
        id: "rsbi",
        label: `Rapid shallow breathing index < ${t.rsbi} breaths/min/L`,
        unit: "breaths/min/L",
        threshold: `< ${t.rsbi}`,
        source: SOURCES.rapidShallowBreathingIndex,
      },
      rsbi,
      rsbi !== null && rsbi < t.rsbi,
      `RSBI ${rsbi === null ? "" : Math.round(rsbi)} breaths/min/L is not below ${t.rsbi}`,
    ),
    yes(
      {
        id: "haemodynamics",
        label: "Haemodynamically stable (no or minimal vasopressors)",
        source: SOURCES.weaningReadiness,
      },
      haemodynamics,
      "not haemodynamically stable",
    ),
    yes(
      {
        id: "sedation",
        label: "Sedation held, or adequate mentation on sedation",
        source: SOURCES.weaningReadiness,
      },
      sedation,
      "sedation not held",
    ),
    yes(
      { id: "cough", label: "Adequate cough", source: SOURCES.weaningReadiness },
      cough,
      "cough not adequate",
    ),
  ];

  const failed = criteria.filter((c) => c.status === "fail").map((c) => c.id);
  const notRecorded = criteria.filter((c) => c.status === "not-recorded").map((c) => c.id);
  const status = failed.length > 0 ? "fail" : notRecorded.length > 0 ? "incomplete" : "pass";
  const label = (id: WeaningCriterionId) => criteria.find((c) => c.id === id)?.label ?? id;
  const summary =
    status === "pass"
      ? "Every criterion recorded and met: ready for a spontaneous breathing trial if the clinician agrees."
      : [
          failed.length > 0 ? `Not met: ${failed.map(label).join("; ")}.` : "",
          notRecorded.length > 0 ? `Not recorded: ${notRecorded.map(label).join("; ")}.` : "",
        ]
          .filter(Boolean)
          .join(" ");
  return { criteria, overall: { pass: status === "pass", status, failed, notRecorded, summary } };
}
