import type { StayWindowSummary } from "@/lib/rollups/summary";

const pct = (part: number, whole: number) =>
  whole > 0 ? `${((100 * part) / whole).toFixed(1)} %` : "—";
const mins = (m: number) => (m >= 120 ? `${(m / 60).toFixed(1)} h` : `${Math.round(m)} min`);

/**
 * Time in band, hypoxaemia and oxygen given over the last 24 h and the stay,
 * from the rollups the services keep. Each figure's definition is in the
 * basis below the table.
 */
export function StaySummary({ windows }: { windows: StayWindowSummary[] }) {
  const rows: [string, (w: StayWindowSummary) => string][] = [
    ["In band", (w) => pct(w.inBandMinutes, w.windowMinutes)],
    ["Below the band", (w) => pct(w.belowMinutes, w.windowMinutes)],
    ["Above the band on oxygen", (w) => pct(w.aboveMinutes, w.windowMinutes)],
    ["Unknown", (w) => pct(w.unknownMinutes, w.windowMinutes)],
    ["SpO2 below 88 %", (w) => mins(w.below88Minutes)],
    ["SpO2 below 85 %", (w) => mins(w.below85Minutes)],
    ["Area below the band", (w) => `${Math.round(w.belowAreaPctMin)} %·min`],
    ["Lowest SpO2 held", (w) => (w.minSpo2 === null ? "—" : `${w.minSpo2} %`)],
    ["FiO2-hours above room air", (w) => w.fio2HoursAboveRoomAir.toFixed(2)],
    ["Hours at FiO2 ≥ 0.6", (w) => w.hoursAtFio2AtLeast60.toFixed(1)],
  ];
  return (
    <section
      aria-labelledby="stay-summary-heading"
      className="space-y-2 rounded-card border border-border bg-surface p-4 shadow-card"
      data-testid="stay-summary"
    >
      <h2 id="stay-summary-heading" className="text-lg font-semibold">
        Time in band and oxygen given
      </h2>
      <div className="overflow-x-auto">
        <table className="w-full max-w-2xl text-sm">
          <thead>
            <tr className="text-left text-ink-muted">
              <th scope="col" className="py-1 pr-4 font-medium">
                Measure
              </th>
              {windows.map((w) => (
                <th key={w.label} scope="col" className="py-1 pr-4 text-right font-medium">
                  {w.label}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {rows.map(([label, value]) => (
              <tr key={label} className="border-t border-border">
                <th scope="row" className="py-1 pr-4 text-left font-normal">
                  {label}
                </th>
                {windows.map((w) => (
                  <td key={w.label} className="tabular py-1 pr-4 text-right">
                    {value(w)}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <details className="text-sm text-ink-muted">
        <summary className="cursor-pointer">Basis</summary>
        <ul className="mt-2 list-disc space-y-1 pl-5">
          <li>
            A reading holds until the next one: a monitor sample for three sample intervals (at most
            5 min), a charted value for the order&apos;s reassessment interval (at most 4 h). Time
            nothing holds, or no order is in effect, is unknown.
          </li>
          <li>
            Below: SpO2 under the band of the order in effect. Above: over the band while on
            supplemental oxygen (FiO2 above 0.21 or any flow); above on room air counts as in band.
            Time in the prescribed SpO2 range is the measure trials of oxygen titration report (e.g.
            BMJ Open Respir Res 2021;8:e000843).
          </li>
          <li>
            Area below the band: the sum over time of (lower bound − SpO2), in %·min. Below 88 % and
            85 %: time the held SpO2 was under those values while an order was in effect.
          </li>
          <li>
            Oxygen given: the FiO2 applied (the order&apos;s starting settings, then each
            adjustment; a low-flow device&apos;s FiO2 estimated from its flow) over the time the
            SpO2 series is known. FiO2-hours above room air = ∫ (FiO2 − 0.21) dt. FiO2 ≥ 0.6 as the
            high-FiO2 mark is common practice.
          </li>
          <li>
            Windows end at the end of the minute in progress (the grain of the stored sums), or at
            discharge.
          </li>
        </ul>
      </details>
    </section>
  );
}
