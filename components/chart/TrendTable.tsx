import { formatPressureNumber } from "@/components/oxygenation/format";
import { formatPfRatio, type PressureUnit } from "@/lib/oxygen/units";
import type { Trend } from "@/lib/chart/trend";
import { formatUnitTime } from "./chart-request";
import { fio2Text } from "./trend-details";

/** The text equivalent of the drawing: every plotted value, visually hidden. */
export function TrendTable({ trend, pressureUnit }: { trend: Trend; pressureUnit: PressureUnit }) {
  const rows: { at: string; what: string; value: string }[] = [
    ...trend.bands.map((b) => ({
      at: b.from,
      what: "Target band",
      value: `${b.lowerPct}–${b.upperPct} % until ${formatUnitTime(b.to, trend.timeZone)}`,
    })),
    ...trend.spo2.map((p) => ({ at: p.at, what: "SpO2", value: `${p.spo2Pct} %` })),
    ...trend.settings.map((s) => ({
      at: s.at,
      what:
        s.cause === "adjustment"
          ? "Adjustment"
          : s.cause === "order"
            ? "Order settings"
            : "Order discontinued",
      value:
        s.fio2 === null
          ? "—"
          : [
              `FiO2 ${fio2Text(s.fio2)}`,
              s.peepCmH2O === null ? null : `PEEP ${s.peepCmH2O} cmH2O`,
              s.flowLMin === null ? null : `flow ${s.flowLMin} L/min`,
            ]
              .filter(Boolean)
              .join(", "),
    })),
    ...trend.gases.map((g) => ({
      at: g.at,
      what: "Arterial gas",
      value: `PaO2 ${formatPressureNumber(g.pao2MmHg, pressureUnit)} ${pressureUnit}${g.pfRatio === null ? "" : `, P/F ${formatPfRatio(g.pfRatio, pressureUnit)}`}`,
    })),
  ].sort((a, b) => Date.parse(a.at) - Date.parse(b.at));
  // Hidden by a wrapper: a table is never narrower than its widest row, so a
  // hidden table itself can still widen the page on a phone.
  return (
    <div className="sr-only">
      <table data-testid="trend-table">
        <caption>
          Trend values, oldest first
          {trend.downsampled ? " (SpO2 thinned to the lowest and highest of each time slice)" : ""}
        </caption>
        <thead>
          <tr>
            <th scope="col">Time</th>
            <th scope="col">Measure</th>
            <th scope="col">Value</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r, i) => (
            <tr key={i}>
              <td>{formatUnitTime(r.at, trend.timeZone)}</td>
              <td>{r.what}</td>
              <td>{r.value}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
