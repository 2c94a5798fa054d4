"use client";

import type {
  Basis,
  BerlinCategory,
  BloodGasAssessment,
  ClassificationResult,
  GlobalCategory,
  PressureUnit,
} from "@/lib/oxygen";
import { BasisDisclosure } from "./BasisDisclosure";

const BERLIN_WORDS: Record<BerlinCategory, string> = {
  none: "Outside the Berlin bands",
  mild: "Mild",
  moderate: "Moderate",
  severe: "Severe",
  "not-classifiable": "Not classifiable",
};

const GLOBAL_WORDS: Record<GlobalCategory, string> = {
  none: "Outside the oxygenation criterion",
  ards: "Within the criterion, non-intubated (no severity bands)",
  mild: "Mild",
  moderate: "Moderate",
  severe: "Severe",
  "not-classifiable": "Not classifiable",
};

/**
 * Which ratio set the global category. P/F and S/F are alternatives there; with
 * both, the worse band is reported and the criterion line names the other.
 */
const CLASSIFIED_BY_WORDS: Record<
  NonNullable<ClassificationResult<string>["classifiedBy"]>,
  string
> = {
  "P/F": "P/F ratio",
  "S/F": "S/F ratio",
  both: "P/F and S/F ratios (same band)",
};

const CRITERION_VALUES: Record<string, { label: string; unit: string }> = {
  pfRatio: { label: "P/F", unit: "mmHg" },
  adjustedPfRatio: { label: "P/F × PB/760", unit: "mmHg" },
  sfRatio: { label: "S/F", unit: "ratio" },
  spo2: { label: "SpO2", unit: "%" },
  peep: { label: "PEEP/CPAP", unit: "cmH2O" },
  flow: { label: "Flow", unit: "L/min" },
  barometricPressure: { label: "PB", unit: "mmHg" },
};

function criterionBasis(
  name: string,
  formula: string,
  result: ClassificationResult<string>,
  note: string,
): Basis {
  return {
    name,
    formula,
    inputs: Object.fromEntries(
      Object.entries(result.values).map(([key, value]) => {
        const known = CRITERION_VALUES[key] ?? { label: key, unit: "" };
        return [known.label, { value, unit: known.unit }];
      }),
    ),
    source: result.source,
    assumptions: [note],
  };
}

/** The ARDS oxygenation criterion section: the Berlin and global categories, each with its basis. */
export function OxygenationCriteria({
  id,
  classification,
  pressureUnit,
}: {
  /** The panel's useId prefix, so the heading ids match the panel's. */
  id: string;
  classification: BloodGasAssessment["classification"];
  pressureUnit: PressureUnit;
}) {
  const unit = pressureUnit;
  return (
    <section aria-labelledby={`${id}-criteria`} className="space-y-2">
      <h3 id={`${id}-criteria`} className="text-base font-semibold">
        ARDS oxygenation criterion
      </h3>
      <ul className="grid grid-cols-1 items-start gap-3 md:grid-cols-2">
        <li
          className="rounded-card border border-border bg-surface p-3"
          data-testid="berlin-category"
        >
          <p className="text-xs font-medium tracking-wide text-ink-muted">Berlin definition 2012</p>
          <p className="text-lg font-semibold">{BERLIN_WORDS[classification.berlin.category]}</p>
          <p className="text-sm text-ink-muted">Decided by: {classification.berlin.criterion}</p>
          <BasisDisclosure
            pressureUnit={unit}
            basis={criterionBasis(
              "Berlin definition 2012",
              "P/F with PEEP/CPAP ≥ 5 cmH2O: mild 200–300, moderate 100–200, severe ≤ 100 mmHg (non-invasive CPAP for mild only); P/F × PB/760 above 1000 m",
              classification.berlin,
              classification.note,
            )}
          />
        </li>
        <li
          className="rounded-card border border-border bg-surface p-3"
          data-testid="global-category"
        >
          <p className="text-xs font-medium tracking-wide text-ink-muted">Global definition 2023</p>
          <p className="text-lg font-semibold">{GLOBAL_WORDS[classification.global.category]}</p>
          {classification.global.classifiedBy ? (
            <p className="text-sm font-medium" data-testid="global-classified-by">
              Classified by: {CLASSIFIED_BY_WORDS[classification.global.classifiedBy]}
            </p>
          ) : null}
          <p className="text-sm text-ink-muted">Decided by: {classification.global.criterion}</p>
          <BasisDisclosure
            pressureUnit={unit}
            basis={criterionBasis(
              "Global definition 2023",
              "HFNC ≥ 30 L/min, NIV/CPAP ≥ 5 cmH2O or intubated; P/F ≤ 300 mmHg, or S/F ≤ 315 with SpO2 ≤ 97 %; intubated bands P/F 300/200/100, S/F 315/235/148. With both ratios the worse band is reported (Tidemark's reading: the definition lists them as alternatives)",
              classification.global,
              classification.note,
            )}
          />
        </li>
      </ul>
      <p className="text-xs text-ink-muted">{classification.note}</p>
    </section>
  );
}
