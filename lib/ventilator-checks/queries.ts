import type { Knex } from "knex";
import type { Breach, CheckIndices, LungProtectionLimits } from "../ventilation/evaluate";
import type { VentMode } from "../ventilation/settings";

/** One ventilator check as the Chart and the API show it. */
export type VentilatorCheckView = {
  id: number;
  patientId: number;
  orderId: number;
  checkedAt: string;
  mode: VentMode;
  setVt: number | null;
  measuredVt: number;
  setRate: number | null;
  measuredRate: number;
  minuteVentilation: number | null;
  peak: number | null;
  plateau: number | null;
  totalPeep: number;
  /** The PaCO2 of the latest arterial gas before the check, when one was recent enough. */
  paco2: { value: number; bloodGasId: number } | null;
  pbwKg: number;
  /** Each computed number with its basis (inputs, formula, source, assumptions). */
  indices: CheckIndices;
  /** The order's limits the check was held against, and the target range. */
  limits: LungProtectionLimits & { vtTargetMlKg: number; vtMinMlKg: number };
  breaches: Breach[];
  recordedBy: { id: number; name: string };
  engineVersion: string;
};

export type VentilatorCheckRow = {
  id: number;
  patient_id: number;
  order_id: number;
  checked_at: Date;
  vent_mode: VentMode;
  set_vt_ml: number | null;
  measured_vt_ml: number;
  set_rate_per_min: number | null;
  measured_rate_per_min: number;
  minute_ventilation_l_min: number | null;
  peak_cmh2o: number | null;
  plateau_cmh2o: number | null;
  total_peep_cmh2o: number;
  paco2_mmhg: number | null;
  paco2_blood_gas_id: number | null;
  pbw_kg: number;
  limits_json: string;
  breaches_json: string;
  indices_json: string;
  engine_version: string;
  recorded_by: number;
  recorded_by_name: string;
};

const num = (v: number | string | null) => (v === null ? null : Number(v));

export function toCheckView(r: VentilatorCheckRow): VentilatorCheckView {
  return {
    id: r.id,
    patientId: r.patient_id,
    orderId: r.order_id,
    checkedAt: new Date(r.checked_at).toISOString(),
    mode: r.vent_mode,
    setVt: num(r.set_vt_ml),
    measuredVt: Number(r.measured_vt_ml),
    setRate: num(r.set_rate_per_min),
    measuredRate: Number(r.measured_rate_per_min),
    minuteVentilation: num(r.minute_ventilation_l_min),
    peak: num(r.peak_cmh2o),
    plateau: num(r.plateau_cmh2o),
    totalPeep: Number(r.total_peep_cmh2o),
    paco2:
      r.paco2_mmhg !== null && r.paco2_blood_gas_id !== null
        ? { value: Number(r.paco2_mmhg), bloodGasId: r.paco2_blood_gas_id }
        : null,
    pbwKg: Number(r.pbw_kg),
    indices: JSON.parse(r.indices_json) as CheckIndices,
    limits: JSON.parse(r.limits_json) as VentilatorCheckView["limits"],
    breaches: JSON.parse(r.breaches_json) as Breach[],
    recordedBy: { id: r.recorded_by, name: r.recorded_by_name },
    engineVersion: r.engine_version,
  };
}

function checkQuery(knex: Knex): Knex.QueryBuilder {
  return knex("ventilator_checks as v")
    .join("users as u", "u.id", "v.recorded_by")
    .select("v.*", "u.name as recorded_by_name");
}

/** One check by id. */
export async function getVentilatorCheck(
  knex: Knex,
  id: number,
): Promise<VentilatorCheckView | null> {
  const row = (await checkQuery(knex).where("v.id", id).first()) as VentilatorCheckRow | undefined;
  return row ? toCheckView(row) : null;
}

/** An admission's checks, newest first. */
export async function listVentilatorChecks(
  knex: Knex,
  admissionId: number,
  limit = 50,
): Promise<VentilatorCheckView[]> {
  const rows = (await checkQuery(knex)
    .where("v.admission_id", admissionId)
    .orderBy("v.checked_at", "desc")
    .orderBy("v.id", "desc")
    .limit(limit)) as VentilatorCheckRow[];
  return rows.map(toCheckView);
}
