import type { Metadata } from "next";
import { z } from "zod";
import { AdmitForm } from "@/components/admissions/AdmitForm";
import { pagePermission } from "@/lib/auth/page-guard";
import { db } from "@/lib/db";
import { listFreeBeds } from "@/lib/units/queries";

export const metadata: Metadata = { title: "Admit" };

const querySchema = z.object({ bed: z.coerce.number().int().positive().optional() });

/** Admit a patient into a free bed; `?bed=` preselects one (the Board's empty beds link here). */
export default async function AdmitPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const actor = await pagePermission("admission.manage");
  const query = querySchema.safeParse(await searchParams);
  const beds = await listFreeBeds(db(), actor.unitIds);
  return (
    <div className="max-w-3xl space-y-4">
      <div className="space-y-1">
        <h1 className="text-2xl font-semibold tracking-tight">Admit a patient</h1>
        <p className="text-sm text-ink-muted">
          A known MRN admits the stored patient again; a new MRN registers the patient. The
          admission is a ledger row.
        </p>
      </div>
      <AdmitForm
        beds={beds.map((b) => ({
          id: b.id,
          label: b.label,
          unitCode: b.unitCode,
          unitName: b.unitName,
          timeZone: b.timeZone,
        }))}
        bedId={query.success ? query.data.bed : undefined}
      />
    </div>
  );
}
