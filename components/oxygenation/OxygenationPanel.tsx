"use client";

import { type ReactNode, useId, useMemo, useState } from "react";
import { Caution } from "@/components/ui/Caution";
import { IconWarning } from "@/components/ui/icons";
import {
  ASSUMED_HEMOGLOBIN,
  type Basis,
  type BerlinCategory,
  type BloodGasAssessment,
  type BloodGasInput,
  type ClassificationResult,
  type Fio2Forecast,
  forecastFio2Change,
  type GlobalCategory,
  type IndexValue,
  OxygenInputError,
  PEEP_NOT_FORECAST,
  type PressureUnit,
  RANGES,
  saturationFromPO2,
  SOURCES,
} from "@/lib/oxygen";
import { forecastBasis } from "@/lib/oxygenation/forecast-basis";
import { describeInputError } from "@/lib/oxygenation/messages";
import { BasisDisclosure } from "./BasisDisclosure";
import { type CurvePoint, DissociationChart } from "./DissociationChart";
import { ForecastChart, forecastSamples, Marker, MODELS, ModelSwatch } from "./ForecastChart";
import { formatFio2, formatNumber, formatPressureNumber } from "./format";

export interface OxygenationPanelProps {
  /** The engine's assessment of the blood gas (assessBloodGas). */
  assessment: BloodGasAssessment;
  /** What it was computed from, in the engine's units (mmHg, g/dL, fractions; SpO2 in %). */
  input: BloodGasInput;
  /** The user's preferred pressure unit; every pressure is shown in it. */
  pressureUnit: PressureUnit;
}

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
const CLASSIFIED_BY_WORDS: Record<NonNullable<ClassificationResult<string>["classifiedBy"]>, string> = {
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

// Weaning is the usual question: start one step of 0.10 below the measured FiO2.
function defaultProposalPercent(fio2: number): number {
  const percent = Math.round(fio2 * 100);
  return percent - 10 >= 21 ? percent - 10 : Math.min(100, percent + 10);
}

type ForecastOutcome =
  | { ok: true; fio2: number; forecast: Fio2Forecast }
  | { ok: false; message: string };

function IndexCard({
  label,
  value,
  unit,
  basis,
  pressureUnit,
  children,
  wide = false,
}: {
  label: string;
  value: string;
  unit: string;
  basis: Basis;
  pressureUnit: PressureUnit;
  children?: ReactNode;
  wide?: boolean;
}) {
  return (
    <li
      className={`rounded-card border border-border bg-surface p-3 ${wide ? "sm:col-span-2" : ""}`}
      data-testid="oxygenation-index"
    >
      <p className="text-xs font-medium uppercase tracking-wide text-ink-muted">{label}</p>
      <p className="mt-0.5 tabular">
        <span className="text-value">{value}</span> <span className="text-sm text-ink-muted">{unit}</span>
      </p>
      {children}
      <BasisDisclosure basis={basis} pressureUnit={pressureUnit} />
    </li>
  );
}

/**
 * The oxygenation panel of the Chart: the indices of one blood gas, each with
 * its basis; the Berlin and global ARDS oxygenation categories; a three-model
 * forecast for a proposed FiO2, drawn as a range (computed here with the pure
 * engine); the dissociation curve with the patient's points; and the caveats.
 */
export function OxygenationPanel({ assessment, input, pressureUnit }: OxygenationPanelProps) {
  const id = useId();
  const unit = pressureUnit;
  const { indices, classification } = assessment;
  const pressure = (v: IndexValue) => formatPressureNumber(v.value, unit);

  const baseline = useMemo(
    () => ({
      fio2: input.fio2,
      pao2: input.pao2,
      paco2: input.paco2,
      hemoglobin: input.hemoglobin ?? ASSUMED_HEMOGLOBIN,
      barometricPressure: input.barometricPressure,
    }),
    [input.fio2, input.pao2, input.paco2, input.hemoglobin, input.barometricPressure],
  );
  const samples = useMemo(() => forecastSamples(baseline), [baseline]);
  const [proposedText, setProposedText] = useState(() => String(defaultProposalPercent(input.fio2)));

  const outcome = useMemo<ForecastOutcome>(() => {
    const percent = proposedText.trim() === "" ? Number.NaN : Number(proposedText);
    const min = RANGES.fio2.min * 100;
    const max = RANGES.fio2.max * 100;
    if (!Number.isFinite(percent) || percent < min || percent > max) {
      return { ok: false, message: `Proposed FiO2 must be between ${min} and ${max} %.` };
    }
    const fio2 = percent / 100;
    try {
      return { ok: true, fio2, forecast: forecastFio2Change({ ...baseline, nextFio2: fio2 }) };
    } catch (error) {
      if (!(error instanceof OxygenInputError)) throw error;
      if (error.field === "nextFio2") {
        const reason = error.message.split(" — ")[1];
        return {
          ok: false,
          message: `Proposed FiO2 must be at least ${Math.ceil(error.min * 100)} %${reason ? `: ${reason}` : ""}.`,
        };
      }
      return { ok: false, message: describeInputError(error, { pressureUnit: unit, hemoglobinUnit: "g/dL" }).message };
    }
  }, [baseline, proposedText, unit]);

  const sliderValue = outcome.ok ? Math.round(outcome.fio2 * 100) : defaultProposalPercent(input.fio2);
  const forecast = outcome.ok ? outcome.forecast : null;
  const bases = outcome.ok ? forecastBasis({ ...baseline, nextFio2: outcome.fio2 }, outcome.forecast) : null;

  const curvePoints: CurvePoint[] = [];
  if (input.sao2 !== undefined) {
    curvePoints.push({ label: "SaO2 measured", po2: input.pao2, saturation: input.sao2 * 100, kind: "measured" });
  }
  if (input.spo2 !== undefined) {
    curvePoints.push({ label: "SpO2", po2: input.pao2, saturation: input.spo2, kind: "oximetry" });
  }
  if (input.sao2 === undefined && input.spo2 === undefined) {
    curvePoints.push({ label: "PaO2 on the curve", po2: input.pao2, saturation: 100 * saturationFromPO2(input.pao2), kind: "curve" });
  }
  if (forecast) {
    curvePoints.push(
      { label: "forecast low", po2: forecast.range.low.pao2, saturation: forecast.range.low.spo2, kind: "forecast" },
      { label: "forecast high", po2: forecast.range.high.pao2, saturation: forecast.range.high.spo2, kind: "forecast" },
    );
  }

  const caveats = [
    ...assessment.caveats,
    ...(input.hemoglobin === undefined
      ? [`No haemoglobin was given: the shunt model assumes ${ASSUMED_HEMOGLOBIN} g/dL and oxygen content is not shown.`]
      : []),
    ...(forecast?.caveats.filter((c) => c !== PEEP_NOT_FORECAST) ?? []),
  ];
  const uniqueCaveats = [...new Set(caveats)];

  const content = indices.oxygenContent;
  return (
    <div className="space-y-5" data-testid="oxygenation-panel">
      {assessment.inconsistent ? (
        <p className="flex items-start gap-2 rounded-md border border-below/40 bg-below-soft px-3 py-2 text-sm text-below">
          <IconWarning className="mt-0.5 shrink-0" />
          <span>
            <strong>Inconsistent blood gas:</strong> the measured PaO2 is above the computed alveolar PO2. The A–a
            gradient and a/A ratio are not interpretable; see the caveats.
          </span>
        </p>
      ) : null}

      <section aria-labelledby={`${id}-indices`} className="space-y-2">
        <h3 id={`${id}-indices`} className="text-base font-semibold">
          Indices
        </h3>
        <ul className="grid grid-cols-1 items-start gap-3 sm:grid-cols-2 lg:grid-cols-4">
          <IndexCard label="P/F ratio" value={pressure(indices.pfRatio)} unit={unit} basis={indices.pfRatio.basis} pressureUnit={unit} />
          {indices.sfRatio ? (
            <IndexCard
              label="S/F ratio"
              value={formatNumber(indices.sfRatio.value, 0)}
              unit="SpO2 % / FiO2"
              basis={indices.sfRatio.basis}
              pressureUnit={unit}
            />
          ) : null}
          <IndexCard
            label="Alveolar PO2 (PAO2)"
            value={pressure(indices.alveolarPO2)}
            unit={unit}
            basis={indices.alveolarPO2.basis}
            pressureUnit={unit}
          />
          <IndexCard
            label="A–a gradient"
            value={pressure(indices.alveolarArterialGradient)}
            unit={unit}
            basis={indices.alveolarArterialGradient.basis}
            pressureUnit={unit}
          >
            {indices.expectedAlveolarArterialGradient ? (
              <p className="text-xs text-ink-muted">
                Expected for age on room air ≈{" "}
                <span className="tabular">
                  {pressure(indices.expectedAlveolarArterialGradient)} {unit}
                </span>{" "}
                (age/4 + 4)
              </p>
            ) : null}
          </IndexCard>
          <IndexCard
            label="a/A ratio"
            value={formatNumber(indices.arterialAlveolarRatio.value, 2)}
            unit="PaO2 / PAO2"
            basis={indices.arterialAlveolarRatio.basis}
            pressureUnit={unit}
          />
          {content ? (
            <IndexCard
              label="Arterial O2 content (CaO2)"
              value={formatNumber(content.total.value, 1)}
              unit={content.total.unit}
              basis={content.total.basis}
              pressureUnit={unit}
            >
              <dl className="mt-1 grid grid-cols-[auto_auto] justify-start gap-x-3 text-xs tabular">
                <dt className="text-ink-muted">Bound to Hb</dt>
                <dd>
                  {formatNumber(content.bound.value, 1)} {content.bound.unit}
                </dd>
                <dt className="text-ink-muted">Dissolved</dt>
                <dd>
                  {formatNumber(content.dissolved.value, 2)} {content.dissolved.unit}
                </dd>
                <dt className="text-ink-muted">Bound : dissolved</dt>
                <dd>{formatNumber(content.boundToDissolvedRatio.value, 0)} : 1</dd>
              </dl>
            </IndexCard>
          ) : null}
          {[
            { label: "O2 delivery (DO2)", index: indices.oxygenDelivery, digits: 0 },
            { label: "Oxygenation index (OI)", index: indices.oxygenationIndex, digits: 1 },
            { label: "O2 saturation index (OSI)", index: indices.oxygenSaturationIndex, digits: 1 },
            { label: "ROX index", index: indices.roxIndex, digits: 2 },
          ].map(({ label, index, digits }) =>
            // Shown only when the inputs it needs were given.
            index ? (
              <IndexCard
                key={label}
                label={label}
                value={formatNumber(index.value, digits)}
                unit={index.unit}
                basis={index.basis}
                pressureUnit={unit}
              />
            ) : null,
          )}
        </ul>
      </section>

      <section aria-labelledby={`${id}-criteria`} className="space-y-2">
        <h3 id={`${id}-criteria`} className="text-base font-semibold">
          ARDS oxygenation criterion
        </h3>
        <ul className="grid grid-cols-1 items-start gap-3 md:grid-cols-2">
          <li className="rounded-card border border-border bg-surface p-3" data-testid="berlin-category">
            <p className="text-xs font-medium uppercase tracking-wide text-ink-muted">Berlin definition 2012</p>
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
          <li className="rounded-card border border-border bg-surface p-3" data-testid="global-category">
            <p className="text-xs font-medium uppercase tracking-wide text-ink-muted">Global definition 2023</p>
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

      <section aria-labelledby={`${id}-forecast`} className="space-y-2">
        <h3 id={`${id}-forecast`} className="text-base font-semibold">
          Forecast for a proposed FiO2
        </h3>
        <div className="grid grid-cols-1 gap-4 lg:grid-cols-[minmax(0,2fr)_minmax(0,3fr)]">
          <div className="space-y-3">
            <div className="flex flex-col gap-1">
              <label htmlFor={`${id}-proposed`} className="text-sm font-medium">
                Proposed FiO2 (%)
              </label>
              <div className="flex items-center gap-3">
                <input
                  id={`${id}-proposed`}
                  type="number"
                  inputMode="decimal"
                  min={21}
                  max={100}
                  step={1}
                  value={proposedText}
                  onChange={(e) => setProposedText(e.target.value)}
                  aria-invalid={!outcome.ok}
                  aria-describedby={`${id}-proposed-note`}
                  className="w-20 shrink-0 rounded-md border border-border-strong bg-surface px-2.5 py-1.5 text-base text-ink tabular aria-[invalid=true]:border-below"
                />
                <input
                  type="range"
                  min={21}
                  max={100}
                  step={1}
                  value={sliderValue}
                  onChange={(e) => setProposedText(e.target.value)}
                  aria-label="Proposed FiO2 (%), slider"
                  aria-valuetext={`${sliderValue} %`}
                  className="min-w-0 flex-1 accent-accent"
                />
              </div>
              <p id={`${id}-proposed-note`} className="text-xs text-ink-muted">
                Measured at FiO2 {formatFio2(input.fio2)} ({Math.round(input.fio2 * 100)} %).
              </p>
            </div>

            <div role="status" aria-live="polite" className="rounded-md bg-accent-soft px-3 py-2" data-testid="forecast-range">
              {outcome.ok ? (
                <>
                  <p className="text-lg font-semibold tabular">
                    PaO2 forecast {formatPressureNumber(outcome.forecast.range.low.pao2, unit)}–
                    {formatPressureNumber(outcome.forecast.range.high.pao2, unit)} {unit}
                  </p>
                  <p className="text-sm tabular">
                    SpO2 forecast {formatNumber(outcome.forecast.range.low.spo2, 0)}–
                    {formatNumber(outcome.forecast.range.high.spo2, 0)} % (standard curve) at FiO2{" "}
                    {formatFio2(outcome.fio2)}
                  </p>
                </>
              ) : (
                <p className="text-sm font-medium text-below">{outcome.message}</p>
              )}
            </div>

            {forecast && bases ? (
              <ul className="space-y-2" aria-label="Forecast by model">
                {MODELS.map((m) => (
                  <li key={m.key} className="rounded-md border border-border p-2 text-sm">
                    <div className="flex flex-wrap items-center gap-x-2">
                      <ModelSwatch model={m} />
                      <span className="font-medium">{m.label}</span>
                      <span className="ml-auto tabular">
                        {formatPressureNumber(forecast.models[m.key].pao2, unit)} {unit} ·{" "}
                        {formatNumber(forecast.models[m.key].spo2, 0)} %
                      </span>
                    </div>
                    <BasisDisclosure basis={bases[m.key]} pressureUnit={unit} />
                  </li>
                ))}
              </ul>
            ) : null}

            <p className="flex items-start gap-2 text-sm">
              <IconWarning className="mt-0.5 shrink-0 text-overdue" />
              <span>
                A PEEP change is not forecast numerically: only FiO2 is. After changing PEEP, re-measure (blood gas or
                SpO2) rather than rely on a number.
              </span>
            </p>
            <Caution compact />
          </div>

          <div className="space-y-1">
            <ForecastChart
              samples={samples}
              measured={{ fio2: input.fio2, pao2: input.pao2 }}
              proposed={outcome.ok ? { fio2: outcome.fio2, forecast: outcome.forecast } : null}
              pressureUnit={unit}
            />
            <p className="flex flex-wrap items-center gap-x-3 gap-y-1 text-xs text-ink-muted">
              {MODELS.map((m) => (
                <span key={m.key} className="inline-flex items-center gap-1">
                  <ModelSwatch model={m} /> {m.label}
                </span>
              ))}
              <span className="inline-flex items-center gap-1">
                <span aria-hidden className="inline-block h-3 w-5 rounded-sm bg-accent/15" /> range between models
              </span>
              <span className="inline-flex items-center gap-1">
                <svg viewBox="0 0 12 12" width="12" height="12" aria-hidden>
                  <circle cx="6" cy="6" r="4.5" className="fill-surface stroke-ink" strokeWidth="2" />
                </svg>
                measured
              </span>
            </p>
          </div>
        </div>
      </section>

      <div className="grid grid-cols-1 gap-4 lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <section aria-labelledby={`${id}-curve`} className="space-y-2">
          <h3 id={`${id}-curve`} className="text-base font-semibold">
            Oxyhaemoglobin dissociation curve
          </h3>
          <DissociationChart
            points={curvePoints}
            forecastRange={forecast ? { low: forecast.range.low.pao2, high: forecast.range.high.pao2 } : null}
            pressureUnit={unit}
          />
          <p className="flex flex-wrap items-center gap-x-3 gap-y-1 text-xs text-ink-muted">
            <span className="inline-flex items-center gap-1">
              <svg viewBox="0 0 12 12" width="12" height="12" aria-hidden>
                <Marker shape="circle" x={6} y={6} size={4.5} className="fill-accent" />
              </svg>
              measured
            </span>
            <span className="inline-flex items-center gap-1">
              <svg viewBox="0 0 12 12" width="12" height="12" aria-hidden>
                <circle cx="6" cy="6" r="4" className="fill-surface stroke-accent" strokeWidth="2" />
              </svg>
              SpO2 (pulse oximetry)
            </span>
            <span className="inline-flex items-center gap-1">
              <svg viewBox="0 0 12 12" width="12" height="12" aria-hidden>
                <polygon points="6,1 11,6 6,11 1,6" className="fill-accent" />
              </svg>
              forecast range at the proposed FiO2
            </span>
          </p>
          <p className="text-xs text-ink-muted">
            Standard curve (37 °C, pH 7.40, P50 {formatPressureNumber(26.8, unit, 1)} {unit}): {SOURCES.severinghaus}.
            {input.sao2 === undefined && input.spo2 === undefined
              ? ` Saturation at PaO2 ${formatPressureNumber(input.pao2, unit)} ${unit} read from the curve: ${formatNumber(100 * saturationFromPO2(input.pao2), 1)} %.`
              : ""}
          </p>
        </section>

        <section aria-labelledby={`${id}-caveats`} className="space-y-2">
          <h3 id={`${id}-caveats`} className="text-base font-semibold">
            Caveats
          </h3>
          {uniqueCaveats.length > 0 ? (
            <ul className="space-y-2" data-testid="oxygenation-caveats">
              {uniqueCaveats.map((c) => (
                <li key={c} className="flex items-start gap-2 text-sm">
                  <IconWarning className="mt-0.5 shrink-0 text-overdue" />
                  <span>{c}</span>
                </li>
              ))}
            </ul>
          ) : (
            <p className="text-sm text-ink-muted">The engine raised no caveats for this blood gas.</p>
          )}
        </section>
      </div>
    </div>
  );
}
