import type { Knex } from "knex";
import type { Device } from "./devices";

export type OrderStatus = "draft" | "awaiting_cosign" | "active" | "superseded" | "discontinued";

export type OrderView = {
  id: number;
  patientId: number;
  admissionId: number;
  unitId: number;
  status: OrderStatus;
  device: Device;
  spo2Band: { lower: number; upper: number };
  pao2Band: { lower: number; upper: number } | null;
  limits: {
    fio2Min: number;
    fio2Max: number;
    peepMin: number | null;
    peepMax: number | null;
    flowMin: number | null;
    flowMax: number | null;
  };
  initial: { fio2: number; peep: number | null; flow: number | null };
  stepTableId: number | null;
  reassessMinutes: number;
  rationale: string;
  entryMode: "written" | "verbal" | "telephone";
  enteredBy: { id: number; name: string };
  prescriber: { id: number; name: string };
  signedAt: string | null;
  signatureMeaning: string | null;
  cosignedBy: { id: number; name: string } | null;
  cosignedAt: string | null;
  discontinuedAt: string | null;
  discontinueReason: string | null;
  version: number;
  createdAt: string;
};

export type OrderRow = {
  id: number;
  patient_id: number;
  admission_id: number;
  unit_id: number;
  status: OrderStatus;
  device: Device;
  spo2_lower_pct: number;
  spo2_upper_pct: number;
  pao2_lower_mmhg: number | null;
  pao2_upper_mmhg: number | null;
  fio2_min: number;
  fio2_max: number;
  peep_min_cmh2o: number | null;
  peep_max_cmh2o: number | null;
  flow_min_l_min: number | null;
  flow_max_l_min: number | null;
  initial_fio2: number;
  initial_peep_cmh2o: number | null;
  initial_flow_l_min: number | null;
  step_table_id: number | null;
  reassess_minutes: number;
  rationale: string;
  entry_mode: "written" | "verbal" | "telephone";
  entered_by: number;
  entered_by_name: string;
  prescriber_id: number;
  prescriber_name: string;
  signed_at: Date | null;
  signature_meaning: string | null;
  cosigned_by: number | null;
  cosigned_by_name: string | null;
  cosigned_at: Date | null;
  discontinued_at: Date | null;
  discontinue_reason: string | null;
  version: number;
  created_at: Date;
};

const iso = (d: Date | null) => (d ? d.toISOString() : null);

export function toOrderView(r: OrderRow): OrderView {
  return {
    id: r.id,
    patientId: r.patient_id,
    admissionId: r.admission_id,
    unitId: r.unit_id,
    status: r.status,
    device: r.device,
    spo2Band: { lower: r.spo2_lower_pct, upper: r.spo2_upper_pct },
    pao2Band:
      r.pao2_lower_mmhg !== null && r.pao2_upper_mmhg !== null
        ? { lower: r.pao2_lower_mmhg, upper: r.pao2_upper_mmhg }
        : null,
    limits: {
      fio2Min: r.fio2_min,
      fio2Max: r.fio2_max,
      peepMin: r.peep_min_cmh2o,
      peepMax: r.peep_max_cmh2o,
      flowMin: r.flow_min_l_min,
      flowMax: r.flow_max_l_min,
    },
    initial: { fio2: r.initial_fio2, peep: r.initial_peep_cmh2o, flow: r.initial_flow_l_min },
    stepTableId: r.step_table_id,
    reassessMinutes: r.reassess_minutes,
    rationale: r.rationale,
    entryMode: r.entry_mode,
    enteredBy: { id: r.entered_by, name: r.entered_by_name },
    prescriber: { id: r.prescriber_id, name: r.prescriber_name },
    signedAt: iso(r.signed_at),
    signatureMeaning: r.signature_meaning,
    cosignedBy:
      r.cosigned_by !== null ? { id: r.cosigned_by, name: r.cosigned_by_name ?? "" } : null,
    cosignedAt: iso(r.cosigned_at),
    discontinuedAt: iso(r.discontinued_at),
    discontinueReason: r.discontinue_reason,
    version: r.version,
    createdAt: r.created_at.toISOString(),
  };
}

/** Orders joined with the names the views show; `asOf` reads the system-versioned history. */
export function orderQuery(knex: Knex, asOf?: Date): Knex.QueryBuilder {
  const from = asOf
    ? knex.raw("orders FOR SYSTEM_TIME AS OF TIMESTAMP ? AS o", [asOf])
    : knex.raw("orders AS o");
  return knex
    .from(from)
    .join("users as eb", "eb.id", "o.entered_by")
    .join("users as pr", "pr.id", "o.prescriber_id")
    .leftJoin("users as cs", "cs.id", "o.cosigned_by")
    .select(
      "o.*",
      "eb.name as entered_by_name",
      "pr.name as prescriber_name",
      "cs.name as cosigned_by_name",
    );
}

/** The order in effect for a patient (active or awaiting co-signature), if any. */
export async function getCurrentOrder(knex: Knex, patientId: number): Promise<OrderView | null> {
  const row = (await orderQuery(knex).where("o.current_patient_id", patientId).first()) as
    OrderRow | undefined;
  return row ? toOrderView(row) : null;
}

export async function getOrder(
  knex: Knex,
  orderId: number,
  asOf?: Date,
): Promise<OrderView | null> {
  const row = (await orderQuery(knex, asOf).where("o.id", orderId).first()) as OrderRow | undefined;
  return row ? toOrderView(row) : null;
}

/** Verbal and telephone orders in the caller's units still waiting for a physician's co-signature. */
export async function listCosignQueue(
  knex: Knex,
  unitIds: readonly number[],
): Promise<(OrderView & { bedLabel: string; patientName: string })[]> {
  if (unitIds.length === 0) return [];
  const rows = (await orderQuery(knex)
    .join("admissions as a", "a.id", "o.admission_id")
    .join("beds as b", "b.id", "a.bed_id")
    .join("patients as p", "p.id", "o.patient_id")
    .where("o.status", "awaiting_cosign")
    .whereIn("o.unit_id", unitIds)
    .orderBy("o.created_at")
    .select(
      "b.label as bed_label",
      knex.raw("CONCAT(p.given_name, ' ', p.family_name) AS patient_name"),
    )) as (OrderRow & {
    bed_label: string;
    patient_name: string;
  })[];
  return rows.map((r) => ({
    ...toOrderView(r),
    bedLabel: r.bed_label,
    patientName: r.patient_name,
  }));
}
