import type { Knex } from "knex";
import { closeAlert, noteRecipients } from "../alerts/lifecycle";
import { queueAlertMail } from "../alerts/outbox";
import type { Actor } from "../auth/actor";
import { duplicateIndex } from "../db-errors";
import { DEVICE_PROFILES, type Device } from "../devices";
import { ConflictError, NotFoundError, ValidationError } from "../errors";
import { once } from "../idempotency";
import { appendLedger, lockPatientChain } from "../ledger/service";
import { parseDevices } from "../units/queries";
import {
  DISPOSITION_LABELS,
  type AdmitData,
  type DischargeData,
  type PatientDetails,
  type TransferData,
} from "./schema";

/** What an admit, transfer or discharge answers: the admission as it now stands. */
export type AdmissionView = {
  admissionId: number;
  patientId: number;
  mrn: string;
  name: string;
  bed: { id: number; label: string };
  unit: { id: number; code: string; name: string };
  admittedAt: string;
  dischargedAt: string | null;
  disposition: string | null;
  /** Admit only: the MRN was already known, so the stored patient was admitted again. */
  returning?: boolean;
};

type BedRow = {
  bed_id: number;
  bed_label: string;
  bed_active: number | boolean;
  unit_id: number;
  unit_code: string;
  unit_name: string;
  unit_active: number | boolean;
  devices_json: string | null;
};

/** A bed of one of the actor's active units; any other is "not found". */
async function bedForActor(knex: Knex, actor: Actor, bedId: number): Promise<BedRow> {
  const row = (await knex("beds as b")
    .join("units as u", "u.id", "b.unit_id")
    .where("b.id", bedId)
    .first(
      "b.id as bed_id",
      "b.label as bed_label",
      "b.active as bed_active",
      "u.id as unit_id",
      "u.code as unit_code",
      "u.name as unit_name",
      "u.active as unit_active",
      "u.devices_json",
    )) as BedRow | undefined;
  if (!row || !actor.unitIds.includes(row.unit_id) || !row.unit_active) {
    throw new NotFoundError("No bed with that id on your units.");
  }
  if (!row.bed_active) {
    throw new ValidationError("Some fields need attention.", {
      bedId: [`Bed ${row.bed_label} is retired; choose another bed.`],
    });
  }
  return row;
}

type AdmissionRow = {
  id: number;
  patient_id: number;
  bed_id: number;
  admitted_at: Date;
  discharged_at: Date | null;
  discharge_disposition: string | null;
};

/** The admission with its patient, bed and unit, for an actor of the bed's unit. */
async function admissionView(knex: Knex, admissionId: number): Promise<AdmissionView> {
  const r = (await knex("admissions as a")
    .join("patients as p", "p.id", "a.patient_id")
    .join("beds as b", "b.id", "a.bed_id")
    .join("units as u", "u.id", "b.unit_id")
    .where("a.id", admissionId)
    .first(
      "a.id",
      "a.patient_id",
      "a.admitted_at",
      "a.discharged_at",
      "a.discharge_disposition",
      "p.mrn",
      "p.family_name",
      "p.given_name",
      "b.id as bed_id",
      "b.label as bed_label",
      "u.id as unit_id",
      "u.code as unit_code",
      "u.name as unit_name",
    )) as AdmissionRow & {
    mrn: string;
    family_name: string;
    given_name: string;
    bed_label: string;
    unit_id: number;
    unit_code: string;
    unit_name: string;
  };
  return {
    admissionId: r.id,
    patientId: r.patient_id,
    mrn: r.mrn,
    name: `${r.family_name}, ${r.given_name}`,
    bed: { id: r.bed_id, label: r.bed_label },
    unit: { id: r.unit_id, code: r.unit_code, name: r.unit_name },
    admittedAt: new Date(r.admitted_at).toISOString(),
    dischargedAt: r.discharged_at ? new Date(r.discharged_at).toISOString() : null,
    disposition: r.discharge_disposition,
  };
}

