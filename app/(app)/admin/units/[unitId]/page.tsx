import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { z } from "zod";
import { BedsTable } from "@/components/units/BedsTable";
import { UnitForm } from "@/components/units/UnitForm";
import { pagePermission } from "@/lib/auth/page-guard";
import { db } from "@/lib/db";
import { getUnit, listBeds } from "@/lib/units/queries";

export const metadata: Metadata = { title: "Unit settings" };

const paramsSchema = z.object({ unitId: z.coerce.number().int().positive() });

export default async function UnitPage({ params }: { params: Promise<{ unitId: string }> }) {
  const actor = await pagePermission("unit.manage");
  const parsed = paramsSchema.safeParse(await params);
  // Another unit's page answers as if it did not exist.
  if (!parsed.success || !actor.unitIds.includes(parsed.data.unitId)) notFound();
  const unitId = parsed.data.unitId;
  const [unit, beds] = await Promise.all([
    getUnit(db(), unitId),
    listBeds(db(), unitId, { includeRetired: true }),
  ]);
  if (!unit) notFound();
  return (
    <div className="max-w-4xl space-y-6">
      <div>
        <Link
          href="/admin/units"
          className="text-sm text-accent underline-offset-2 hover:underline"
        >
          ← Units and beds
        </Link>
        <h1 className="text-2xl font-semibold tracking-tight">
          {unit.code} · {unit.name}
        </h1>
      </div>
      <section aria-labelledby="beds-heading" className="space-y-2">
        <h2 id="beds-heading" className="text-lg font-semibold">
          Beds
        </h2>
        <BedsTable unitId={unit.id} unitCode={unit.code} beds={beds} />
      </section>
      <section aria-labelledby="settings-heading" className="space-y-2">
        <h2 id="settings-heading" className="text-lg font-semibold">
          Settings
        </h2>
        <UnitForm mode="edit" unit={unit} />
      </section>
    </div>
  );
}
