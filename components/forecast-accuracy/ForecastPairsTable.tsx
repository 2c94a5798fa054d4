import { FORECAST_MODELS } from "@/lib/forecast-accuracy/types";
import type { ForecastPairView } from "@/lib/forecast-accuracy/views";
import {
  fio2StepText,
  MODEL_SHORT,
  pressureText,
  rangeVerdict,
  signedPressureText,
  VERDICT_WORDS,
} from "@/lib/forecast-accuracy/words";
import type { PressureUnit } from "@/lib/oxygen/units";
import { formatUnitTime } from "@/lib/time/zone";

const th = "px-2 py-1.5 font-semibold";
const td = "tabular px-2 py-1.5";

/**
 * The patient's latest checked forecasts, newest first: when, the FiO2 step,
 * the gas that checked it, the measured PaO2, each model's forecast with its
 * error, the range shown at the time and where the measured value fell. Its
 * own scroll box, so the page never scrolls sideways on a phone.
 */
export function ForecastPairsTable({
  pairs,
  total,
  unit,
  timeZone,
}: {
  pairs: ForecastPairView[];
  total: number;
  unit: PressureUnit;
  timeZone: string;
}) {
  return (
    <div className="space-y-1">
      <h3 className="text-base font-semibold" id="forecast-pairs-heading">
        Checked forecasts
      </h3>
      {total > pairs.length ? (
        <p className="text-xs text-ink-muted">
          The {pairs.length} most recent of {total}; the Forecast accuracy report lists them all.
        </p>
      ) : null}
      <div className="overflow-x-auto rounded-card border border-border">
        <table className="w-full text-sm" aria-labelledby="forecast-pairs-heading">
          <thead className="bg-surface-muted text-left text-xs text-ink-muted">
            <tr>
              <th scope="col" className={th}>
                Change
              </th>
              <th scope="col" className={th}>
                FiO2
              </th>
              <th scope="col" className={`${th} text-right`}>
                Gas after
              </th>
              <th scope="col" className={`${th} text-right`}>
                Measured PaO2 ({unit})
              </th>
              {FORECAST_MODELS.map((m) => (
                <th key={m} scope="col" className={`${th} text-right`}>
                  {MODEL_SHORT[m]} forecast (error)
                </th>
              ))}
              <th scope="col" className={`${th} text-right`}>
                Shown range
              </th>
              <th scope="col" className={th}>
                Measured
              </th>
            </tr>
          </thead>
          <tbody>
            {pairs.map((p) => (
              <tr
                key={`${p.adjustmentId}-${p.gasId}`}
                className="border-t border-border"
                data-testid={`forecast-pair-${p.adjustmentId}`}
              >
                <th scope="row" className={`${td} text-left font-medium whitespace-nowrap`}>
                  {formatUnitTime(p.appliedAt, timeZone)}
                </th>
                <td className={`${td} whitespace-nowrap`}>
                  {fio2StepText(p.fromFio2, p.toFio2)}
                  {p.peepChanged ? (
                    <span className="block text-xs text-ink-muted">PEEP changed too</span>
                  ) : null}
                </td>
                <td className={`${td} text-right whitespace-nowrap`}>
                  {Math.round(p.minutesAfter)} min
                </td>
                <td className={`${td} text-right font-semibold`}>
                  {pressureText(p.measured, unit)}
                </td>
                {FORECAST_MODELS.map((m) => (
                  <td key={m} className={`${td} text-right whitespace-nowrap`}>
                    {pressureText(p.models[m].predicted, unit)}{" "}
                    <span className="text-ink-muted">
                      ({signedPressureText(p.models[m].error, unit)})
                    </span>
                  </td>
                ))}
                <td className={`${td} text-right whitespace-nowrap`}>
                  {pressureText(p.range.low, unit)}–{pressureText(p.range.high, unit)}
                </td>
                <td className={`${td} whitespace-nowrap`}>{VERDICT_WORDS[rangeVerdict(p)]}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}
