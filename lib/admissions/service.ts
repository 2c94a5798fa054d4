import type { Knex } from "knex";
import { closeAlert, noteRecipients } from "../alerts/lifecycle";
import { queueAlertMail } from "../alerts/outbox";
import type { Actor } from "../auth/actor";
import { DEVICE_PROFILES, type Device } from "../devices";
import { ConflictError, ValidationError } from "../errors";
import { once } from "../idempotency";
import { appendLedger, lockPatientChain, type LedgerActor } from "../ledger/service";
import { parseDevices } from "../units/queries";
import { refreshFrom } from "../rollups/store";
import { closeStay, openStay } from "../rollups/stays";
import {
  admissionView,
  bedFor,
  findOrCreatePatient,
  lockOpenAdmission,
  openAdmissionFor,
  rethrowOccupied,
  checkEventTime,
  type AdmissionView,
  type BedRow,
} from "./lookups";
import {
  DISPOSITION_LABELS,
  type AdmitData,
  type DischargeData,
  type Disposition,
  type TransferData,
} from "./schema";

/**
 * Who admits, moves or discharges: a signed-in user, or an interface engine's
 * API token (HL7 ADT). The ledger names either; the units bound what it may touch.
 */
export type Doer = { ledger: LedgerActor; unitIds: number[]; userId: number | null };

export const userDoer = (actor: Actor): Doer => ({
  ledger: actor,
  unitIds: actor.unitIds,
  userId: actor.id,
});

/** Admits into a bed already checked against the doer's units, inside the caller's transaction. */
export async function admitIn(
  trx: Knex.Transaction,
  doer: Doer,
  input: Omit<AdmitData, "idempotencyKey" | "admittedAt" | "bedId">,
  bed: BedRow,
  admittedAt: Date,
  now: Date,
): Promise<AdmissionView> {
  const who = `${input.familyName}, ${input.givenName} (MRN ${input.mrn})`;
  const patient = await findOrCreatePatient(trx, input);
  await lockPatientChain(trx, patient.id);
  let admissionId: number;
  try {
    const [id] = await trx("admissions").insert({
      patient_id: patient.id,
      bed_id: bed.bed_id,
      admitted_at: admittedAt,
    });
    admissionId = Number(id);
  } catch (error) {
    rethrowOccupied(error, bed.bed_label, who);
  }
  await openStay(trx, {
    admissionId,
    patientId: patient.id,
    bedId: bed.bed_id,
    unitId: bed.unit_id,
    at: admittedAt,
  });
  const view = { ...(await admissionView(trx, admissionId)), returning: patient.returning };
  await appendLedger(
    trx,
    doer.ledger,
    {
      action: "patient.admit",
      entityType: "admission",
      entityId: admissionId,
      patientId: patient.id,
      unitId: bed.unit_id,
      after: {
        ...view,
        patient: {
          mrn: input.mrn,
          familyName: input.familyName,
          givenName: input.givenName,
          birthDate: input.birthDate,
          sex: input.sex,
          heightCm: input.heightCm ?? null,
          weightKg: input.weightKg ?? null,
        },
      },
      rationale: input.rationale || null,
    },
    now,
  );
  return view;
}

/** Admits a new or returning patient into a free bed of one of the actor's units. */
export async function admitPatient(
  knex: Knex,
  actor: Actor,
  input: AdmitData,
  now: Date = new Date(),
): Promise<AdmissionView> {
  const admittedAt = checkEventTime(
    "admittedAt",
    "Admission time",
    input.admittedAt,
    now,
    new Date(now.getTime() - 7 * 86_400_000),
  );
  const doer = userDoer(actor);
  const bed = await bedFor(knex, doer, { bedId: input.bedId });
  return once(knex, actor.id, input.idempotencyKey, "patient.admit", (trx) =>
    admitIn(trx, doer, input, bed, admittedAt, now),
  );
}

/** The device of the order in effect, if any. */
async function deviceInEffect(knex: Knex, admissionId: number): Promise<Device | null> {
  const order = (await knex("orders")
    .where({ admission_id: admissionId })
    .whereIn("status", ["active", "awaiting_cosign"])
    .first("device")) as { device: Device } | undefined;
  return order?.device ?? null;
}

/**
 * Moves a patient to another bed, inside the caller's transaction. The
 * admission keeps its id, so its orders, settings, readings, alerts and
 * ledger chain follow; open alerts take the new bed, and its team is told.
 */
