import type { Knex } from "knex";
import type { Device } from "../devices";
import type { BandPeriod } from "../time-in-band";
import type { OrderSettingsInput } from "./buckets";

type OrderRow = {
  admission_id: number;
  status: "active" | "awaiting_cosign" | "superseded" | "discontinued";
  device: Device;
  spo2_lower_pct: number;
  spo2_upper_pct: number;
  reassess_minutes: number;
  initial_fio2: number;
  initial_flow_l_min: number | null;
  created_at: Date;
  ended_at: Date;
};

const inEffect = (o: OrderRow) => o.status === "active" || o.status === "awaiting_cosign";

/**
 * The SpO2 bands and starting settings of each admission's orders over time:
 * an order holds from its writing until it is discontinued or superseded
 * (a draft never held). The Board, the Handoff and the rollups share it.
 */
export async function loadBandsOf(
  knex: Knex | Knex.Transaction,
  admissionIds: readonly number[],
): Promise<Map<number, { bands: BandPeriod[]; orders: OrderSettingsInput[] }>> {
  const out = new Map(
    admissionIds.map((id) => [
      id,
      { bands: [] as BandPeriod[], orders: [] as OrderSettingsInput[] },
    ]),
  );
  if (admissionIds.length === 0) return out;
  const rows = (await knex("orders")
    .whereIn("admission_id", admissionIds)
    .whereNot("status", "draft")
    .orderBy("created_at")
    .select(
      "admission_id",
      "status",
      "device",
      "spo2_lower_pct",
      "spo2_upper_pct",
      "reassess_minutes",
      "initial_fio2",
      "initial_flow_l_min",
      "created_at",
      knex.raw("COALESCE(discontinued_at, updated_at) AS ended_at"),
    )) as OrderRow[];
  for (const o of rows) {
    const entry = out.get(o.admission_id)!;
    const to = inEffect(o) ? null : o.ended_at;
    entry.bands.push({
      from: o.created_at,
      to,
      lower: o.spo2_lower_pct,
      upper: o.spo2_upper_pct,
      reassessMinutes: o.reassess_minutes,
    });
    entry.orders.push({
      from: o.created_at.getTime(),
      to: to ? to.getTime() : Infinity,
      device: o.device,
      initialFio2: Number(o.initial_fio2),
      initialFlow: o.initial_flow_l_min === null ? null : Number(o.initial_flow_l_min),
    });
  }
  return out;
}

export async function loadBands(knex: Knex | Knex.Transaction, admissionId: number) {
  return (await loadBandsOf(knex, [admissionId])).get(admissionId)!;
}
