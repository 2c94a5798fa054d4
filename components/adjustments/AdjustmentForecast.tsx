"use client";

import { useMemo } from "react";
import { BasisDisclosure } from "@/components/oxygenation/BasisDisclosure";
import {
  ForecastChart,
  forecastSamples,
  MODELS,
  ModelSwatch,
} from "@/components/oxygenation/ForecastChart";
import { formatNumber, formatPressureNumber } from "@/components/oxygenation/format";
import { formatFio2Value, formatUnitTime } from "@/components/bedside/BedsideFormParts";
import { IconInfo, IconWarning } from "@/components/ui/icons";
import {
  betweenWords,
  type Fio2Forecast,
  forecastBaseline,
  forecastFio2Change,
  HEMOGLOBIN_ASSUMED_CAVEAT,
  OxygenInputError,
  PEEP_NOT_FORECAST,
  type PressureUnit,
  RANGES,
} from "@/lib/oxygen";
import { formatAge, gasAgeCaveat } from "@/lib/blood-gases/freshness";
import { forecastBasis } from "@/lib/oxygenation/forecast-basis";
import type { BedsideContext } from "@/lib/chart/bedside";
import type { ForecastPairView } from "@/lib/forecast-accuracy/views";
import { EmpiricalInterval } from "./EmpiricalInterval";

type Outcome =
  | { kind: "none"; message: string }
  | { kind: "refused"; message: string }
  | { kind: "ok"; fio2: number; forecast: Fio2Forecast };

/** The words shown when PEEP changes: only FiO2 is forecast. */
export const PEEP_CHANGE_NOTE =
  "PEEP changes are not forecast numerically: re-measure (blood gas or SpO2) after changing PEEP.";

/**
 * The forecast for the FiO2 being typed, computed here with the pure engine
 * from the latest arterial blood gas: the three models' range in words and on
 * the chart, each model's basis one click away, and the caveats. A gas older
 * than the site's limit is not used unless the clinician ticks the box; its
 * age is always said. With the patient's checked forecasts, the empirical
 * interval stands beside the range once there are enough of them.
 */