export async function transferIn(
  trx: Knex.Transaction,
  doer: Doer,
  from: AdmissionView,
  to: BedRow,
  rationale: string,
  now: Date,
): Promise<AdmissionView> {
  await lockPatientChain(trx, from.patientId);
  const row = await lockOpenAdmission(trx, from.admissionId);
  // Read again under the lock: someone may have moved the patient since the screen was drawn.
  const before = await admissionView(trx, row.id);
  if (to.bed_id === before.bed.id) {
    throw new ValidationError("Some fields need attention.", {
      bedId: [`${before.name} is already in bed ${before.bed.label}.`],
    });
  }
  const device = await deviceInEffect(trx, from.admissionId);
  if (device && !parseDevices(to.devices_json).includes(device)) {
    throw new ConflictError(
      `${to.unit_name} does not allow ${DEVICE_PROFILES[device].label}, the device of the order in effect. Change the order first, or move the patient to a unit that allows it.`,
      { bedId: [`${to.unit_name} does not allow ${DEVICE_PROFILES[device].label}.`] },
    );
  }
  // Time before the move stays with the old bed.
  await closeStay(trx, row.id, now, { bedId: to.bed_id, unitId: to.unit_id });
  try {
    await trx("admissions").where({ id: row.id }).update({ bed_id: to.bed_id });
  } catch (error) {
    rethrowOccupied(error, to.bed_label, from.name);
  }
  // The order in effect belongs to the unit the patient lies on: its team reads and co-signs it.
  const ordersMoved = await trx("orders")
    .where({ admission_id: row.id })
    .whereIn("status", ["active", "awaiting_cosign"])
    .update({ unit_id: to.unit_id });
  const openAlerts = (await trx("alerts")
    .where({ open_admission_id: row.id })
    .forUpdate()
    .select("id", "escalation_level")) as { id: number; escalation_level: number }[];
  if (openAlerts.length) {
    await trx("alerts")
      .whereIn(
        "id",
        openAlerts.map((a) => a.id),
      )
      .update({ bed_id: to.bed_id, unit_id: to.unit_id });
  }
  await refreshFrom(trx, row.id, now, now);
  const after = await admissionView(trx, row.id);
  const entry = await appendLedger(
    trx,
    doer.ledger,
    {
      action: "patient.transfer",
      entityType: "admission",
      entityId: row.id,
      patientId: from.patientId,
      unitId: to.unit_id,
      before: { bed: before.bed, unit: before.unit },
      after: { bed: after.bed, unit: after.unit, ordersMoved, alertsMoved: openAlerts.length },
      rationale,
    },
    now,
  );
  // The new bed's team hears of the alerts still open (one e-mail per alert and move).
  for (const alert of openAlerts) {
    const mail = await queueAlertMail(
      trx,
      alert.id,
      alert.escalation_level,
      `moved-${entry.chainSeq}`,
      now,
    );
    await noteRecipients(trx, alert.id, alert.escalation_level, mail.told);
  }
  return after;
}

/** Moves a patient of the actor's units to a free bed of the actor's units. */
export async function transferPatient(
  knex: Knex,
  actor: Actor,
  input: TransferData,
  now: Date = new Date(),
): Promise<AdmissionView> {
  const doer = userDoer(actor);
  const from = await openAdmissionFor(knex, doer, { admissionId: input.admissionId });
  const to = await bedFor(knex, doer, { bedId: input.bedId });
  return once(knex, actor.id, input.idempotencyKey, "patient.transfer", (trx) =>
    transferIn(trx, doer, from, to, input.rationale, now),
  );
}

/**
 * Discharges, inside the caller's transaction: the order in effect is
 * discontinued with the reason, open alerts are resolved, the bed is freed.
 * Every record stays readable.
 */
export async function dischargeIn(
  trx: Knex.Transaction,
  doer: Doer,
  current: AdmissionView,
  discharge: { disposition: Disposition; dischargedAt: Date; note: string },
  now: Date,
): Promise<AdmissionView> {
  const { disposition, dischargedAt, note } = discharge;
  const reason = `Discharged: ${DISPOSITION_LABELS[disposition].toLowerCase()}${note ? ` (${note})` : ""}`;
  await lockPatientChain(trx, current.patientId);
  const row = await lockOpenAdmission(trx, current.admissionId);
  const place = { patientId: current.patientId, unitId: current.unit.id };
  const orders = (await trx("orders")
    .where({ admission_id: row.id })
    .whereIn("status", ["active", "awaiting_cosign"])
    .forUpdate()
    .select("id", "status", "version")) as { id: number; status: string; version: number }[];
  for (const order of orders) {
    await trx("orders")
      .where({ id: order.id })
      .update({
        status: "discontinued",
        discontinued_by: doer.userId,
        discontinued_at: dischargedAt,
        discontinue_reason: reason,
        version: order.version + 1,
        updated_at: now,
      });
    await appendLedger(
      trx,
      doer.ledger,
      {
        action: "order.discontinue",
        entityType: "order",
        entityId: order.id,
        ...place,
        before: { status: order.status },
        after: { status: "discontinued", discontinuedAt: dischargedAt.toISOString() },
        rationale: reason,
      },
      now,
    );
  }
  const alerts = (await trx("alerts")
    .where({ open_admission_id: row.id })
    .forUpdate()
    .select("id", "state", "version")) as { id: number; state: string; version: number }[];
  for (const alert of alerts) {
    await closeAlert(trx, doer.ledger, place, alert, reason, dischargedAt, now, doer.userId);
  }
  await trx("admissions").where({ id: row.id }).update({
    discharged_at: dischargedAt,
    discharge_disposition: disposition,
  });
  await closeStay(trx, row.id, dischargedAt);
  await refreshFrom(trx, row.id, dischargedAt, now);
  const after = await admissionView(trx, row.id);
  await appendLedger(
    trx,
    doer.ledger,
    {
      action: "patient.discharge",
      entityType: "admission",
      entityId: row.id,
      ...place,
      before: { bed: current.bed, dischargedAt: null },
      after: {
        ...after,
        ordersDiscontinued: orders.map((o) => o.id),
        alertsResolved: alerts.map((a) => a.id),
      },
      rationale: reason,
    },
    now,
  );
  return after;
}

/** Discharges a patient of the actor's units. */
export async function dischargePatient(
  knex: Knex,
  actor: Actor,
  input: DischargeData,
  now: Date = new Date(),
): Promise<AdmissionView> {
  const doer = userDoer(actor);
  const current = await openAdmissionFor(knex, doer, { admissionId: input.admissionId });
  const dischargedAt = checkEventTime(
    "dischargedAt",
    "Discharge time",
    input.dischargedAt,
    now,
    new Date(current.admittedAt),
  );
  return once(knex, actor.id, input.idempotencyKey, "patient.discharge", (trx) =>
    dischargeIn(
      trx,
      doer,
      current,
      { disposition: input.disposition, dischargedAt, note: input.rationale },
      now,
    ),
  );
}
