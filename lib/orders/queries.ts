import type { Knex } from "knex";
import { unitCosigners, type Cosigners } from "./cosigners";
import type { Device } from "../devices";
import type { VentilatorOrderSettings, VentMode } from "../ventilation/settings";

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
  /** Invasive ventilation and NIV: mode, tidal volume target, rate range, pressure limits. */
  ventilator: VentilatorOrderSettings | null;
  reassessMinutes: number;
  rationale: string;
  entryMode: "written" | "verbal" | "telephone";
  enteredBy: { id: number; name: string };
  prescriber: { id: number; name: string };
  /** Read back to the prescriber (verbal and telephone orders). */
  readBackConfirmed: boolean;
  signedBy: { id: number; name: string } | null;
  signedAt: string | null;
  signatureMeaning: string | null;
  cosignedBy: { id: number; name: string } | null;
  cosignedAt: string | null;
  discontinuedBy: { id: number; name: string } | null;
  discontinuedAt: string | null;
  discontinueReason: string | null;
  /** The order that replaced this one, and when it was entered. */
  supersededBy: { id: number; at: string } | null;
  /** The order this one replaced, if any. */
  replacedOrderId: number | null;
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
  vent_mode: VentMode | null;
  vt_target_ml_kg: number | null;
  vt_min_ml_kg: number | null;
  vt_max_ml_kg: number | null;
  rate_min_per_min: number | null;
  rate_max_per_min: number | null;
  plateau_limit_cmh2o: number | null;
  driving_limit_cmh2o: number | null;
  pbw_kg: number | null;
  pbw_height_cm: number | null;
  reassess_minutes: number;
  rationale: string;
  entry_mode: "written" | "verbal" | "telephone";
  read_back_confirmed: number;
  entered_by: number;
  entered_by_name: string;
  prescriber_id: number;
  prescriber_name: string;
  signed_by: number | null;
  signed_by_name: string | null;
  signed_at: Date | null;
  signature_meaning: string | null;
  cosigned_by: number | null;
  cosigned_by_name: string | null;
  cosigned_at: Date | null;
  discontinued_by: number | null;
  discontinued_by_name: string | null;
  discontinued_at: Date | null;
  discontinue_reason: string | null;
  superseded_by_order_id: number | null;
  superseded_at: Date | null;
  replaced_order_id: number | null;
  version: number;
  created_at: Date;
  updated_at: Date;
};

const iso = (d: Date | null) => (d ? d.toISOString() : null);
const person = (id: number | null, name: string | null) =>
  id !== null ? { id, name: name ?? "" } : null;

/** The ventilator part of an order row; null on devices without one. */
function ventilatorOf(r: OrderRow): VentilatorOrderSettings | null {
  if (r.vent_mode === null) return null;
  return {
    mode: r.vent_mode,
    vtTargetMlKg: Number(r.vt_target_ml_kg),
    vtMinMlKg: Number(r.vt_min_ml_kg),
    vtMaxMlKg: Number(r.vt_max_ml_kg),
    rateMin: Number(r.rate_min_per_min),
    rateMax: Number(r.rate_max_per_min),
    plateauLimit: Number(r.plateau_limit_cmh2o),
    drivingLimit: Number(r.driving_limit_cmh2o),
    pbwKg: Number(r.pbw_kg),
    heightCm: Number(r.pbw_height_cm),
  };
}

/** An order row from `orderQuery` as the views and the ledger show it. */
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
    ventilator: ventilatorOf(r),
    reassessMinutes: r.reassess_minutes,
    rationale: r.rationale,
    entryMode: r.entry_mode,
    enteredBy: { id: r.entered_by, name: r.entered_by_name },
    prescriber: { id: r.prescriber_id, name: r.prescriber_name },
    readBackConfirmed: Boolean(r.read_back_confirmed),
    signedBy: person(r.signed_by, r.signed_by_name),
    signedAt: iso(r.signed_at),
    signatureMeaning: r.signature_meaning,
    cosignedBy: person(r.cosigned_by, r.cosigned_by_name),
    cosignedAt: iso(r.cosigned_at),
    discontinuedBy: person(r.discontinued_by, r.discontinued_by_name),
    discontinuedAt: iso(r.discontinued_at),
    discontinueReason: r.discontinue_reason,
    supersededBy:
      r.superseded_by_order_id !== null
        ? {
            id: r.superseded_by_order_id,
            // superseded_by_order_id has no foreign key: without that row, when this one last changed.
            at: (r.superseded_at ?? r.updated_at).toISOString(),
          }
        : null,
    replacedOrderId: r.replaced_order_id,
    version: r.version,
    createdAt: r.created_at.toISOString(),
  };
}

