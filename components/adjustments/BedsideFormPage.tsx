import Link from "next/link";
import { notFound } from "next/navigation";
import type { ReactNode } from "react";
import { z } from "zod";
import { buttonClasses } from "@/components/ui/Button";
import type { Actor } from "@/lib/auth/actor";
import { db } from "@/lib/db";
import { NotFoundError } from "@/lib/errors";
import { getBedsideContext, type BedsideContext } from "@/lib/chart/bedside";
import { getPatientForActor, type ChartPatient } from "@/lib/admissions/queries";

// Server-side frame of the three bedside form pages (adjustment, reading,
// blood gas): the patient with a 404 for other units, the bedside context (with
// the unit's time zone), and the heading. Reads go through lib/ only.

const paramsSchema = z.object({ patientId: z.coerce.number().int().positive() });

export type BedsidePageData = {
  patient: ChartPatient;
  context: BedsideContext;
  /** The unit's time zone: times are typed and shown in it. */
  timeZone: string;
};

/** Loads what a bedside form page needs; not admitted, missing and other units all answer 404. */
export async function loadBedsidePage(
  actor: Actor,
  params: Promise<{ patientId: string }>,
): Promise<BedsidePageData> {
  const parsed = paramsSchema.safeParse(await params);
  if (!parsed.success) notFound();
  let data: BedsidePageData;
  try {
    // Both answer NotFoundError alike for another unit's patient.
    const [patient, context] = await Promise.all([
      getPatientForActor(db(), actor, parsed.data.patientId),
      getBedsideContext(db(), actor, parsed.data.patientId),
    ]);
    data = { patient, context, timeZone: context.admission.timeZone };
  } catch (error) {
    if (error instanceof NotFoundError) notFound();
    throw error;
  }
  return data;
}

/** The page heading: what is being recorded, for whom, and the way back to the Chart. */
export function BedsideFormHeader({
  patient,
  title,
  children,
}: {
  patient: ChartPatient;
  title: string;
  children?: ReactNode;
}) {
  const { bed, unit } = patient.admission;
  return (
    <header className="flex flex-wrap items-start justify-between gap-3 rounded-card border border-border bg-surface p-4 shadow-card">
      <div className="min-w-0 space-y-1">
        <p className="text-xs font-medium tracking-wide text-ink-muted">
          <Link href={`/patients/${patient.id}`} className="text-accent hover:underline">
            Chart
          </Link>{" "}
          › {title}
        </p>
        <h1 className="text-2xl font-semibold tracking-tight">{title}</h1>
        <p className="text-sm" data-testid="form-patient">
          <span className="font-medium">
            {patient.givenName} {patient.familyName}
          </span>
          <span className="text-ink-muted">
            {" "}
            · MRN <span className="tabular">{patient.mrn}</span> · Bed {bed.label} · {unit.name} (
            {unit.code})
          </span>
        </p>
        {children}
      </div>
      <Link href={`/patients/${patient.id}`} className={buttonClasses("secondary")}>
        Back to the Chart
      </Link>
    </header>
  );
}
