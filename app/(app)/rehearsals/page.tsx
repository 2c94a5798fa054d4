import type { Metadata } from "next";
import { cookies } from "next/headers";
import { notFound } from "next/navigation";
import { PrintButton } from "@/components/reports/PrintButton";
import {
  RehearsalWorkspace,
  type RehearsalFormSetup,
} from "@/components/rehearsals/RehearsalWorkspace";
import { Caution } from "@/components/ui/Caution";
import { UnitChooser } from "@/components/units/UnitChooser";
import { EmptyState } from "@/components/ui/EmptyState";
import { alertConfig } from "@/lib/alerts/config";
import { assertUnitAccess } from "@/lib/auth/actor-queries";
import { pagePermission } from "@/lib/auth/page-guard";
import { can } from "@/lib/auth/permissions";
import { db } from "@/lib/db";
import { resolveUnitChoice, UNIT_COOKIE } from "@/lib/preferences/unit";
import { parseRehearsalSearch, type RehearsalSearch } from "@/lib/rehearsal/address";
import { rehearsalFormDefaults } from "@/lib/rehearsal/form-defaults";
import { getRehearsal, listRehearsals } from "@/lib/rehearsal/queries";
import { listStepTables } from "@/lib/step-tables/queries";
import { listUnits } from "@/lib/units/queries";

export const metadata: Metadata = { title: "Protocol rehearsal" };

/** The published table a new run starts from: ARDS Network lower PEEP / higher FiO2. */
const DEFAULT_VENTILATED_TABLE = "ardsnet-lower-peep";

/**
 * Protocol rehearsal: a simulated cohort through a protocol under three care
 * models, for one unit (kept in the address, else the header's unit). Those
 * who may run one get the form; everyone on the unit reads the runs, one run
 * at a time or two side by side. The worker runs them; the page follows.
 */
export default async function RehearsalsPage({
  searchParams,
}: {
  searchParams: Promise<RehearsalSearch>;
}) {
  const actor = await pagePermission("record.read");
  const choice = parseRehearsalSearch(await searchParams);
  const units = await listUnits(db(), actor.unitIds);
  if (units.length === 0)
    return (
      <EmptyState title="No unit">
        You are not on any unit, so there are no rehearsals to show.
      </EmptyState>
    );

  const views = await Promise.all(choice.runs.map((id) => getRehearsal(db(), id)));
  // A run that does not exist, or is another unit's, answers 404 like any record.
  if (views.some((v) => v === null)) notFound();
  const chosen = views.filter((v) => v !== null);

  // The unit asked for, else the chosen run's, else the header's, else the first.
  const { choice: headerChoice } = resolveUnitChoice(
    (await cookies()).get(UNIT_COOKIE)?.value,
    actor.unitIds,
  );
  const unitId =
    choice.unitId ?? chosen[0]?.unitId ?? (headerChoice !== "all" ? headerChoice : units[0]!.id);
  const unit = units.find((u) => u.id === unitId);
  if (!unit) notFound();
  assertUnitAccess(actor, unitId);
  if (chosen.some((v) => v.unitId !== unitId)) notFound();

  const mayRun = can(actor, "rehearsal.run");
  const [runs, tables] = await Promise.all([
    listRehearsals(db(), unitId),
    mayRun ? listStepTables(db(), [unitId]) : Promise.resolve([]),
  ]);

  let form: RehearsalFormSetup | null = null;
  if (mayRun) {
    const ventilated = tables.filter((t) => t.kind === "fio2_peep");
    const hfnc = tables.filter((t) => t.kind === "flow_fio2");
    const config = alertConfig();
    const start = ventilated.find((t) => t.code === DEFAULT_VENTILATED_TABLE) ?? ventilated[0];
    form = {
      defaults: rehearsalFormDefaults({
        unitId,
        ventilatedTableId: start?.id ?? 0,
        detection: config,
        escalateAfterMinutes: Math.round(config.escalateAfterMs / 60_000),
      }),
      ventilatedTables: ventilated.map((t) => ({ id: t.id, name: t.name })),
      hfncTables: hfnc.map((t) => ({ id: t.id, name: t.name })),
    };
  }

  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h1 className="text-2xl font-semibold tracking-tight">Protocol rehearsal</h1>
        {chosen.length > 0 ? <PrintButton /> : null}
      </div>
      <UnitChooser units={units} value={unitId} action="/rehearsals" id="rehearsal-unit" />
      <p className="text-sm text-ink-muted">
        {unit.code} ({unit.name}): virtual patients run through a protocol under a fixed-interval
        routine, the Tidemark workflow and an instant reference, on the same patients and courses.
      </p>
      <p
        role="note"
        className="rounded-md border border-border-strong px-3 py-2 text-sm font-medium"
        data-testid="rehearsal-caution"
      >
        A rehearsal is a model, not evidence about a real patient; local protocols and licensed
        clinicians decide.
      </p>
      <Caution />
      <RehearsalWorkspace
        unit={{ id: unit.id, code: unit.code, name: unit.name, timeZone: unit.timeZone }}
        form={form}
        initialRuns={runs}
        initialViews={chosen}
      />
    </div>
  );
}
