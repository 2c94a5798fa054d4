import { allUnknown, shareText } from "@/lib/time-in-band/share-text";
import Link from "next/link";
import { AlertCountBadge } from "@/components/alerts/AlertCountBadge";
import { Spo2Value } from "@/components/readings/Spo2Value";
import { StatusBadge } from "@/components/ui/StatusBadge";
import { IconSort } from "@/components/ui/icons";
import type { BoardRow } from "@/lib/board/queries";
import type { SortKey, SortState } from "./board-sort";
import { formatPfRatio, type PressureUnit } from "@/lib/oxygen";

const pct = shareText;

function minutesLabel(minutes: number): string {
  return minutes < 120 ? `${minutes} min` : `${Math.floor(minutes / 60)} h ${minutes % 60} min`;
}

function SortHeader({
  label,
  sortKey,
  sort,
  onSort,
  className = "",
}: {
  label: string;
  sortKey: SortKey;
  sort: SortState;
  onSort: (key: SortKey) => void;
  className?: string;
}) {
  const active = sort.key === sortKey;
  const direction = active ? sort.direction : "none";
  return (
    <th
      scope="col"
      aria-sort={active ? (sort.direction === "asc" ? "ascending" : "descending") : "none"}
      className={`px-2 py-1.5 ${className}`}
    >
      <button
        type="button"
        onClick={() => onSort(sortKey)}
        className="inline-flex items-center gap-0.5 rounded text-left font-semibold hover:text-ink"
      >
        {label}
        <IconSort direction={direction} className="shrink-0" aria-hidden="true" />
      </button>
    </th>
  );
}

/** The 24 h split as a thin bar with the in-band share in words beside it. */
function TimeInBandCell({ row }: { row: BoardRow }) {
  if (!row.order) return <span className="text-ink-muted">—</span>;
  const t = row.timeInBand24h;
  if (allUnknown(t)) {
    return (
      <span className="text-ink-muted" title="Nothing measured in the last 24 h">
        No data
      </span>
    );
  }
  const title = `Last 24 h: in band ${pct(t.inBand)}, below ${pct(t.below)}, above on O₂ ${pct(t.above)}, no data ${pct(t.unknown)}`;
  return (
    <span className="flex flex-wrap items-center gap-x-1.5" title={title}>
      <span
        className="flex h-2 w-12 overflow-hidden rounded-full bg-surface-muted"
        aria-hidden="true"
      >
        <span className="bg-below" style={{ width: pct(t.below).replace(" ", "") }} />
        <span className="bg-in-band" style={{ width: pct(t.inBand).replace(" ", "") }} />
        <span className="bg-above" style={{ width: pct(t.above).replace(" ", "") }} />
      </span>
      <span className="tabular">{pct(t.inBand)}</span>
      <span className="sr-only">{title}</span>
      {t.unknown >= 0.1 ? (
        <span className="block text-xs whitespace-nowrap text-ink-muted" aria-hidden="true">
          {pct(t.unknown)} no data
        </span>
      ) : null}
    </span>
  );
}

/**
 * One row per occupied bed; initials and age only — the Chart shows the full
 * name. Values carry their units; status is a word and an icon, not only colour.
 */