/** An open admission on one of the actor's units; else "not found". */
async function openAdmissionForActor(
  knex: Knex,
  actor: Actor,
  admissionId: number,
): Promise<AdmissionView> {
  const found = (await knex("admissions").where({ id: admissionId }).first("id")) as
    { id: number } | undefined;
  const view = found ? await admissionView(knex, admissionId) : null;
  if (!view || !actor.unitIds.includes(view.unit.id)) {
    throw new NotFoundError("No admission with that id on your units.");
  }
  if (view.dischargedAt) {
    throw new ConflictError(`${view.name} was discharged at ${view.dischargedAt}.`);
  }
  return view;
}

/** The admission row locked, refusing one that was discharged meanwhile. */
async function lockOpenAdmission(
  trx: Knex.Transaction,
  admissionId: number,
): Promise<AdmissionRow> {
  const row = (await trx("admissions")
    .where({ id: admissionId })
    .forUpdate()
    .first()) as AdmissionRow;
  if (row.discharged_at) {
    throw new ConflictError("The patient was discharged by someone else a moment ago.");
  }
  return row;
}

/** An event time given by the user: not in the future, not before `earliest`. */
function checkEventTime(
  field: string,
  label: string,
  at: Date | undefined,
  now: Date,
  earliest: Date,
): Date {
  if (!at) return now;
  if (at.getTime() > now.getTime() + 5 * 60_000 || at.getTime() < earliest.getTime()) {
    throw new ValidationError("Some fields need attention.", {
      [field]: [
        `${label} must be between ${earliest.toISOString().slice(0, 16)} and now (UTC), not in the future.`,
      ],
    });
  }
  return at;
}

const sameText = (a: string, b: string) => a.trim().toLowerCase() === b.trim().toLowerCase();

/**
 * A returning patient is the stored one: the MRN finds them, and a name, date
 * of birth or sex that does not match is refused (a mistyped MRN must not
 * admit one patient under another's record).
 */
async function findOrCreatePatient(
  trx: Knex.Transaction,
  details: PatientDetails,
): Promise<{ id: number; returning: boolean }> {
  const stored = (await trx("patients").where({ mrn: details.mrn }).forUpdate().first()) as
    | {
        id: number;
        family_name: string;
        given_name: string;
        birth_date: Date | string;
        sex: string;
        version: number;
      }
    | undefined;
  if (!stored) {
    try {
      const [id] = await trx("patients").insert({
        mrn: details.mrn,
        family_name: details.familyName,
        given_name: details.givenName,
        birth_date: details.birthDate,
        sex: details.sex,
        height_cm: details.heightCm ?? null,
        weight_kg: details.weightKg ?? null,
      });
      return { id: Number(id), returning: false };
    } catch (error) {
      if (duplicateIndex(error) === "patients_mrn_unique") {
        throw new ConflictError(
          `MRN ${details.mrn} was registered by someone else a moment ago; search for it and admit the patient found.`,
          { mrn: ["Registered a moment ago by someone else."] },
        );
      }
      throw error;
    }
  }
  const birth =
    typeof stored.birth_date === "string"
      ? stored.birth_date.slice(0, 10)
      : stored.birth_date.toISOString().slice(0, 10);
  if (
    !sameText(stored.family_name, details.familyName) ||
    !sameText(stored.given_name, details.givenName) ||
    birth !== details.birthDate ||
    stored.sex !== details.sex
  ) {
    throw new ConflictError(
      `MRN ${details.mrn} belongs to ${stored.family_name}, ${stored.given_name} (born ${birth}, ${stored.sex}), not to the patient typed. Check the MRN, or use the stored details.`,
      { mrn: [`Belongs to ${stored.family_name}, ${stored.given_name}, born ${birth}.`] },
    );
  }
  // Height and weight change over a life; a returning patient's new values win.
  if (details.heightCm !== undefined || details.weightKg !== undefined) {
    await trx("patients")
      .where({ id: stored.id })
      .update({
        ...(details.heightCm !== undefined ? { height_cm: details.heightCm } : {}),
        ...(details.weightKg !== undefined ? { weight_kg: details.weightKg } : {}),
        version: stored.version + 1,
      });
  }
  return { id: stored.id, returning: true };
}