export function AdjustmentForecast({
  gas,
  useStaleGas,
  onUseStaleGasChange,
  barometricPressure,
  nextFio2,
  fio2Estimated,
  peepChanges,
  pressureUnit,
  timeZone,
  forecastPairs,
}: {
  gas: BedsideContext["latestArterialGas"];
  /** The clinician chose to forecast from a gas older than the limit. */
  useStaleGas: boolean;
  onUseStaleGasChange: (use: boolean) => void;
  barometricPressure: number;
  /** The FiO2 typed (or estimated from the typed flow); undefined when there is none yet. */
  nextFio2: number | undefined;
  fio2Estimated: boolean;
  peepChanges: boolean;
  pressureUnit: PressureUnit;
  timeZone: string;
  /** This stay's checked forecasts (pairs), oldest first; without them no interval is shown. */
  forecastPairs?: readonly ForecastPairView[];
}) {
  const unit = pressureUnit;
  const stale = gas !== null && !gas.freshness.fresh;
  const arterial = gas && (!stale || useStaleGas) ? gas : null;
  const baseline = useMemo(
    () =>
      arterial
        ? forecastBaseline({ ...arterial, hemoglobin: arterial.hb }, barometricPressure)
        : null,
    [arterial, barometricPressure],
  );
  const samples = useMemo(() => {
    if (!baseline) return [];
    try {
      return forecastSamples(baseline);
    } catch (error) {
      if (error instanceof OxygenInputError) return [];
      throw error;
    }
  }, [baseline]);

  const outcome = useMemo<Outcome>(() => {
    if (!baseline) {
      return {
        kind: "none",
        message: gas
          ? `The latest arterial blood gas is ${formatAge(gas.freshness.ageMinutes)} old, older than the ${formatAge(gas.freshness.maxAgeMinutes)} limit, so there is no numeric forecast. Take a new gas, or choose to forecast from this one below; until then re-measure SpO2 after the change.`
          : "No arterial blood gas on record, so there is no numeric forecast. Enter a blood gas to see one; until then re-measure SpO2 after the change.",
      };
    }
    if (nextFio2 === undefined || !Number.isFinite(nextFio2)) {
      return {
        kind: "none",
        message: `Type the new ${fio2Estimated ? "flow" : "FiO2"} to see the forecast.`,
      };
    }
    if (nextFio2 < RANGES.fio2.min || nextFio2 > RANGES.fio2.max) {
      return {
        kind: "refused",
        message: `FiO2 must be a fraction ${betweenWords(RANGES.fio2)} (0.40 for 40 %) to be forecast.`,
      };
    }
    try {
      return {
        kind: "ok",
        fio2: nextFio2,
        forecast: forecastFio2Change({ ...baseline, nextFio2 }),
      };
    } catch (error) {
      if (error instanceof OxygenInputError)
        return { kind: "refused", message: `No forecast: ${error.message}.` };
      throw error;
    }
  }, [baseline, gas, nextFio2, fio2Estimated]);

  const forecast = outcome.kind === "ok" ? outcome.forecast : null;
  const bases =
    outcome.kind === "ok" && baseline
      ? forecastBasis({ ...baseline, nextFio2: outcome.fio2 }, outcome.forecast)
      : null;
  const caveats = [
    ...(gas ? [gasAgeCaveat(gas.freshness, arterial !== null)] : []),
    ...(arterial && arterial.hb === null ? [HEMOGLOBIN_ASSUMED_CAVEAT] : []),
    ...(arterial?.fio2Estimated
      ? [
          "The blood gas was taken on an estimated FiO2 (low-flow device): every model inherits that uncertainty.",
        ]
      : []),
    ...(fio2Estimated ? ["The new FiO2 is itself an estimate from the flow."] : []),
    ...(forecast?.caveats.filter((c) => c !== PEEP_NOT_FORECAST) ?? []),
  ];

  return (
    <section
      aria-labelledby="forecast-heading"
      className="min-w-0 space-y-2"
      data-testid="adjustment-forecast"
    >
      <h2 id="forecast-heading" className="text-base font-semibold">
        Forecast for this change
      </h2>
      {arterial ? (
        <p className="text-xs text-ink-muted">
          From the arterial gas of {formatUnitTime(arterial.sampledAt, timeZone)}: PaO2{" "}
          <span className="tabular">
            {formatPressureNumber(arterial.pao2, unit)} {unit}
          </span>{" "}
          at FiO2 <span className="tabular">{formatFio2Value(arterial.fio2)}</span>.
        </p>
      ) : null}
      {stale ? (
        <label className="flex items-start gap-2 text-sm" data-testid="use-stale-gas">
          <input
            type="checkbox"
            className="mt-1"
            checked={useStaleGas}
            onChange={(event) => onUseStaleGasChange(event.target.checked)}
          />
          <span>
            Forecast from the gas of {formatUnitTime(gas.sampledAt, timeZone)} anyway (
            {formatAge(gas.freshness.ageMinutes)} old; the limit is{" "}
            {formatAge(gas.freshness.maxAgeMinutes)}). The choice is recorded with the change.
          </span>
        </label>
      ) : null}
      <div
        className={
          outcome.kind === "ok" && forecastPairs
            ? "grid items-start gap-2 sm:grid-cols-2"
            : "contents"
        }
      >
        <div
          role="status"
          aria-live="polite"
          className="rounded-md bg-accent-soft px-3 py-2"
          data-testid="forecast-range"
        >
          {outcome.kind === "ok" ? (
            <>
              <p className="tabular text-lg font-semibold">
                PaO2 forecast {formatPressureNumber(outcome.forecast.range.low.pao2, unit)}–
                {formatPressureNumber(outcome.forecast.range.high.pao2, unit)} {unit}
              </p>
              <p className="tabular text-sm">
                SpO2 forecast {formatNumber(outcome.forecast.range.low.spo2, 0)}–
                {formatNumber(outcome.forecast.range.high.spo2, 0)} % (standard curve) at FiO2{" "}
                {formatFio2Value(outcome.fio2)}
                {fio2Estimated ? " (estimate)" : ""}
              </p>
            </>
          ) : (
            <p
              className={`flex items-start gap-1.5 text-sm ${outcome.kind === "refused" ? "font-medium text-below" : "text-ink"}`}
            >
              <IconInfo className="mt-0.5 shrink-0" />
              {outcome.message}
            </p>
          )}
        </div>
        {outcome.kind === "ok" && forecastPairs ? (
          <EmpiricalInterval
            forecast={outcome.forecast}
            pairs={forecastPairs}
            pressureUnit={unit}
          />
        ) : null}
      </div>
      {peepChanges ? (
        <p
          className="flex items-start gap-2 rounded-md border border-overdue/40 bg-overdue-soft px-3 py-2 text-sm text-overdue"
          data-testid="peep-note"
        >
          <IconWarning className="mt-0.5 shrink-0" />
          <span>{PEEP_CHANGE_NOTE}</span>
        </p>
      ) : null}
      {forecast && bases ? (
        <>
          <BasisDisclosure basis={bases.range} pressureUnit={unit} className="mt-0" />
          <ul className="grid gap-1.5 sm:grid-cols-3" aria-label="Forecast by model">
            {MODELS.map((m) => (
              <li key={m.key} className="min-w-0 rounded-md border border-border p-2 text-xs">
                <div className="flex flex-wrap items-center gap-x-1.5">
                  <ModelSwatch model={m} />
                  <span className="font-medium">{m.label}</span>
                </div>
                <p className="tabular">
                  {formatPressureNumber(forecast.models[m.key].pao2, unit)} {unit} ·{" "}
                  {formatNumber(forecast.models[m.key].spo2, 0)} %
                </p>
                <BasisDisclosure basis={bases[m.key]} pressureUnit={unit} />
              </li>
            ))}
          </ul>
        </>
      ) : null}
      {arterial && samples.length > 0 ? (
        <ForecastChart
          samples={samples}
          measured={{ fio2: arterial.fio2, pao2: arterial.pao2 }}
          proposed={
            outcome.kind === "ok" ? { fio2: outcome.fio2, forecast: outcome.forecast } : null
          }
          pressureUnit={unit}
        />
      ) : null}
      {caveats.length > 0 ? (
        <ul
          className="list-disc space-y-0.5 pl-5 text-xs text-ink-muted"
          aria-label="Forecast caveats"
        >
          {[...new Set(caveats)].map((c) => (
            <li key={c}>{c}</li>
          ))}
        </ul>
      ) : null}
    </section>
  );
}
