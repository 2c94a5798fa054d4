import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { z } from "zod";
import { OrderComposer } from "@/components/orders/OrderComposer";
import { HeightForm } from "@/components/ventilation/HeightForm";
import { buttonClasses } from "@/components/ui/Button";
import { pagePermission } from "@/lib/auth/page-guard";
import { db } from "@/lib/db";
import { NotFoundError } from "@/lib/errors";
import { getCurrentOrder } from "@/lib/orders/queries";
import { type ChartPatient, getPatientForActor } from "@/lib/admissions/queries";
import { getStepTableName, listStepTables } from "@/lib/step-tables/queries";
import { listUnits } from "@/lib/units/queries";
import { listUnitPhysicians } from "@/lib/users/queries";
import { can } from "@/lib/auth/permissions";
import { getOrderRequest } from "@/lib/order-requests/queries";
import { bodyWeightOf } from "@/lib/ventilation/settings";

export const metadata: Metadata = { title: "Order" };

const paramsSchema = z.object({ patientId: z.coerce.number().int().positive() });

async function loadPatient(...args: Parameters<typeof getPatientForActor>): Promise<ChartPatient> {
  try {
    return await getPatientForActor(...args);
  } catch (error) {
    // Not admitted, not existing and another unit's patient look the same.
    if (error instanceof NotFoundError) notFound();
    throw error;
  }
}

/** The order composer: a physician writes and signs; a nurse or therapist enters a verbal order. */
export default async function NewOrderPage({
  params,
  searchParams,
}: {
  params: Promise<{ patientId: string }>;
  searchParams: Promise<{ request?: string }>;
}) {
  const actor = await pagePermission("order.write");
  const parsed = paramsSchema.safeParse(await params);
  if (!parsed.success) notFound();
  const patient = await loadPatient(db(), actor, parsed.data.patientId);
  // A discharged patient's Chart is read-only: no new orders.
  if (patient.admission.dischargedAt) notFound();
  const { unit, bed } = patient.admission;
  const physician = can(actor, "order.sign");
  const [currentOrder, stepTables, physicians, units] = await Promise.all([
    getCurrentOrder(db(), patient.id),
    listStepTables(db(), [unit.id]),
    physician ? Promise.resolve([]) : listUnitPhysicians(db(), unit.id, bed.id, new Date()),
    listUnits(db(), [unit.id]),
  ]);
  const currentStepTableName = await getStepTableName(db(), currentOrder?.stepTableId ?? null);
  // ?request=ID: the composer starts from an open order request for this patient.
  const requestId = z.coerce
    .number()
    .int()
    .positive()
    .safeParse((await searchParams).request);
  const request = requestId.success ? await getOrderRequest(db(), requestId.data) : null;
  const prefill =
    request && request.patientId === patient.id && request.state !== "closed"
      ? {
          id: request.id,
          requestedBy: request.requestedBy.name,
          need: request.need,
          reason: request.reason,
          ...request.proposal,
        }
      : undefined;
  const name = `${patient.givenName} ${patient.familyName}`;
  const bodyWeight = bodyWeightOf(patient);

  return (
    <div className="space-y-5">
      <header className="flex flex-wrap items-start justify-between gap-3 rounded-card border border-border bg-surface p-4 shadow-card">
        <div className="space-y-1">
          <p className="text-xs font-medium tracking-wide text-ink-muted">
            {physician ? "Write order" : "Enter verbal order"}
          </p>
          <h1 className="text-2xl font-semibold tracking-tight">
            {physician ? "Oxygen order" : "Verbal or telephone order"} for {name}
          </h1>
          <p className="text-sm text-ink-muted">
            Bed <span className="font-medium text-ink">{bed.label}</span> · {unit.name} ({unit.code}
            ) · MRN <span className="tabular">{patient.mrn}</span>
          </p>
        </div>
        <Link href={`/patients/${patient.id}`} className={buttonClasses("secondary")}>
          Back to the Chart
        </Link>
      </header>
      {bodyWeight === null && can(actor, "reading.chart") ? (
        <HeightForm
          patientId={patient.id}
          reason={
            patient.heightCm === null
              ? "No height is recorded for this patient. A ventilator order (invasive ventilation or NIV) sets its tidal volume per kg of predicted body weight, which needs the height; Tidemark never estimates it."
              : `The recorded height, ${patient.heightCm} cm, lies outside 130–230 cm, where the predicted body weight equation holds. Correct it if it was mistyped.`
          }
        />
      ) : null}
      <OrderComposer
        bodyWeight={bodyWeight}
        patient={{ id: patient.id, name, bedLabel: bed.label }}
        signer={physician ? "physician" : "other"}
        pressureUnit={actor.pressureUnit}
        timeZone={units[0]?.timeZone ?? "UTC"}
        currentOrder={currentOrder}
        currentStepTableName={currentStepTableName}
        stepTables={stepTables.map((t) => ({
          id: t.id,
          name: t.name,
          kind: t.kind,
          unitOwn: t.unitId !== null,
        }))}
        physicians={physicians}
        {...(prefill ? { prefill } : {})}
      />
    </div>
  );
}
