import type { Metadata } from "next";
import Link from "next/link";
import { AssignmentGrid } from "@/components/assignments/AssignmentGrid";
import { ShiftTabs } from "@/components/assignments/ShiftTabs";
import { buttonClasses } from "@/components/ui/Button";
import { EmptyState } from "@/components/ui/EmptyState";
import { UnitChooser } from "@/components/units/UnitChooser";
import { getAssignmentGrid } from "@/lib/assignments/queries";
import { pagePermission } from "@/lib/auth/page-guard";
import { db } from "@/lib/db";
import { listUnits } from "@/lib/units/queries";

export const metadata: Metadata = { title: "Assignments" };

const when = (iso: string) =>
  new Date(iso).toLocaleString("en-GB", {
    weekday: "short",
    day: "numeric",
    month: "short",
    hour: "2-digit",
    minute: "2-digit",
    timeZone: "UTC",
    timeZoneName: "short",
  });

export default async function AssignmentsPage({
  searchParams,
}: {
  searchParams: Promise<{ unit?: string; shift?: string }>;
}) {
  const actor = await pagePermission("record.read");
  const params = await searchParams;
  const units = await listUnits(db(), actor.unitIds);
  const unit = units.find((u) => String(u.id) === params.unit) ?? units[0];
  const shift = params.shift === "next" ? "next" : "current";

  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <div>
          <h1 className="text-2xl font-semibold tracking-tight">Assignments</h1>
          <p className="text-sm text-ink-muted">
            Who looks after which bed, and the charge nurse, for the current and the next shift.
          </p>
        </div>
        <Link href="/assignments/mine" className={buttonClasses("secondary")}>
          My beds
        </Link>
      </div>
      {!unit ? (
        <EmptyState title="No unit to show">You are not assigned to any unit.</EmptyState>
      ) : (
        <>
          <div className="flex flex-wrap items-end gap-4">
            {units.length > 1 ? (
              <UnitChooser units={units} value={unit.id} action="/assignments" keep={{ shift }} />
            ) : (
              <p className="text-sm font-medium">
                {unit.code} · {unit.name}
              </p>
            )}
            <ShiftTabs unitId={unit.id} shift={shift} />
          </div>
          <Grid unitId={unit.id} shift={shift} actor={actor} />
        </>
      )}
    </div>
  );
}

async function Grid({
  unitId,
  shift,
  actor,
}: {
  unitId: number;
  shift: "current" | "next";
  actor: Awaited<ReturnType<typeof pagePermission>>;
}) {
  const grid = await getAssignmentGrid(db(), actor, { unitId, shift });
  return (
    <section aria-labelledby="shift-heading" className="space-y-3">
      <h2 id="shift-heading" className="text-lg font-semibold">
        {shift === "current" ? "Current shift" : "Next shift"}: {when(grid.shift.startsAt)} –{" "}
        {when(grid.shift.endsAt)}
      </h2>
      <AssignmentGrid key={`${grid.unit.id}:${grid.shift.startsAt}`} grid={grid} />
    </section>
  );
}
