import type { Knex } from "knex";
import { getEnv } from "../env";
import type { Fio2Forecast } from "../oxygen/forecast";
import type {
  AdjustmentEvent,
  AdmissionEvents,
  BloodGasEvent,
  OrderChangeEvent,
  PairingSettings,
} from "./types";

type Events = {
  adjustments: AdjustmentEvent[];
  bloodGases: BloodGasEvent[];
  orderChanges: OrderChangeEvent[];
};

/**
 * The reads behind forecast accountability: each admission's recorded
 * changes (with the forecast stored beside each), its blood gases and its
 * order changes, as the pure pairing takes them.
 */

/** The site's window (FORECAST_CHECK_MIN_MINUTES / _MAX_MINUTES). */
export function pairingSettings(): PairingSettings {
  const env = getEnv();
  return { minMinutes: env.FORECAST_CHECK_MIN_MINUTES, maxMinutes: env.FORECAST_CHECK_MAX_MINUTES };
}

type AdjustmentRow = {
  id: number;
  admission_id: number;
  applied_at: Date;
  from_fio2: string | number;
  to_fio2: string | number;
  from_peep_cmh2o: string | number | null;
  to_peep_cmh2o: string | number | null;
  device: string;
  forecast_json: string | null;
};
type GasRow = {
  id: number;
  admission_id: number;
  sampled_at: Date;
  sample_type: "arterial" | "venous";
  pao2_mmhg: string | number;
};
type OrderRow = { admission_id: number; created_at: Date; discontinued_at: Date | null };

const num = (v: string | number) => Number(v);
const numOrNull = (v: string | number | null) => (v === null ? null : Number(v));

function parseForecast(json: string | null): Fio2Forecast | null {
  if (!json) return null;
  const parsed = JSON.parse(json) as Partial<Fio2Forecast> | null;
  // Only a forecast with its three models and range can be checked.
  return parsed?.models && parsed.range ? (parsed as Fio2Forecast) : null;
}

/**
 * Every admission's events, keyed by admission. Changes are read from
 * `from` (all, without it); gases and order changes from the first change
 * on, so a change near the start of a period still finds what followed it.
 */
export async function loadAdmissionEvents(
  knex: Knex,
  admissionIds: readonly number[],
  window: { from?: Date; to?: Date } = {},
): Promise<Map<number, AdmissionEvents>> {
  const out = new Map<number, Events>();
  if (admissionIds.length === 0) return out;
  const changes = knex("adjustments")
    .whereIn("admission_id", admissionIds)
    .orderBy(["applied_at", "id"])
    .select(
      "id",
      "admission_id",
      "applied_at",
      "from_fio2",
      "to_fio2",
      "from_peep_cmh2o",
      "to_peep_cmh2o",
      "device",
      "forecast_json",
    );
  if (window.from) void changes.where("applied_at", ">=", window.from);
  if (window.to) void changes.where("applied_at", "<", window.to);
  const adjustments = (await changes) as AdjustmentRow[];
  for (const id of admissionIds) out.set(id, { adjustments: [], bloodGases: [], orderChanges: [] });
  if (adjustments.length === 0) return out;
  const since = adjustments[0]!.applied_at;
  const withChanges = [...new Set(adjustments.map((a) => a.admission_id))];
  const [gases, orders] = (await Promise.all([
    knex("blood_gases")
      .whereIn("admission_id", withChanges)
      .where("sampled_at", ">", since)
      .orderBy(["sampled_at", "id"])
      .select("id", "admission_id", "sampled_at", "sample_type", "pao2_mmhg"),
    knex("orders")
      .whereIn("admission_id", withChanges)
      .whereNot("status", "draft")
      .select("admission_id", "created_at", "discontinued_at"),
  ])) as [GasRow[], OrderRow[]];
  for (const a of adjustments)
    out.get(a.admission_id)!.adjustments.push({
      id: a.id,
      appliedAt: a.applied_at,
      fromFio2: num(a.from_fio2),
      toFio2: num(a.to_fio2),
      fromPeep: numOrNull(a.from_peep_cmh2o),
      toPeep: numOrNull(a.to_peep_cmh2o),
      device: a.device,
      forecast: parseForecast(a.forecast_json),
    });
  for (const g of gases)
    out.get(g.admission_id)!.bloodGases.push({
      id: g.id,
      sampledAt: g.sampled_at,
      sampleType: g.sample_type,
      pao2: num(g.pao2_mmhg),
    });
  for (const o of orders) {
    const changesOf = out.get(o.admission_id)!.orderChanges;
    // A new or superseding order starts; a discontinued one ends (a superseded
    // one ends when its successor starts, which is already a change).
    changesOf.push({ at: o.created_at });
    if (o.discontinued_at) changesOf.push({ at: o.discontinued_at });
  }
  return out;
}
