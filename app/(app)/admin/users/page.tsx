import type { Metadata } from "next";
import Link from "next/link";
import { buttonClasses } from "@/components/ui/Button";
import { UsersTable } from "@/components/users/UsersTable";
import { pagePermission } from "@/lib/auth/page-guard";
import { db } from "@/lib/db";
import { listUsers } from "@/lib/users/queries";

export const metadata: Metadata = { title: "Users" };

export default async function UsersPage() {
  const actor = await pagePermission("user.manage");
  const users = await listUsers(db());
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <div>
          <h1 className="text-2xl font-semibold tracking-tight">Users</h1>
          <p className="text-sm text-ink-muted">
            Accounts, roles and unit assignments. Every change is written to the ledger.
          </p>
        </div>
        <Link href="/admin/users/new" className={buttonClasses("primary")}>
          New user
        </Link>
      </div>
      <UsersTable users={users} currentUserId={actor.id} />
    </div>
  );
}
