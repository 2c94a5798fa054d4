import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { z } from "zod";
import {
  OrderComposer,
  type PhysicianChoice,
  type StepTableChoice,
} from "@/components/orders/OrderComposer";
import { buttonClasses } from "@/components/ui/Button";
import { pageActor } from "@/lib/auth/page-guard";
import { db } from "@/lib/db";
import { NotFoundError } from "@/lib/errors";
import { getCurrentOrder } from "@/lib/orders/queries";
import { type ChartPatient, getPatientForActor } from "@/lib/patients/queries";
import { listUnits } from "@/lib/units/queries";

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

/** The step-table library for a unit: the built-in published tables and the unit's own, active. */
async function listStepTables(unitId: number): Promise<StepTableChoice[]> {
  const rows = (await db()("step_tables")
    .where({ active: true })
    .andWhere((q) => {
      void q.whereNull("unit_id").orWhere("unit_id", unitId);
    })
    .orderByRaw("unit_id IS NULL DESC, name")
    .select("id", "unit_id", "name", "kind")) as {
    id: number;
    unit_id: number | null;
    name: string;
    kind: "fio2_peep" | "flow_fio2";
  }[];
  return rows.map((r) => ({ id: r.id, name: r.name, kind: r.kind, unitOwn: r.unit_id !== null }));
}

/** The unit's active physicians, the one on duty for the bed marked, for the verbal-order prescriber. */
async function listPhysicians(unitId: number, bedId: number, now: Date): Promise<PhysicianChoice[]> {
  const knex = db();
  const [rows, duty] = await Promise.all([
    knex("users as u")
      .join("user_units as uu", "uu.user_id", "u.id")
      .where({ "u.role": "physician", "u.active": true, "uu.unit_id": unitId })
      .orderBy("u.name")
      .select("u.id", "u.name") as Promise<{ id: number; name: string }[]>,
    knex("care_assignments")
      .where({ bed_id: bedId, duty: "physician" })
      .andWhere("starts_at", "<=", now)
      .andWhere("ends_at", ">", now)
      .pluck("user_id") as Promise<number[]>,
  ]);
  return rows
    .map((r) => ({ id: r.id, name: r.name, onDuty: duty.includes(r.id) }))
    .sort((a, b) => Number(b.onDuty) - Number(a.onDuty));
}

/** The order composer: a physician writes and signs; a nurse or therapist enters a verbal order. */
export default async function NewOrderPage({
  params,
}: {
  params: Promise<{ patientId: string }>;
}) {
  const actor = await pageActor("physician", "therapist", "nurse");
  const parsed = paramsSchema.safeParse(await params);
  if (!parsed.success) notFound();
  const patient = await loadPatient(db(), actor, parsed.data.patientId);
  const { unit, bed } = patient.admission;
  const physician = actor.role === "physician";
  const [currentOrder, stepTables, physicians, units] = await Promise.all([
    getCurrentOrder(db(), patient.id),
    listStepTables(unit.id),
    physician ? Promise.resolve([]) : listPhysicians(unit.id, bed.id, new Date()),
    listUnits(db(), [unit.id]),
  ]);
  const currentStepTableName =
    currentOrder?.stepTableId != null
      ? (((await db()("step_tables").where({ id: currentOrder.stepTableId }).first("name")) as
          | { name: string }
          | undefined)?.name ?? null)
      : null;
  const name = `${patient.givenName} ${patient.familyName}`;

  return (
    <div className="space-y-5">
      <header className="flex flex-wrap items-start justify-between gap-3 rounded-card border border-border bg-surface p-4 shadow-card">
        <div className="space-y-1">
          <p className="text-xs font-medium uppercase tracking-wide text-ink-muted">
            {physician ? "Write order" : "Enter verbal order"}
          </p>
          <h1 className="text-2xl font-semibold tracking-tight">
            {physician ? "Oxygen order" : "Verbal or telephone order"} for {name}
          </h1>
          <p className="text-sm text-ink-muted">
            Bed <span className="font-medium text-ink">{bed.label}</span> · {unit.name} ({unit.code}) ·
            MRN <span className="tabular">{patient.mrn}</span>
          </p>
        </div>
        <Link href={`/patients/${patient.id}`} className={buttonClasses("secondary")}>
          Back to the Chart
        </Link>
      </header>
      <OrderComposer
        patient={{ id: patient.id, name, bedLabel: bed.label }}
        signer={physician ? "physician" : "other"}
        pressureUnit={actor.pressureUnit}
        timeZone={units[0]?.timeZone ?? "UTC"}
        currentOrder={currentOrder}
        currentStepTableName={currentStepTableName}
        stepTables={stepTables}
        physicians={physicians}
      />
    </div>
  );
}
