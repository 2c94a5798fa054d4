import type { Knex } from "knex";
import { lockPatientChain, type LedgerActor } from "../ledger/service";
import { alertConfig, type AlertConfig } from "./config";
import { closeAlert, openAlert, openAlertOf, updateDetail, type AlertAdmission } from "./lifecycle";

// Lung protection: the one alert a ventilator check raises or closes.

/** One ventilator check just written, as the lung-protection check sees it. */
export type RecordedVentilatorCheck = {
  checkId: number;
  checkedAt: Date;
  orderId: number;
  /** Each limit the check is beyond, in words ("plateau pressure 33 cmH2O (limit 30)"); empty when within. */
  breaches: string[];
};

/** The levels a lung-protection alert reaches at once: the physician, and the therapist beside. */
const PHYSICIAN_LEVEL = 2;
const THERAPIST_LEVEL = 1;

/**
 * A check beyond the order's lung-protective limits opens "Lung protection"
 * for the assigned therapist and the responsible physician at once (it is
 * theirs to act on, so it starts at the physician's level and does not
 * escalate further); a later check within the limits closes it. A check older
 * than the newest one already recorded changes nothing. Whoever recorded the
 * check is at the ventilator and is not e-mailed about it.
 */
export async function afterVentilatorCheckRecorded(
  trx: Knex.Transaction,
  actor: LedgerActor,
  admission: AlertAdmission,
  check: RecordedVentilatorCheck,
  now: Date,
  cfg: AlertConfig = alertConfig(),
): Promise<void> {
  await lockPatientChain(trx, admission.patientId);
  const newer = (await trx("ventilator_checks")
    .where({ admission_id: admission.admissionId })
    .where("checked_at", ">", check.checkedAt)
    .first("id")) as { id: number } | undefined;
  if (newer) return;
  const open = await openAlertOf(trx, admission.admissionId, "lung_protection");
  if (check.breaches.length && !open) {
    await openAlert(
      trx,
      actor,
      admission,
      {
        kind: "lung_protection",
        grade: "routine",
        startedAt: check.checkedAt,
        orderId: check.orderId,
        band: null,
        spo2: null,
        level: PHYSICIAN_LEVEL,
        alsoLevels: [THERAPIST_LEVEL],
        detail: {
          checkId: check.checkId,
          checkedAt: check.checkedAt.toISOString(),
          breaches: check.breaches,
        },
        chartedBy: actor.id,
      },
      now,
      cfg,
    );
  } else if (check.breaches.length && open) {
    // Still beyond: the alert shows the latest check; nobody is mailed again.
    await updateDetail(trx, open.id, {
      latestCheckId: check.checkId,
      latestCheckedAt: check.checkedAt.toISOString(),
      latestBreaches: check.breaches,
    });
  } else if (open) {
    await closeAlert(
      trx,
      actor,
      admission,
      open,
      "A later ventilator check within the order's lung-protective limits.",
      check.checkedAt,
      now,
    );
  }
}
