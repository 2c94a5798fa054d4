import type * as fhir4 from "fhir/r4";
import type { Knex } from "knex";
import { ADJUSTMENT_REASONS } from "../adjustments/schema";
import type { Actor } from "../auth/actor";
import type { Device } from "../devices";
import { orderQuery, type OrderRow, toOrderView } from "../orders/queries";
import { getPatientForActor } from "../admissions/queries";
import {
  buildPatientBundle,
  type FhirAdjustmentRow,
  type FhirBloodGasRow,
  type FhirPatientRecord,
  type FhirReadingRow,
} from "./bundle";

const num = (v: unknown): number => Number(v);
const numOrNull = (v: unknown): number | null => (v === null || v === undefined ? null : Number(v));
const iso = (v: unknown): string => (v as Date).toISOString();

/** A DATE column arrives as midnight UTC (the pool's time zone is Z). */
const dateOnly = (d: Date): string => d.toISOString().slice(0, 10);

/**
 * One patient's current admission as the FHIR export needs it: the patient,
 * every order of the admission, and readings, blood gases and adjustments
 * (from `since` on, if given), oldest first. Another unit's patient, or one
 * not admitted, is a NotFoundError, as everywhere else.
 */
export async function loadFhirRecord(
  knex: Knex,
  actor: Pick<Actor, "unitIds">,
  patientId: number,
  since?: Date,
): Promise<FhirPatientRecord> {
  const patient = await getPatientForActor(knex, actor, patientId);
  const admissionId = patient.admission.id;
  const from = <T extends Knex.QueryBuilder>(q: T, column: string): T =>
    (since ? q.where(column, ">=", since) : q) as T;

  const [orderRows, readingRows, gasRows, adjustmentRows] = await Promise.all([
    orderQuery(knex)
      .where("o.admission_id", admissionId)
      .orderBy([{ column: "o.created_at" }, { column: "o.id" }]) as Promise<OrderRow[]>,
    from(
      knex("readings as r")
        .leftJoin("users as u", "u.id", "r.recorded_by")
        .where("r.admission_id", admissionId)
        .orderBy([{ column: "r.taken_at" }, { column: "r.id" }])
        .select(
          "r.id",
          "r.taken_at",
          "r.spo2_pct",
          "r.respiratory_rate_per_min",
          "r.pulse_rate_per_min",
          "r.device",
          "r.flow_l_min",
          "r.fio2",
          "r.fio2_estimated",
          "r.source",
          "u.name as recorded_by_name",
        ),
      "r.taken_at",
    ) as Promise<Record<string, unknown>[]>,
    from(
      knex("blood_gases as g")
        .join("users as u", "u.id", "g.recorded_by")
        .where("g.admission_id", admissionId)
        .orderBy([{ column: "g.sampled_at" }, { column: "g.id" }])
        .select(
          "g.id",
          "g.sampled_at",
          "g.sample_type",
          "g.ph",
          "g.pao2_mmhg",
          "g.paco2_mmhg",
          "g.hco3_mmol_l",
          "g.base_excess_mmol_l",
          "g.sao2_pct",
          "g.hb_g_dl",
          "g.device",
          "g.fio2",
          "g.fio2_estimated",
          "g.peep_cmh2o",
          "u.name as recorded_by_name",
        ),
      "g.sampled_at",
    ) as Promise<Record<string, unknown>[]>,
    from(
      knex("adjustments as a")
        .join("users as u", "u.id", "a.recorded_by")
        .where("a.admission_id", admissionId)
        .orderBy([{ column: "a.applied_at" }, { column: "a.id" }])
        .select(
          "a.id",
          "a.order_id",
          "a.applied_at",
          "a.device",
          "a.to_fio2",
          "a.to_peep_cmh2o",
          "a.to_flow_l_min",
          "a.reason",
          "a.rationale",
          "u.name as recorded_by_name",
        ),
      "a.applied_at",
    ) as Promise<Record<string, unknown>[]>,
  ]);

  return {
    patient: {
      id: patient.id,
      mrn: patient.mrn,
      familyName: patient.familyName,
      givenName: patient.givenName,
      birthDate: dateOnly(patient.birthDate),
      sex: patient.sex,
    },
    orders: orderRows.map(toOrderView),
    readings: readingRows.map((r): FhirReadingRow => ({
      id: num(r.id),
      patientId: patient.id,
      takenAt: iso(r.taken_at),
      spo2: num(r.spo2_pct),
      respiratoryRate: numOrNull(r.respiratory_rate_per_min),
      pulseRate: numOrNull(r.pulse_rate_per_min),
      device: r.device as Device,
      flow: numOrNull(r.flow_l_min),
      fio2: num(r.fio2),
      fio2Estimated: Boolean(r.fio2_estimated),
      source: r.source as "manual" | "monitor",
      recordedBy: (r.recorded_by_name as string | null) ?? null,
    })),
    bloodGases: gasRows.map((g): FhirBloodGasRow => ({
      id: num(g.id),
      sampledAt: iso(g.sampled_at),
      sampleType: g.sample_type as "arterial" | "venous",
      ph: numOrNull(g.ph),
      po2MmHg: num(g.pao2_mmhg),
      pco2MmHg: num(g.paco2_mmhg),
      hco3MmolL: numOrNull(g.hco3_mmol_l),
      baseExcessMmolL: numOrNull(g.base_excess_mmol_l),
      so2Pct: numOrNull(g.sao2_pct),
      hbGDl: numOrNull(g.hb_g_dl),
      device: g.device as Device,
      fio2: num(g.fio2),
      fio2Estimated: Boolean(g.fio2_estimated),
      peepCmH2O: numOrNull(g.peep_cmh2o),
      recordedBy: g.recorded_by_name as string,
    })),
    adjustments: adjustmentRows.map((a): FhirAdjustmentRow => ({
      id: num(a.id),
      orderId: num(a.order_id),
      appliedAt: iso(a.applied_at),
      device: a.device as Device,
      fio2: num(a.to_fio2),
      peepCmH2O: numOrNull(a.to_peep_cmh2o),
      flowLMin: numOrNull(a.to_flow_l_min),
      reasonLabel: ADJUSTMENT_REASONS.find((x) => x.value === a.reason)?.label ?? String(a.reason),
      rationale: a.rationale as string,
      recordedBy: a.recorded_by_name as string,
    })),
  };
}

/**
 * The FHIR R4 export of one patient for an actor with access to their unit
 * (every role may read its own units), with the MRN for the download's name.
 */
export async function exportPatientFhir(
  knex: Knex,
  actor: Pick<Actor, "unitIds">,
  patientId: number,
  options: { installation: string; exportedAt?: Date; since?: Date },
): Promise<{ bundle: fhir4.Bundle; mrn: string }> {
  const record = await loadFhirRecord(knex, actor, patientId, options.since);
  const bundle = buildPatientBundle(record, {
    installation: options.installation,
    exportedAt: options.exportedAt ?? new Date(),
    ...(options.since ? { since: options.since } : {}),
  });
  return { bundle, mrn: record.patient.mrn };
}