export function BoardTable({
  rows,
  caption,
  sort,
  onSort,
  pressureUnit,
}: {
  rows: BoardRow[];
  caption: string;
  sort: SortState;
  onSort: (key: SortKey) => void;
  pressureUnit: PressureUnit;
}) {
  const header = { sort, onSort };
  return (
    <div className="overflow-x-auto rounded-card border border-border bg-surface shadow-card">
      <table className="w-full text-left text-sm">
        <caption className="sr-only">{caption}</caption>
        <thead className="border-b border-border bg-surface-muted text-xs text-ink-muted">
          <tr>
            <SortHeader label="Bed" sortKey="bed" {...header} />
            <SortHeader label="Patient" sortKey="patient" {...header} />
            <SortHeader label="Device" sortKey="device" {...header} />
            <SortHeader label="FiO2" sortKey="fio2" {...header} />
            <th scope="col" className="px-2 py-1.5 font-semibold">
              PEEP / flow
            </th>
            <SortHeader label="SpO2" sortKey="spo2" {...header} />
            <SortHeader label="24 h in band" sortKey="timeInBand" {...header} />
            <SortHeader label="P/F" sortKey="pf" {...header} />
            <th scope="col" className="px-2 py-1.5 font-semibold">
              Alerts
            </th>
            <SortHeader label="Reassessed" sortKey="reassessed" {...header} />
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr
              key={r.bedId}
              className="border-b border-border align-top last:border-0"
              data-testid="board-row"
            >
              <th scope="row" className="px-2 py-1.5 font-semibold">
                {r.bedLabel}
              </th>
              <td className="px-2 py-1.5 whitespace-nowrap">
                <Link
                  href={`/patients/${r.patientId}`}
                  className="rounded font-medium text-accent hover:underline"
                >
                  {r.patientInitials}{" "}
                  <span className="font-normal text-ink-muted">
                    · {r.patientAge} y · {r.sex === "female" ? "F" : "M"}
                  </span>
                  <span className="sr-only">, bed {r.bedLabel}: open the Chart</span>
                </Link>
                {r.order?.status === "awaiting_cosign" ? (
                  <span className="mt-0.5 block whitespace-nowrap [&>span]:whitespace-nowrap">
                    <StatusBadge status="overdue" label="Awaiting co-sign" />
                  </span>
                ) : null}
                {r.order === null ? (
                  <span className="mt-0.5 block whitespace-nowrap [&>span]:whitespace-nowrap">
                    <StatusBadge status="neutral" label="No order" />
                  </span>
                ) : null}
                {r.orderUnread ? (
                  <span
                    className="mt-0.5 block whitespace-nowrap [&>span]:whitespace-nowrap"
                    data-testid="order-unread"
                  >
                    <StatusBadge status="escalated" label="New order not read by nurse" />
                  </span>
                ) : null}
              </td>
              <td className="px-2 py-1.5">
                {r.deviceLabel ?? <span className="text-ink-muted">—</span>}
              </td>
              <td className="tabular px-2 py-1.5 whitespace-nowrap">
                {r.fio2 === null ? (
                  <span className="text-ink-muted">—</span>
                ) : (
                  <>
                    {r.fio2Estimated ? (
                      <abbr title="estimated FiO2 (low-flow device)">≈</abbr>
                    ) : null}
                    {r.fio2.toFixed(2)}
                  </>
                )}
              </td>
              <td className="tabular px-2 py-1.5 whitespace-nowrap">
                {r.peepCmH2o !== null ? (
                  `${r.peepCmH2o} cmH₂O`
                ) : r.flowLMin !== null ? (
                  `${r.flowLMin} L/min`
                ) : (
                  <span className="text-ink-muted">—</span>
                )}
              </td>
              <td className="px-2 py-1.5">
                {r.latestSpo2 ? (
                  <span className="flex flex-col items-start gap-0.5">
                    <span className="tabular whitespace-nowrap">
                      <Spo2Value pct={r.latestSpo2.pct} className="font-semibold" />
                      {r.order ? (
                        <span className="text-xs text-ink-muted">
                          {" "}
                          / {r.order.lower}–{r.order.upper}
                        </span>
                      ) : null}
                    </span>
                    {r.spo2Status ? (
                      <span className="whitespace-nowrap [&>span]:whitespace-nowrap">
                        <StatusBadge status={r.spo2Status} />
                      </span>
                    ) : null}
                  </span>
                ) : (
                  <span className="text-ink-muted">No reading</span>
                )}
              </td>
              <td className="px-2 py-1.5">
                <TimeInBandCell row={r} />
              </td>
              <td className="tabular px-2 py-1.5 whitespace-nowrap">
                {r.latestPf ? (
                  <>
                    {formatPfRatio(r.latestPf.ratio, pressureUnit)}
                    {r.latestPf.fio2Estimated ? (
                      <span className="block text-xs text-ink-muted">estimated FiO2</span>
                    ) : null}
                  </>
                ) : (
                  <span className="text-ink-muted">—</span>
                )}
              </td>
              <td className="px-2 py-1.5 whitespace-nowrap">
                <AlertCountBadge alerts={r.alerts} patientId={r.patientId} />
              </td>
              <td className="px-2 py-1.5 whitespace-nowrap">
                {r.minutesSinceReassessment === null ? (
                  <span className="text-ink-muted">—</span>
                ) : r.overdue ? (
                  <StatusBadge
                    status="overdue"
                    label={`${minutesLabel(r.minutesSinceReassessment)} · overdue`}
                  />
                ) : (
                  <span className="tabular">{minutesLabel(r.minutesSinceReassessment)} ago</span>
                )}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