/** Both open-admission indexes in the user's words: a bed race or a double admission. */
function rethrowOccupied(error: unknown, bedLabel: string, who: string): never {
  const index = duplicateIndex(error);
  if (index === "admissions_open_bed_id_unique") {
    throw new ConflictError(
      `Bed ${bedLabel} is no longer free: another patient was put in it a moment ago. Choose another bed.`,
      { bedId: [`Bed ${bedLabel} is taken.`] },
    );
  }
  if (index === "admissions_open_patient_id_unique") {
    throw new ConflictError(`${who} is already admitted; find them with the search and move them.`);
  }
  throw error;
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
  const bed = await bedForActor(knex, actor, input.bedId);
  const who = `${input.familyName}, ${input.givenName} (MRN ${input.mrn})`;
  return once(knex, actor.id, input.idempotencyKey, "patient.admit", async (trx) => {
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
    const view = { ...(await admissionView(trx, admissionId)), returning: patient.returning };
    await appendLedger(
      trx,
      actor,
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
  });
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
 * Moves a patient to another bed. The admission keeps its id, so its orders,
 * settings, readings, alerts and ledger chain follow; open alerts take the new
 * bed, and its care team is told of them.
 */
export async function transferPatient(
  knex: Knex,
  actor: Actor,
  input: TransferData,
  now: Date = new Date(),
): Promise<AdmissionView> {
  const from = await openAdmissionForActor(knex, actor, input.admissionId);
  const to = await bedForActor(knex, actor, input.bedId);
  if (to.bed_id === from.bed.id) {
    throw new ValidationError("Some fields need attention.", {
      bedId: [`${from.name} is already in bed ${from.bed.label}.`],
    });
  }
  return once(knex, actor.id, input.idempotencyKey, "patient.transfer", async (trx) => {
    await lockPatientChain(trx, from.patientId);
    const row = await lockOpenAdmission(trx, from.admissionId);
    const device = await deviceInEffect(trx, from.admissionId);
    if (device && !parseDevices(to.devices_json).includes(device)) {
      throw new ConflictError(
        `${to.unit_name} does not allow ${DEVICE_PROFILES[device].label}, the device of the order in effect. Change the order first, or move the patient to a unit that allows it.`,
        { bedId: [`${to.unit_name} does not allow ${DEVICE_PROFILES[device].label}.`] },
      );
    }
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
    const after = await admissionView(trx, row.id);
    const entry = await appendLedger(
      trx,
      actor,
      {
        action: "patient.transfer",
        entityType: "admission",
        entityId: row.id,
        patientId: from.patientId,
        unitId: to.unit_id,
        before: { bed: from.bed, unit: from.unit },
        after: { bed: after.bed, unit: after.unit, ordersMoved, alertsMoved: openAlerts.length },
        rationale: input.rationale,
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
  });
}

/**
 * Discharges a patient: the order in effect is discontinued with the reason,
 * open alerts are resolved, the bed is freed. Every record stays readable.
 */
export async function dischargePatient(
  knex: Knex,
  actor: Actor,
  input: DischargeData,
  now: Date = new Date(),
): Promise<AdmissionView> {
  const current = await openAdmissionForActor(knex, actor, input.admissionId);
  const dischargedAt = checkEventTime(
    "dischargedAt",
    "Discharge time",
    input.dischargedAt,
    now,
    new Date(current.admittedAt),
  );
  const reason = `Discharged: ${DISPOSITION_LABELS[input.disposition].toLowerCase()}${input.rationale ? ` (${input.rationale})` : ""}`;
  return once(knex, actor.id, input.idempotencyKey, "patient.discharge", async (trx) => {
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
          discontinued_by: actor.id,
          discontinued_at: dischargedAt,
          discontinue_reason: reason,
          version: order.version + 1,
          updated_at: now,
        });
      await appendLedger(
        trx,
        actor,
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
      await closeAlert(trx, actor, place, alert, reason, dischargedAt, now, actor.id);
    }
    await trx("admissions").where({ id: row.id }).update({
      discharged_at: dischargedAt,
      discharge_disposition: input.disposition,
    });
    const after = await admissionView(trx, row.id);
    await appendLedger(
      trx,
      actor,
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
  });
}
