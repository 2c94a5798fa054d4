import { Caution } from "@/components/ui/Caution";
import { EmptyState } from "@/components/ui/EmptyState";
import { FORECAST_MODELS, FORECAST_MODEL_LABELS } from "@/lib/forecast-accuracy/types";
import type { PatientForecastAccuracy } from "@/lib/forecast-accuracy/views";
import {
  coverageText,
  fio2StepText,
  hasStoredForecast,
  intervalStateText,
  pressureText,
  signedPressureText,
} from "@/lib/forecast-accuracy/words";
import type { PressureUnit } from "@/lib/oxygen/units";
import { formatUnitTime } from "@/lib/time/zone";
import { ForecastPairsTable } from "./ForecastPairsTable";

/** The panel shows this many pairs, newest first; the report lists them all. */
export const RECENT_PAIRS = 10;

const th = "py-1 pr-3 font-medium";
const dash = (mmHg: number | null, unit: PressureUnit, signed = false) =>
  mmHg === null ? "–" : signed ? signedPressureText(mmHg, unit) : pressureText(mmHg, unit);

/**
 * "How the forecasts did" on the Chart: each FiO2 change's stored PaO2
 * forecast against the arterial gas that checked it, each model's median
 * absolute error and bias for this patient, the closest model, how often the
 * measured PaO2 fell within the shown range, the changes that could not be
 * checked and why, and whether the adjustment form's range has widened to
 * this patient's own errors. Every figure's definition is in the basis.
 */
