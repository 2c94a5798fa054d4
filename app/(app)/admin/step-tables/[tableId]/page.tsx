import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { z } from "zod";
import { StepTableActiveToggle, StepTableForm } from "@/components/step-tables/StepTableForm";
import { pagePermission } from "@/lib/auth/page-guard";
import { db } from "@/lib/db";
import { getStepTable } from "@/lib/step-tables/queries";
import { listUnits } from "@/lib/units/queries";

export const metadata: Metadata = { title: "Edit step table" };

const paramsSchema = z.object({ tableId: z.coerce.number().int().positive() });

export default async function EditStepTablePage({
  params,
}: {
  params: Promise<{ tableId: string }>;
}) {
  await pagePermission("step_table.manage");
  const parsed = paramsSchema.safeParse(await params);
  if (!parsed.success) notFound();
  const [table, units] = await Promise.all([
    getStepTable(db(), parsed.data.tableId),
    listUnits(db()),
  ]);
  if (!table || table.builtIn) notFound();
  return (
    <div className="max-w-4xl space-y-4">
      <h1 className="text-2xl font-semibold tracking-tight">{table.name}</h1>
      <StepTableForm
        table={table}
        units={units.map((u) => ({ id: u.id, label: `${u.code} · ${u.name}` }))}
      />
      <StepTableActiveToggle table={table} />
    </div>
  );
}
