"use client";

import { useId, useMemo, useState } from "react";
import { Caution } from "@/components/ui/Caution";
import { defaultProposedFio2Percent } from "@/lib/oxygenation/forecast-default";
import { IconWarning } from "@/components/ui/icons";
import {
  ASSUMED_HEMOGLOBIN,
  type BloodGasAssessment,
  type BloodGasInput,
  type Fio2Forecast,
  forecastBaseline,
  forecastFio2Change,
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
import { OxygenationCriteria } from "./OxygenationCriteria";
import { OxygenationIndices } from "./OxygenationIndices";

export interface OxygenationPanelProps {
  /** The engine's assessment of the blood gas (assessBloodGas). */
  assessment: BloodGasAssessment;
  /** What it was computed from, in the engine's units (mmHg, g/dL, fractions; SpO2 in %). */
  input: BloodGasInput;
  /** The user's preferred pressure unit; every pressure is shown in it. */
  pressureUnit: PressureUnit;
}

// The proposed FiO2 is typed in %: the range table's FiO2 range, in %.
const FIO2_PERCENT = { min: RANGES.fio2.min * 100, max: RANGES.fio2.max * 100 };

type ForecastOutcome =
  { ok: true; fio2: number; forecast: Fio2Forecast } | { ok: false; message: string };

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

  const baseline = useMemo(
    () =>
      forecastBaseline(
        { fio2: input.fio2, pao2: input.pao2, paco2: input.paco2, hemoglobin: input.hemoglobin },
        input.barometricPressure,
      ),
    [input.fio2, input.pao2, input.paco2, input.hemoglobin, input.barometricPressure],
  );
  const samples = useMemo(() => forecastSamples(baseline), [baseline]);
  // One step up for a hypoxaemic gas, one step down (weaning) otherwise.
  const opening = defaultProposedFio2Percent(input, FIO2_PERCENT).percent;
  const [proposedText, setProposedText] = useState(() => String(opening));

  const outcome = useMemo<ForecastOutcome>(() => {
    const percent = proposedText.trim() === "" ? Number.NaN : Number(proposedText);
    const { min, max } = FIO2_PERCENT;
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
      return {
        ok: false,
        message: describeInputError(error, { pressureUnit: unit, hemoglobinUnit: "g/dL" }).message,
      };
    }
  }, [baseline, proposedText, unit]);

  const sliderValue = outcome.ok ? Math.round(outcome.fio2 * 100) : opening;
  const forecast = outcome.ok ? outcome.forecast : null;
  const bases = outcome.ok
    ? forecastBasis({ ...baseline, nextFio2: outcome.fio2 }, outcome.forecast)
    : null;

  const curvePoints: CurvePoint[] = [];
  if (input.sao2 !== undefined) {
    curvePoints.push({
      label: "SaO2 measured",
      po2: input.pao2,
      saturation: input.sao2 * 100,
      kind: "measured",
    });
  }
  if (input.spo2 !== undefined) {
    curvePoints.push({ label: "SpO2", po2: input.pao2, saturation: input.spo2, kind: "oximetry" });
  }
  if (input.sao2 === undefined && input.spo2 === undefined) {
    curvePoints.push({
      label: "PaO2 on the curve",
      po2: input.pao2,
      saturation: 100 * saturationFromPO2(input.pao2),
      kind: "curve",
    });
  }
  if (forecast) {
    curvePoints.push(
      {
        label: "forecast low",
        po2: forecast.range.low.pao2,
        saturation: forecast.range.low.spo2,
        kind: "forecast",
      },
      {
        label: "forecast high",
        po2: forecast.range.high.pao2,
        saturation: forecast.range.high.spo2,
        kind: "forecast",
      },
    );
  }

  const caveats = [
    ...assessment.caveats,
    ...(input.hemoglobin === undefined
      ? [
          `No haemoglobin was given: the shunt model assumes ${ASSUMED_HEMOGLOBIN} g/dL and oxygen content is not shown.`,
        ]
      : []),
    ...(forecast?.caveats.filter((c) => c !== PEEP_NOT_FORECAST) ?? []),
  ];
  const uniqueCaveats = [...new Set(caveats)];

  return (
    <div className="space-y-5" data-testid="oxygenation-panel">
      {assessment.inconsistent ? (
        <p className="flex items-start gap-2 rounded-md border border-below/40 bg-below-soft px-3 py-2 text-sm text-below">
          <IconWarning className="mt-0.5 shrink-0" />
          <span>
            <strong>Inconsistent blood gas:</strong> the measured PaO2 is above the computed
            alveolar PO2. The A–a gradient and a/A ratio are not interpretable; see the caveats.
          </span>
        </p>
      ) : null}

      <OxygenationIndices id={id} indices={indices} pressureUnit={unit} />

      <OxygenationCriteria id={id} classification={classification} pressureUnit={unit} />

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
                  min={FIO2_PERCENT.min}
                  max={FIO2_PERCENT.max}
                  step={1}
                  value={proposedText}
                  onChange={(e) => setProposedText(e.target.value)}
                  aria-invalid={!outcome.ok}
                  aria-describedby={`${id}-proposed-note`}
                  className="tabular w-20 shrink-0 rounded-md border border-border-strong bg-surface px-2.5 py-1.5 text-base text-ink aria-[invalid=true]:border-below"
                />
                <input
                  type="range"
                  min={FIO2_PERCENT.min}
                  max={FIO2_PERCENT.max}
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

            <div
              role="status"
              aria-live="polite"
              className="rounded-md bg-accent-soft px-3 py-2"
              data-testid="forecast-range"
            >
              {outcome.ok ? (
                <>
                  <p className="tabular text-lg font-semibold">
                    PaO2 forecast {formatPressureNumber(outcome.forecast.range.low.pao2, unit)}–
                    {formatPressureNumber(outcome.forecast.range.high.pao2, unit)} {unit}
                  </p>
                  <p className="tabular text-sm">
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
                      <span className="tabular ml-auto">
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
                A PEEP change is not forecast numerically: only FiO2 is. After changing PEEP,
                re-measure (blood gas or SpO2) rather than rely on a number.
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
                <span aria-hidden className="inline-block h-3 w-5 rounded-sm bg-accent/15" /> range
                between models
              </span>
              <span className="inline-flex items-center gap-1">
                <svg viewBox="0 0 12 12" width="12" height="12" aria-hidden>
                  <circle
                    cx="6"
                    cy="6"
                    r="4.5"
                    className="fill-surface stroke-ink"
                    strokeWidth="2"
                  />
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
            forecastRange={
              forecast ? { low: forecast.range.low.pao2, high: forecast.range.high.pao2 } : null
            }
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
                <circle
                  cx="6"
                  cy="6"
                  r="4"
                  className="fill-surface stroke-accent"
                  strokeWidth="2"
                />
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
            Standard curve (37 °C, pH 7.40, P50 {formatPressureNumber(26.8, unit, 1)} {unit}):{" "}
            {SOURCES.severinghaus}.
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
            <p className="text-sm text-ink-muted">
              The engine raised no caveats for this blood gas.
            </p>
          )}
        </section>
      </div>
    </div>
  );
}
