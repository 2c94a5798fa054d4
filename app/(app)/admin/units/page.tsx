import type { Metadata } from "next";
import Link from "next/link";
import { UnitsTable } from "@/components/units/UnitsTable";
import { buttonClasses } from "@/components/ui/Button";
import { EmptyState } from "@/components/ui/EmptyState";
import { pagePermission } from "@/lib/auth/page-guard";
import { db } from "@/lib/db";
import { listUnitOverviews } from "@/lib/units/queries";

export const metadata: Metadata = { title: "Units and beds" };

export default async function UnitsPage() {
  const actor = await pagePermission("unit.manage");
  const units = await listUnitOverviews(db(), actor.unitIds);
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <div>
          <h1 className="text-2xl font-semibold tracking-tight">Units and beds</h1>
          <p className="text-sm text-ink-muted">
            The units you belong to: their shifts, the devices they allow, where unclaimed alerts
            go, and their beds. Every change is written to the ledger.
          </p>
        </div>
        <Link href="/admin/units/new" className={buttonClasses("primary")}>
          New unit
        </Link>
      </div>
      {units.length ? (
        <UnitsTable units={units} />
      ) : (
        <EmptyState title="You belong to no unit yet">
          Create a unit, or ask another administrator to add you to one.
        </EmptyState>
      )}
    </div>
  );
}
