import Link from "next/link";
import { IconMark } from "@/components/ui/icons";
import { ROLE_LABELS, type Role } from "@/lib/auth/roles";
import type { ThemeChoice } from "@/lib/preferences/theme";
import type { AlertSummary } from "@/lib/alerts/queries";
import { AlertBell } from "./AlertBell";
import { NavLinks } from "./NavLinks";
import { PatientSearch } from "./PatientSearch";
import { SignOutButton } from "./SignOutButton";
import { ThemeSwitcher } from "./ThemeSwitcher";
import { UnitSwitcher } from "./UnitSwitcher";
import { can } from "@/lib/auth/permissions";

export type NavItem = { href: string; label: string };

function navFor(role: Role): NavItem[] {
  const items: NavItem[] = [
    { href: "/board", label: "Board" },
    { href: "/assignments", label: "Assignments" },
  ];
  if (can({ role }, "order.cosign")) items.push({ href: "/orders/cosign", label: "Co-sign" });
  if (can({ role }, "order_request.answer") || can({ role }, "order_request.send"))
    items.push({ href: "/order-requests", label: "Order requests" });
  if (can({ role }, "admission.manage")) items.push({ href: "/admit", label: "Admit" });
  items.push({ href: "/handoff", label: "Handoff" });
  items.push({ href: "/ledger", label: "Ledger" });
  items.push({ href: "/reports", label: "Reports" });
  items.push({ href: "/rehearsals", label: "Rehearsals" });
  if (can({ role }, "import.upload")) items.push({ href: "/imports", label: "Uploads" });
  if (can({ role }, "user.manage")) items.push({ href: "/admin/users", label: "Users" });
  if (can({ role }, "unit.manage")) items.push({ href: "/admin/units", label: "Units" });
  if (can({ role }, "step_table.manage"))
    items.push({ href: "/admin/step-tables", label: "Step tables" });
  if (can({ role }, "api_token.manage"))
    items.push({ href: "/admin/api-tokens", label: "API tokens" });
  return items;
}

export function AppHeader({
  user,
  units,
  unitChoice,
  theme,
  alertSummary,
}: {
  user: { name: string; role: Role };
  units: { id: number; code: string; name: string }[];
  unitChoice: string;
  theme: ThemeChoice;
  alertSummary: AlertSummary;
}) {
  return (
    <header className="border-b border-border bg-surface">
      <div className="mx-auto flex max-w-7xl flex-wrap items-center gap-x-5 gap-y-2 px-4 py-2">
        <Link
          href="/board"
          className="flex items-center gap-1.5 text-accent"
          aria-label="Tidemark, go to the Board"
        >
          <IconMark className="text-2xl" />
          <span className="text-lg font-semibold tracking-tight text-ink">Tidemark</span>
        </Link>
        <NavLinks items={navFor(user.role)} />
        <AlertBell initial={alertSummary} />
        <div className="ml-auto flex flex-wrap items-center gap-3">
          <PatientSearch />
          <UnitSwitcher units={units} value={unitChoice} />
          <ThemeSwitcher value={theme} />
          <div className="text-right leading-tight" data-testid="current-user">
            <div className="text-sm font-medium">{user.name}</div>
            <div className="text-xs text-ink-muted">{ROLE_LABELS[user.role]}</div>
          </div>
          <SignOutButton />
        </div>
      </div>
    </header>
  );
}