/**
 * Orders joined with the names the views show, the order that replaced each
 * and the one each replaced; `asOf` reads the system-versioned history of the
 * order itself (names and the linked orders are read as they are now).
 */
export function orderQuery(knex: Knex, asOf?: Date): Knex.QueryBuilder {
  const from = asOf
    ? knex.raw("orders FOR SYSTEM_TIME AS OF TIMESTAMP ? AS o", [asOf])
    : knex.raw("orders AS o");
  return knex
    .from(from)
    .join("users as eb", "eb.id", "o.entered_by")
    .join("users as pr", "pr.id", "o.prescriber_id")
    .leftJoin("users as sb", "sb.id", "o.signed_by")
    .leftJoin("users as cs", "cs.id", "o.cosigned_by")
    .leftJoin("users as dc", "dc.id", "o.discontinued_by")
    .leftJoin("orders as nx", "nx.id", "o.superseded_by_order_id")
    .select(
      "o.*",
      "eb.name as entered_by_name",
      "pr.name as prescriber_name",
      "sb.name as signed_by_name",
      "cs.name as cosigned_by_name",
      "dc.name as discontinued_by_name",
      "nx.created_at as superseded_at",
      // Same patient first, so the patient index narrows the search.
      knex.raw(
        "(SELECT MIN(r.id) FROM orders AS r WHERE r.patient_id = o.patient_id AND r.superseded_by_order_id = o.id) AS replaced_order_id",
      ),
    );
}

/** The order in effect for a patient (active or awaiting co-signature), if any. */
export async function getCurrentOrder(knex: Knex, patientId: number): Promise<OrderView | null> {
  const row = (await orderQuery(knex).where("o.current_patient_id", patientId).first()) as
    OrderRow | undefined;
  return row ? toOrderView(row) : null;
}

/** One order, as it stands now or as it stood at `asOf`; null when there is none (then). */
export async function getOrder(
  knex: Knex,
  orderId: number,
  asOf?: Date,
): Promise<OrderView | null> {
  const row = (await orderQuery(knex, asOf).where("o.id", orderId).first()) as OrderRow | undefined;
  return row ? toOrderView(row) : null;
}

/** An order in the co-sign queue, with where it lies and the unit's clock. */
export type CosignQueueEntry = OrderView & {
  bedLabel: string;
  patientName: string;
  unitCode: string;
  /** The unit's time zone: the queue shows times on it. */
  timeZone: string;
  /** Who may co-sign it: the queue offers co-signing only to them. */
  cosigners: Cosigners;
};

/** Verbal and telephone orders in the caller's units still waiting for a physician's co-signature. */
export async function listCosignQueue(
  knex: Knex,
  unitIds: readonly number[],
): Promise<CosignQueueEntry[]> {
  if (unitIds.length === 0) return [];
  const rows = (await orderQuery(knex)
    .join("admissions as a", "a.id", "o.admission_id")
    .join("beds as b", "b.id", "a.bed_id")
    .join("patients as p", "p.id", "o.patient_id")
    .join("units as un", "un.id", "o.unit_id")
    .where("o.status", "awaiting_cosign")
    .whereIn("o.unit_id", unitIds)
    .orderBy("o.created_at")
    .select(
      "b.label as bed_label",
      knex.raw("CONCAT(p.given_name, ' ', p.family_name) AS patient_name"),
      "un.code as unit_code",
      "un.time_zone",
    )) as (OrderRow & {
    bed_label: string;
    patient_name: string;
    unit_code: string;
    time_zone: string;
  })[];
  const designated = await unitCosigners(knex, [...new Set(rows.map((r) => r.unit_id))]);
  return rows.map((r) => {
    const order = toOrderView(r);
    return {
      ...order,
      bedLabel: r.bed_label,
      patientName: r.patient_name,
      unitCode: r.unit_code,
      timeZone: r.time_zone,
      cosigners: { prescriber: order.prescriber, designated: designated.get(r.unit_id) ?? [] },
    };
  });
}
