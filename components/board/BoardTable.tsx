import Link from "next/link";
import { StatusBadge } from "@/components/ui/StatusBadge";
import type { BoardRow } from "@/lib/board/queries";

function hoursSince(iso: string, nowIso: string): string {
  const hours = Math.max(0, Math.round((Date.parse(nowIso) - Date.parse(iso)) / 3600_000));
  return hours < 48 ? `${hours} h` : `${Math.round(hours / 24)} d`;
}

/** One row per occupied bed; initials and age only — the Chart shows the full name. */
export function BoardTable({ rows, now, caption }: { rows: BoardRow[]; now: string; caption: string }) {
  return (
    <div className="overflow-x-auto rounded-card border border-border bg-surface shadow-card">
      <table className="w-full text-left text-sm">
        <caption className="sr-only">{caption}</caption>
        <thead className="border-b border-border bg-surface-muted text-xs uppercase tracking-wide text-ink-muted">
          <tr>
            <th scope="col" className="px-3 py-2">Bed</th>
            <th scope="col" className="px-3 py-2">Patient</th>
            <th scope="col" className="px-3 py-2">Admitted</th>
            <th scope="col" className="px-3 py-2">Oxygen order</th>
            <th scope="col" className="px-3 py-2">Nurse</th>
            <th scope="col" className="px-3 py-2">Therapist</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.bedId} className="border-b border-border last:border-0" data-testid="board-row">
              <th scope="row" className="px-3 py-2 font-semibold">{r.bedLabel}</th>
              <td className="px-3 py-2">
                <Link href={`/patients/${r.patientId}`} className="rounded font-medium text-accent hover:underline">
                  {r.patientInitials}{" "}
                  <span className="font-normal text-ink-muted">
                    · {r.patientAge} y · {r.sex === "female" ? "F" : "M"}
                  </span>
                  <span className="sr-only">, bed {r.bedLabel}: open the Chart</span>
                </Link>
              </td>
              <td className="px-3 py-2 tabular">{hoursSince(r.admittedAt, now)} ago</td>
              <td className="px-3 py-2">
                <StatusBadge status="neutral" label="No order yet" />
              </td>
              <td className="px-3 py-2">{r.nurse ?? <span className="text-ink-muted">Unassigned</span>}</td>
              <td className="px-3 py-2">{r.therapist ?? <span className="text-ink-muted">Unassigned</span>}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
