import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { z } from "zod";
import { UserActivePanel } from "@/components/users/UserActivePanel";
import { UserForm } from "@/components/users/UserForm";
import { UserInvitePanel } from "@/components/users/UserInvitePanel";
import { getEnv } from "@/lib/env";
import { pagePermission } from "@/lib/auth/page-guard";
import { db } from "@/lib/db";
import { listUnits } from "@/lib/units/queries";
import { getUser } from "@/lib/users/queries";

export const metadata: Metadata = { title: "Edit user" };

const paramsSchema = z.object({ userId: z.coerce.number().int().positive() });

export default async function EditUserPage({ params }: { params: Promise<{ userId: string }> }) {
  const actor = await pagePermission("user.manage");
  const parsed = paramsSchema.safeParse(await params);
  if (!parsed.success) notFound();
  const [user, units] = await Promise.all([getUser(db(), parsed.data.userId), listUnits(db())]);
  if (!user) notFound();
  return (
    <div className="max-w-2xl space-y-6">
      <h1 className="text-2xl font-semibold tracking-tight">{user.name}</h1>
      <UserForm
        mode="edit"
        user={user}
        units={units.map((u) => ({ id: u.id, label: `${u.code} · ${u.name}` }))}
      />
      <UserInvitePanel user={user} linkHours={getEnv().INVITE_LINK_HOURS} />
      <UserActivePanel user={user} isSelf={user.id === actor.id} />
    </div>
  );
}
