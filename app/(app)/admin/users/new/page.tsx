import type { Metadata } from "next";
import { UserForm } from "@/components/users/UserForm";
import { pagePermission } from "@/lib/auth/page-guard";
import { db } from "@/lib/db";
import { listUnits } from "@/lib/units/queries";

export const metadata: Metadata = { title: "New user" };

export default async function NewUserPage() {
  await pagePermission("user.manage");
  const units = await listUnits(db());
  return (
    <div className="max-w-2xl space-y-4">
      <h1 className="text-2xl font-semibold tracking-tight">New user</h1>
      <UserForm
        mode="create"
        units={units.map((u) => ({ id: u.id, label: `${u.code} · ${u.name}` }))}
      />
    </div>
  );
}
