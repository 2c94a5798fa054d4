import type { Metadata } from "next";
import Link from "next/link";
import { StepRowsTable } from "@/components/step-tables/StepRowsTable";
import { buttonClasses } from "@/components/ui/Button";
import { StatusBadge } from "@/components/ui/StatusBadge";
import { pagePermission } from "@/lib/auth/page-guard";
import { db } from "@/lib/db";
import { listStepTables } from "@/lib/step-tables/queries";
import { listUnits } from "@/lib/units/queries";

export const metadata: Metadata = { title: "Step tables" };

export default async function StepTablesPage() {
  await pagePermission("step_table.manage");
  const units = await listUnits(db());
  const tables = await listStepTables(
    db(),
    units.map((u) => u.id),
    { includeInactive: true },
  );
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <div>
          <h1 className="text-2xl font-semibold tracking-tight">Step tables</h1>
          <p className="text-sm text-ink-muted">
            The titration library orders choose from: the published tables (read-only) and each
            unit&apos;s own.
          </p>
        </div>
        <Link href="/admin/step-tables/new" className={buttonClasses("primary")}>
          New unit table
        </Link>
      </div>
      <div className="grid gap-3 md:grid-cols-2">
        {tables.map((t) => (
          <section
            key={t.id}
            className="space-y-2 rounded-card border border-border bg-surface p-4 shadow-card"
            aria-labelledby={`table-${t.id}`}
          >
            <div className="flex flex-wrap items-center gap-2">
              <h2 id={`table-${t.id}`} className="text-base font-semibold">
                {t.builtIn ? (
                  t.name
                ) : (
                  <Link
                    href={`/admin/step-tables/${t.id}`}
                    className="text-accent underline-offset-2 hover:underline"
                  >
                    {t.name}
                  </Link>
                )}
              </h2>
              {t.builtIn ? (
                <StatusBadge status="neutral" label="Published, read-only" />
              ) : (
                <StatusBadge
                  status={t.active ? "in-band" : "neutral"}
                  label={t.active ? `${t.unitCode} · active` : `${t.unitCode} · retired`}
                />
              )}
            </div>
            {t.source ? <p className="text-xs text-ink-muted">{t.source}</p> : null}
            <StepRowsTable rows={t.rows} kind={t.kind} caption={`Steps of ${t.name}`} />
          </section>
        ))}
      </div>
    </div>
  );
}
