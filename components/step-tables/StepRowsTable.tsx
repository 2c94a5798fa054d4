import type { StepRowView } from "@/lib/step-tables/queries";

const range = (min: number | null, max: number | null, digits: number) =>
  min === null
    ? "—"
    : max === null || max === min
      ? min.toFixed(digits)
      : `${min.toFixed(digits)}–${max.toFixed(digits)}`;

/** A step table's rows, least to most support. */
export function StepRowsTable({
  rows,
  kind,
  caption,
}: {
  rows: StepRowView[];
  kind: "fio2_peep" | "flow_fio2";
  caption: string;
}) {
  return (
    <table className="w-full text-left text-sm">
      <caption className="sr-only">{caption}</caption>
      <thead className="text-xs tracking-wide text-ink-muted">
        <tr>
          <th scope="col" className="py-1 pr-3">
            Step
          </th>
          <th scope="col" className="py-1 pr-3">
            FiO2
          </th>
          <th scope="col" className="py-1 pr-3">
            {kind === "fio2_peep" ? "PEEP (cmH2O)" : "Flow (L/min)"}
          </th>
        </tr>
      </thead>
      <tbody>
        {rows.map((r, i) => (
          <tr key={i} className="border-t border-border">
            <td className="tabular py-1 pr-3">{i + 1}</td>
            <td className="tabular py-1 pr-3">{range(r.fio2Min, r.fio2Max, 2)}</td>
            <td className="tabular py-1 pr-3">
              {kind === "fio2_peep" ? range(r.peepMin, r.peepMax, 0) : range(r.flow, r.flow, 0)}
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
