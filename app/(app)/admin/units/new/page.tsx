import type { Metadata } from "next";
import { UnitForm } from "@/components/units/UnitForm";
import { pagePermission } from "@/lib/auth/page-guard";

export const metadata: Metadata = { title: "New unit" };

export default async function NewUnitPage() {
  await pagePermission("unit.manage");
  return (
    <div className="max-w-3xl space-y-4">
      <h1 className="text-2xl font-semibold tracking-tight">New unit</h1>
      <p className="text-sm text-ink-muted">
        You become a member of the unit you create, so you can add its beds and staff.
      </p>
      <UnitForm mode="create" />
    </div>
  );
}
