import type { Metadata } from "next";
import { StepTableForm } from "@/components/step-tables/StepTableForm";
import { pagePermission } from "@/lib/auth/page-guard";
import { db } from "@/lib/db";
import { listUnits } from "@/lib/units/queries";

export const metadata: Metadata = { title: "New step table" };

export default async function NewStepTablePage() {
  await pagePermission("step_table.manage");
  const units = await listUnits(db());
  return (
    <div className="max-w-4xl space-y-4">
      <h1 className="text-2xl font-semibold tracking-tight">New unit step table</h1>
      <StepTableForm units={units.map((u) => ({ id: u.id, label: `${u.code} · ${u.name}` }))} />
    </div>
  );
}
