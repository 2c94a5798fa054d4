import type { Knex } from "knex";
import { DEVICE_PROFILES, estimateFio2 } from "../devices";
import type { OrderView } from "./queries";

/** A new order's starting settings become what is applied at the bedside, in the order's transaction. */
export async function applyStartingSettings(trx: Knex.Transaction, order: OrderView, now: Date) {
  const profile = DEVICE_PROFILES[order.device];
  const estimated = profile.uses.fio2 === "estimated";
  const settings = {
    device: order.device,
    fio2: estimated
      ? (estimateFio2(order.device, order.initial.flow) ?? order.initial.fio2)
      : order.initial.fio2,
    fio2_estimated: estimated,
    peep_cmh2o: order.initial.peep,
    flow_l_min: order.initial.flow,
  };
  const existing = (await trx("bedside_settings")
    .where({ admission_id: order.admissionId })
    .forUpdate()
    .first("version")) as { version: number } | undefined;
  if (existing) {
    await trx("bedside_settings")
      .where({ admission_id: order.admissionId })
      .update({
        ...settings,
        version: existing.version + 1,
        updated_at: now,
        last_reassessed_at: now,
      });
  } else {
    await trx("bedside_settings").insert({
      admission_id: order.admissionId,
      patient_id: order.patientId,
      ...settings,
      updated_at: now,
      last_reassessed_at: now,
    });
  }
  return settings;
}
