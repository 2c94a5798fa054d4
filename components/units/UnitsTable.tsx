import Link from "next/link";
import { StatusBadge } from "@/components/ui/StatusBadge";
import { DEVICE_PROFILES } from "@/lib/devices";
import type { UnitOverview } from "@/lib/units/queries";

/** The units an admin belongs to, with their beds and how many are occupied. */
export function UnitsTable({ units }: { units: UnitOverview[] }) {
  return (
    <div className="overflow-x-auto rounded-card border border-border bg-surface shadow-card">
      <table className="w-full text-left text-sm" data-testid="units-table">
        <caption className="sr-only">Your units with their beds</caption>
        <thead className="border-b border-border bg-surface-muted text-xs tracking-wide text-ink-muted">
          <tr>
            <th scope="col" className="px-3 py-2">
              Unit
            </th>
            <th scope="col" className="px-3 py-2">
              Kind
            </th>
            <th scope="col" className="px-3 py-2 text-right">
              Beds
            </th>
            <th scope="col" className="px-3 py-2 text-right">
              Occupied
            </th>
            <th scope="col" className="px-3 py-2">
              Shifts
            </th>
            <th scope="col" className="px-3 py-2">
              Devices
            </th>
          </tr>
        </thead>
        <tbody>
          {units.map((u) => (
            <tr key={u.id} className="border-b border-border last:border-0">
              <td className="px-3 py-2">
                <Link
                  href={`/admin/units/${u.id}`}
                  className="font-medium text-accent underline-offset-2 hover:underline"
                >
                  {u.code} · {u.name}
                </Link>
                {u.active ? null : (
                  <span className="ml-2">
                    <StatusBadge status="neutral" label="Retired" />
                  </span>
                )}
              </td>
              <td className="px-3 py-2">{u.kind === "icu" ? "ICU" : "Ward"}</td>
              <td className="px-3 py-2 text-right tabular-nums">
                {u.beds}
                {u.retiredBeds ? (
                  <span className="text-ink-muted"> (+{u.retiredBeds} retired)</span>
                ) : null}
              </td>
              <td className="px-3 py-2 text-right tabular-nums">{u.occupiedBeds}</td>
              <td className="px-3 py-2 whitespace-nowrap">
                {u.shiftHours} h from {u.shiftStart} ({u.timeZone})
              </td>
              <td className="px-3 py-2 text-ink-muted">
                {u.allowedDevices.map((d) => DEVICE_PROFILES[d].label).join(", ")}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
