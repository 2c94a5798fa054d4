import type { Metadata } from "next";
import { Suspense } from "react";
import { isKnownTimeZone } from "@/lib/time/zone";
import { LedgerLoading, LedgerView } from "@/components/ledger/LedgerView";
import { pageActor } from "@/lib/auth/page-guard";
import { db } from "@/lib/db";
import { listUnits } from "@/lib/units/queries";
import { listUsers } from "@/lib/users/queries";
import { can } from "@/lib/auth/permissions";

export const metadata: Metadata = { title: "Ledger" };

/**
 * The Ledger: every write of the reader's units with actor, time, before/after
 * and rationale, filterable and shareable by address, with the chain check.
 * Any signed-in role reads it; rows come from /api/v1/ledger, scoped there.
 */
export default async function LedgerPage() {
  const actor = await pageActor();
  const [units, users] = await Promise.all([listUnits(db(), actor.unitIds), listUsers(db())]);
  // Those who oversee administration see its rows, so they may filter by anyone.
  const oversees = can(actor, "ledger.oversee");
  const actors = users
    .filter((u) => oversees || u.units.some((unit) => actor.unitIds.includes(unit.id)))
    .map((u) => ({ id: u.id, name: u.name, role: u.role, active: u.active }));
  const zones = [...new Set(units.map((u) => u.timeZone).filter(isKnownTimeZone))];
  // The period is typed in the units' zone when they share one; otherwise in UTC.
  const periodZone = zones.length === 1 ? zones[0]! : "UTC";

  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h1 className="text-2xl font-semibold tracking-tight">Ledger</h1>
        <p className="text-sm text-ink-muted">
          Every write of {units.length === 1 ? "your unit" : "your units"}
          {units.length ? ` (${units.map((u) => u.code).join(", ")})` : ""}, hash-chained and
          append-only.
        </p>
      </div>
      <Suspense fallback={<LedgerLoading />}>
        <LedgerView
          units={units.map((u) => ({
            id: u.id,
            code: u.code,
            timeZone: isKnownTimeZone(u.timeZone) ? u.timeZone : "UTC",
          }))}
          actors={actors}
          timeZone={periodZone}
        />
      </Suspense>
    </div>
  );
}