export function ForecastAccuracyPanel({
  data,
  pressureUnit: unit,
  timeZone,
}: {
  data: PatientForecastAccuracy;
  pressureUnit: PressureUnit;
  timeZone: string;
}) {
  const { pairs, unchecked, summary, interval, settings, basis } = data;
  const window = `${settings.minMinutes}–${settings.maxMinutes} min`;
  const closest = summary.closest;
  const shown = pairs.slice(0, RECENT_PAIRS);
  const changes = pairs.length + unchecked.length;
  return (
    <section
      aria-labelledby="forecast-accuracy-heading"
      className="min-w-0 space-y-3 rounded-card border border-border bg-surface p-4 shadow-card"
      data-testid="forecast-accuracy"
    >
      <div className="space-y-1">
        <h2 id="forecast-accuracy-heading" className="text-lg font-semibold">
          How the forecasts did
        </h2>
        <p className="text-sm text-ink-muted">
          Each recorded FiO2 change&apos;s PaO2 forecast, as stored with it, against the first
          arterial gas {window} after it. Error = forecast − measured, in {unit}.
        </p>
      </div>

      {!hasStoredForecast(data) ? (
        <EmptyState title="No recorded FiO2 change with a forecast yet">
          {changes === 0
            ? "No settings change has been recorded in this stay."
            : `${changes} change${changes === 1 ? "" : "s"} recorded without a forecast (see below).`}{" "}
          A forecast is stored with an FiO2 change made from a usable arterial gas; it is checked
          here once an arterial gas follows within {window}.
        </EmptyState>
      ) : (
        <>
          <dl
            className="grid gap-x-6 gap-y-1 text-sm sm:grid-cols-[auto_minmax(0,1fr)]"
            data-testid="forecast-accuracy-facts"
          >
            <dt className="text-ink-muted">Checked</dt>
            <dd>
              {pairs.length} of {changes} recorded change{changes === 1 ? "" : "s"}
            </dd>
            <dt className="text-ink-muted">Closest model</dt>
            <dd data-testid="forecast-closest">
              {closest
                ? `${closest.models.map((m) => FORECAST_MODEL_LABELS[m]).join(" and ")}${closest.models.length > 1 ? " (tie)" : ""}: median absolute error ${pressureText(closest.medianAbsoluteError, unit)} ${unit}`
                : "No checked forecast yet."}
            </dd>
            <dt className="text-ink-muted">Shown range</dt>
            <dd data-testid="forecast-coverage">{coverageText(summary.coverage)}</dd>
            <dt className="text-ink-muted">Empirical interval</dt>
            <dd data-testid="forecast-interval-state">{intervalStateText(interval)}</dd>
          </dl>

          {summary.n > 0 ? (
            <div className="overflow-x-auto">
              <table className="w-full max-w-2xl text-sm" data-testid="forecast-model-summary">
                <caption className="sr-only">Each model&apos;s errors for this patient</caption>
                <thead>
                  <tr className="text-left text-ink-muted">
                    <th scope="col" className={th}>
                      Model
                    </th>
                    <th scope="col" className={`${th} text-right`}>
                      Pairs
                    </th>
                    <th scope="col" className={`${th} text-right`}>
                      Median abs. error ({unit})
                    </th>
                    <th scope="col" className={`${th} text-right`}>
                      Bias, median ({unit})
                    </th>
                    <th scope="col" className={`${th} text-right`}>
                      Mean error ({unit})
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {FORECAST_MODELS.map((m) => {
                    const s = summary.models[m];
                    return (
                      <tr key={m} className="border-t border-border">
                        <th scope="row" className="py-1 pr-3 text-left font-normal">
                          {s.label}
                        </th>
                        <td className="tabular py-1 pr-3 text-right">{s.n}</td>
                        <td className="tabular py-1 pr-3 text-right">
                          {dash(s.medianAbsoluteError, unit)}
                        </td>
                        <td className="tabular py-1 pr-3 text-right">{dash(s.bias, unit, true)}</td>
                        <td className="tabular py-1 pr-3 text-right">
                          {dash(s.meanError, unit, true)}
                        </td>
                      </tr>
                    );
                  })}
                </tbody>
              </table>
            </div>
          ) : null}

          {pairs.length === 0 ? (
            <p className="text-sm text-ink-muted">
              No forecast has been checked yet: no arterial gas has followed a change within{" "}
              {window} without another change in between.
            </p>
          ) : (
            <ForecastPairsTable
              pairs={shown}
              total={pairs.length}
              unit={unit}
              timeZone={timeZone}
            />
          )}
        </>
      )}

      {unchecked.length > 0 ? (
        <details className="text-sm" data-testid="forecast-unchecked">
          <summary className="cursor-pointer font-medium">
            Unchecked changes ({unchecked.length})
          </summary>
          <ul className="mt-2 space-y-2">
            {unchecked.map((u) => (
              <li key={u.adjustmentId} className="rounded-md border border-border px-3 py-2">
                <p>
                  <span className="tabular">{formatUnitTime(u.appliedAt, timeZone)}</span> · FiO2{" "}
                  <span className="tabular">{fio2StepText(u.fromFio2, u.toFio2)}</span> ·{" "}
                  <span className="font-medium">{u.label}</span>
                </p>
                <p className="text-xs text-ink-muted">{u.detail}</p>
              </li>
            ))}
          </ul>
        </details>
      ) : null}

      <details className="text-sm text-ink-muted" data-testid="forecast-accuracy-basis">
        <summary className="cursor-pointer">Basis</summary>
        <p className="mt-2 break-words">
          Window: an arterial gas {settings.minMinutes} to {settings.maxMinutes} min after the
          change (the site&apos;s FORECAST_CHECK_MIN_MINUTES and FORECAST_CHECK_MAX_MINUTES).
          Forecasts are the ones stored with each change; gases and changes are this stay&apos;s.
          Times on the unit&apos;s clock.
        </p>
        <dl className="mt-2 space-y-2">
          {basis.map((b) => (
            <div key={b.key}>
              <dt className="font-semibold text-ink">{b.label}</dt>
              <dd>{b.definition}</dd>
              <dd className="text-xs">Source: {b.source}</dd>
            </div>
          ))}
        </dl>
      </details>
      <Caution compact />
    </section>
  );
}
