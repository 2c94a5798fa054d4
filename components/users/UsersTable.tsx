"use client";

import Link from "next/link";
import { useMemo, useState } from "react";
import { IconSort } from "@/components/ui/icons";
import { StatusBadge } from "@/components/ui/StatusBadge";
import { ROLE_LABELS } from "@/lib/auth/roles";
import type { UserSummary } from "@/lib/users/queries";
import type { UserSortKey } from "@/lib/users/schema";
import { signInWords } from "./invitation-words";

const COLUMNS: { key: UserSortKey; label: string }[] = [
  { key: "name", label: "Name" },
  { key: "email", label: "E-mail" },
  { key: "role", label: "Role" },
  { key: "active", label: "Status" },
  { key: "updatedAt", label: "Last changed" },
];

function sortValue(u: UserSummary, key: UserSortKey): string {
  switch (key) {
    case "name":
      return u.name.toLowerCase();
    case "email":
      return u.email;
    case "role":
      return ROLE_LABELS[u.role];
    case "active":
      return u.active ? "0" : "1";
    case "updatedAt":
      return u.updatedAt;
  }
}

/** The user list with sortable column headers (buttons, so the keyboard sorts too). */
export function UsersTable({
  users,
  currentUserId,
}: {
  users: UserSummary[];
  currentUserId: number;
}) {
  const [sort, setSort] = useState<{ key: UserSortKey; dir: "asc" | "desc" }>({
    key: "name",
    dir: "asc",
  });
  const sorted = useMemo(() => {
    const list = [...users].sort((a, b) =>
      sortValue(a, sort.key).localeCompare(sortValue(b, sort.key)),
    );
    return sort.dir === "asc" ? list : list.reverse();
  }, [users, sort]);

  const toggle = (key: UserSortKey) =>
    setSort((s) => ({ key, dir: s.key === key && s.dir === "asc" ? "desc" : "asc" }));

  return (
    <div className="overflow-x-auto rounded-card border border-border bg-surface shadow-card">
      <table className="w-full text-left text-sm" data-testid="users-table">
        <caption className="sr-only">
          Users, sorted by {sort.key} {sort.dir === "asc" ? "ascending" : "descending"}
        </caption>
        <thead className="border-b border-border bg-surface-muted text-xs tracking-wide text-ink-muted">
          <tr>
            {COLUMNS.map((c) => {
              const active = sort.key === c.key;
              return (
                <th
                  key={c.key}
                  scope="col"
                  className="px-3 py-2"
                  aria-sort={active ? (sort.dir === "asc" ? "ascending" : "descending") : "none"}
                >
                  <button
                    type="button"
                    onClick={() => toggle(c.key)}
                    className="inline-flex items-center gap-1 hover:text-ink"
                  >
                    {c.label}
                    <IconSort direction={active ? sort.dir : "none"} />
                  </button>
                </th>
              );
            })}
            <th scope="col" className="px-3 py-2">
              Sign-in
            </th>
            <th scope="col" className="px-3 py-2">
              Units
            </th>
          </tr>
        </thead>
        <tbody>
          {sorted.map((u) => (
            <tr key={u.id} className="border-b border-border last:border-0" data-testid="user-row">
              <th scope="row" className="px-3 py-2 font-medium">
                <Link
                  href={`/admin/users/${u.id}`}
                  className="text-accent underline-offset-2 hover:underline"
                >
                  {u.name}
                </Link>
                {u.id === currentUserId ? (
                  <span className="ml-1 text-xs text-ink-muted">(you)</span>
                ) : null}
              </th>
              <td className="px-3 py-2">{u.email}</td>
              <td className="px-3 py-2">{ROLE_LABELS[u.role]}</td>
              <td className="px-3 py-2">
                {u.active ? (
                  <StatusBadge status="in-band" label="Active" />
                ) : (
                  <StatusBadge status="neutral" label="Deactivated" />
                )}
              </td>
              <td className="tabular px-3 py-2">
                {u.updatedAt.slice(0, 16).replace("T", " ")} UTC
              </td>
              <td className="px-3 py-2" data-testid="user-sign-in">
                <SignInCell user={u} />
              </td>
              <td className="px-3 py-2">{u.units.map((x) => x.code).join(", ") || "—"}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

function SignInCell({ user }: { user: UserSummary }) {
  const words = signInWords(user);
  return (
    <span title={words.detail}>
      <StatusBadge status={words.tone} label={words.label} />
      <span className="sr-only">: {words.detail}</span>
    </span>
  );
}
