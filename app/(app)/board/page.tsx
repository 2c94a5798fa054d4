import type { Metadata } from "next";
import { cookies } from "next/headers";
import { BoardTable } from "@/components/board/BoardTable";
import { Caution } from "@/components/ui/Caution";
import { EmptyState } from "@/components/ui/EmptyState";
import { pageActor } from "@/lib/auth/page-guard";
import { listOccupiedBeds, summariseUnits } from "@/lib/board/queries";
import { db } from "@/lib/db";
import { resolveUnitChoice, UNIT_COOKIE } from "@/lib/preferences/unit";

export const metadata: Metadata = { title: "Board" };

export default async function BoardPage() {
  const actor = await pageActor();
  const { unitIds } = resolveUnitChoice((await cookies()).get(UNIT_COOKIE)?.value, actor.unitIds);
  const now = new Date();
  const [units, rows] = await Promise.all([
    summariseUnits(db(), unitIds),
    listOccupiedBeds(db(), unitIds, now),
  ]);

  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h1 className="text-2xl font-semibold tracking-tight">Board</h1>
        <p className="text-sm text-ink-muted">
          {units.map((u) => `${u.unitCode}: ${u.occupiedBeds} of ${u.totalBeds} beds occupied`).join(" · ")}
        </p>
      </div>
      {units.length === 0 ? (
        <EmptyState title="No units assigned to you">
          An administrator assigns units to each account. Until then there is nothing to show here.
        </EmptyState>
      ) : (
        units.map((unit) => {
          const unitRows = rows.filter((r) => r.unitId === unit.unitId);
          return (
            <section key={unit.unitId} aria-labelledby={`unit-${unit.unitId}`} className="space-y-2">
              <h2 id={`unit-${unit.unitId}`} className="text-lg font-semibold">
                {unit.unitName} <span className="font-normal text-ink-muted">({unit.unitCode})</span>
              </h2>
              {unitRows.length === 0 ? (
                <EmptyState title="No occupied beds">
                  Patients appear here when they are admitted to a bed on this unit.
                </EmptyState>
              ) : (
                <BoardTable rows={unitRows} now={now.toISOString()} caption={`Occupied beds, ${unit.unitName}`} />
              )}
            </section>
          );
        })
      )}
      <Caution compact />
    </div>
  );
}
