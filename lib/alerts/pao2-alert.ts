import type { Knex } from "knex";
import { lockPatientChain, type LedgerActor } from "../ledger/service";
import { onSupplementalOxygen } from "../oxygen/oximetry";
import { alertConfig, type AlertConfig } from "./config";
import { closeAlert, openAlert, openAlertOf, type AlertAdmission } from "./lifecycle";
import { currentOrder, num } from "./triggers";

// Hyperoxaemia by PaO2: the one alert a blood gas raises or closes.

/** One blood gas just written, as the PaO2 band check sees it. */
export type RecordedGas = {
  sampledAt: Date;
  sampleType: "arterial" | "venous";
  pao2: number;
  fio2: number;
  flow: number | null;
};

/**
 * Hyperoxaemia by PaO2: an arterial gas above the order's PaO2 band while on
 * supplemental oxygen opens "PaO2 above target" for the nurse (the proposal
 * weans); a later arterial gas that is not above it closes it. A gas older
 * than the newest one already recorded changes nothing.
 */
export async function afterBloodGasRecorded(
  trx: Knex.Transaction,
  actor: LedgerActor,
  admission: AlertAdmission,
  gas: RecordedGas,
  now: Date,
  cfg: AlertConfig = alertConfig(),
): Promise<void> {
  if (gas.sampleType !== "arterial") return;
  await lockPatientChain(trx, admission.patientId);
  const newer = (await trx("blood_gases")
    .where({ admission_id: admission.admissionId, sample_type: "arterial" })
    .where("sampled_at", ">", gas.sampledAt)
    .first("id")) as { id: number } | undefined;
  if (newer) return;
  const order = await currentOrder(trx, admission.patientId);
  const upper = order ? num(order.pao2_upper_mmhg) : null;
  const lower = order ? num(order.pao2_lower_mmhg) : null;
  const open = await openAlertOf(trx, admission.admissionId, "pao2_above_band");
  const above = upper !== null && gas.pao2 > upper && onSupplementalOxygen(gas);
  if (above && !open) {
    await openAlert(
      trx,
      actor,
      admission,
      {
        kind: "pao2_above_band",
        grade: "routine",
        startedAt: gas.sampledAt,
        orderId: order!.id,
        band: { lower: order!.spo2_lower_pct, upper: order!.spo2_upper_pct },
        spo2: null,
        level: 0,
        detail: {
          pao2: gas.pao2,
          pao2Band: { lower, upper },
          fio2: gas.fio2,
          sampledAt: gas.sampledAt.toISOString(),
        },
        chartedBy: actor.id,
      },
      now,
      cfg,
    );
  } else if (!above && open) {
    await closeAlert(
      trx,
      actor,
      admission,
      open,
      upper !== null && gas.pao2 > upper
        ? `PaO2 ${gas.pao2} mmHg, now on room air.`
        : `A later arterial gas: PaO2 ${gas.pao2} mmHg, not above the PaO2 band.`,
      gas.sampledAt,
      now,
    );
  }
}
