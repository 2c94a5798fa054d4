import type { Metadata } from "next";
import { ImportWorkbench } from "@/components/imports/ImportWorkbench";
import { RecentImports } from "@/components/imports/RecentImports";
import { pagePermission } from "@/lib/auth/page-guard";
import { db } from "@/lib/db";
import { listImports } from "@/lib/imports/queries";
import { listUnits } from "@/lib/units/queries";

export const metadata: Metadata = { title: "Uploads" };

export default async function ImportsPage() {
  const actor = await pagePermission("import.upload");
  const [units, recent] = await Promise.all([
    listUnits(db(), actor.unitIds),
    listImports(db(), actor),
  ]);
  return (
    <div className="space-y-6">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight">Uploads</h1>
        <p className="max-w-prose text-sm text-ink-muted">
          Blood gas results from analysers (CSV or HL7 v2) and SpO2 series from bedside monitors.
          Every file is checked row by row first; nothing is imported until you confirm, and the
          report lists every row that was left out, with its reason.
        </p>
      </div>
      <ImportWorkbench units={units.map((u) => ({ id: u.id, label: `${u.code} · ${u.name}` }))} />
      <RecentImports imports={recent} />
    </div>
  );
}
