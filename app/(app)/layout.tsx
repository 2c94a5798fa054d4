import { cookies } from "next/headers";
import type { ReactNode } from "react";
import { AppHeader } from "@/components/shell/AppHeader";
import { alertSummary } from "@/lib/alerts/queries";
import { pageActor } from "@/lib/auth/page-guard";
import { db } from "@/lib/db";
import { parseTheme, THEME_COOKIE } from "@/lib/preferences/theme";
import { resolveUnitChoice, UNIT_COOKIE } from "@/lib/preferences/unit";
import { listUnits } from "@/lib/units/queries";

export default async function AppLayout({ children }: { children: ReactNode }) {
  const actor = await pageActor();
  const jar = await cookies();
  const [units, alerts] = await Promise.all([
    listUnits(db(), actor.unitIds),
    alertSummary(db(), actor),
  ]);
  const { choice } = resolveUnitChoice(jar.get(UNIT_COOKIE)?.value, actor.unitIds);
  return (
    <div className="flex min-h-screen flex-col">
      <a
        href="#main"
        className="sr-only focus:not-sr-only focus:absolute focus:top-2 focus:left-2 focus:z-50 focus:rounded focus:bg-surface focus:px-3 focus:py-2"
      >
        Skip to content
      </a>
      <AppHeader
        user={{ name: actor.name, role: actor.role }}
        units={units.map((u) => ({ id: u.id, code: u.code, name: u.name }))}
        unitChoice={String(choice)}
        theme={parseTheme(jar.get(THEME_COOKIE)?.value)}
        alertSummary={alerts}
      />
      <main id="main" className="mx-auto w-full max-w-7xl flex-1 px-4 py-5">
        {children}
      </main>
    </div>
  );
}
