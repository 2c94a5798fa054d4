import type { Metadata } from "next";
import { cookies } from "next/headers";
import Link from "next/link";
import { notFound } from "next/navigation";
import { HandoffSheet, shiftLabel } from "@/components/handoff/HandoffSheet";
import { UnitChooser } from "@/components/units/UnitChooser";
import { EmptyState } from "@/components/ui/EmptyState";
import { pagePermission } from "@/lib/auth/page-guard";
import { can } from "@/lib/auth/permissions";
import { db } from "@/lib/db";
import { ValidationError } from "@/lib/errors";
import { loadHandoff } from "@/lib/handoff/queries";
import { shiftChoiceSchema } from "@/lib/handoff/schema";
import { resolveUnitChoice, UNIT_COOKIE } from "@/lib/preferences/unit";
import { listUnits } from "@/lib/units/queries";

export const metadata: Metadata = { title: "Handoff" };

type Search = { unit?: string | string[]; shift?: string | string[] };
const one = (v: string | string[] | undefined) => (Array.isArray(v) ? v.at(-1) : v);

export default async function HandoffPage({ searchParams }: { searchParams: Promise<Search> }) {
  const actor = await pagePermission("record.read");
  const params = await searchParams;
  const units = await listUnits(db(), actor.unitIds);
  if (units.length === 0)
    return (
      <EmptyState title="No unit">
        You are not on any unit, so there is no handoff to show.
      </EmptyState>
    );

  // The unit asked for, else the one chosen in the header, else the first.
  const { choice } = resolveUnitChoice((await cookies()).get(UNIT_COOKIE)?.value, actor.unitIds);
  const asked = one(params.unit);
  const unitId = asked
    ? Number(asked)
    : choice !== "all" && units.some((u) => u.id === choice)
      ? choice
      : units[0]!.id;
  if (!units.some((u) => u.id === unitId)) notFound();

  const parsedShift = shiftChoiceSchema.safeParse(one(params.shift));
  let refusal: string | null = parsedShift.success ? null : parsedShift.error.issues[0]!.message;
  let view;
  try {
    view = await loadHandoff(db(), actor, {
      unitId,
      shift: parsedShift.success ? parsedShift.data : "next",
    });
  } catch (error) {
    if (!(error instanceof ValidationError)) throw error;
    refusal = error.message;
    view = await loadHandoff(db(), actor, { unitId, shift: "next" });
  }
  const tz = view.unit.timeZone;

  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-end justify-between gap-3 print:hidden">
        <UnitChooser units={units} value={unitId} action="/handoff" />
        <nav aria-label="Handover" className="text-sm">
          {view.lateIncoming ? (
            <Link
              className="text-accent underline"
              href={`/handoff?unit=${unitId}&shift=${encodeURIComponent(view.lateIncoming.startsAt)}`}
            >
              Handover to the shift that began {shiftLabel(view.lateIncoming, tz)}
            </Link>
          ) : Date.parse(view.incoming.startsAt) <= Date.parse(view.now) ? (
            <Link className="text-accent underline" href={`/handoff?unit=${unitId}`}>
              Handover to the next shift
            </Link>
          ) : null}
        </nav>
      </div>
      {refusal ? (
        <p
          role="alert"
          className="rounded-md border border-below px-3 py-2 text-sm text-below print:hidden"
        >
          {refusal} Showing the handover to the next shift.
        </p>
      ) : null}
      <HandoffSheet
        view={view}
        actorId={actor.id}
        canAcknowledge={can(actor, "handoff.acknowledge")}
      />
    </div>
  );
}
