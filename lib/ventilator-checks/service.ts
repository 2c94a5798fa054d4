import type { Knex } from "knex";
import { findOpenAdmission } from "../admissions/access";
import { afterVentilatorCheckRecorded } from "../alerts/service";
import type { Actor } from "../auth/actor";
import { ValidationError } from "../errors";
import { once } from "../idempotency";
import { appendLedger } from "../ledger/service";
import { ENGINE_VERSION, type Sex } from "../oxygen";
import {
  breachWords,
  evaluateCheck,
  lungProtectionBreaches,
  type CheckGas,
} from "../ventilation/evaluate";
import { getVentilatorCheck, type VentilatorCheckView } from "./queries";
import type { VentilatorCheckData } from "./schema";

/**
 * The PaCO2 of the latest arterial gas at most this long before a check goes
 * into its ventilatory ratio; an older one says little about this minute
 * ventilation (Tidemark's choice, common practice).
 */
export const PACO2_WINDOW_MS = 6 * 3600_000;

const round1 = (v: number | undefined) => (v === undefined ? undefined : Math.round(v * 10) / 10);

type OrderForCheck = {
  id: number;
  vent_mode: VentilatorCheckView["mode"] | null;
  vt_target_ml_kg: number | null;
  vt_min_ml_kg: number | null;
  vt_max_ml_kg: number | null;
  plateau_limit_cmh2o: number | null;
  driving_limit_cmh2o: number | null;
};

/**
 * Records a ventilator check: the values read off the ventilator, the PaCO2
 * of the latest arterial gas, and what Tidemark computes from them (VT per kg
 * of predicted body weight, driving pressure, static compliance, mechanical
 * power, ventilatory ratio), each with its basis. Held against the order's
 * lung-protective limits; a check beyond them raises the lung-protection
 * alert, a later one within them closes it — in the check's one transaction
 * with its ledger row.
 */
export async function recordVentilatorCheck(
  knex: Knex,
  actor: Actor,
  input: VentilatorCheckData,
  now: Date = new Date(),
): Promise<VentilatorCheckView> {
  const at = input.checkedAt.getTime();
  if (at > now.getTime() + 5 * 60_000 || at < now.getTime() - 72 * 3600_000) {
    throw new ValidationError("Some fields need attention.", {
      checkedAt: ["Time checked must be within the last 72 hours and not in the future."],
    });
  }
  const admission = await findOpenAdmission(knex, actor, input.patientId);
  const values = {
    measuredVtMl: input.measuredVt,
    measuredRate: input.measuredRate,
    totalPeep: round1(input.totalPeep)!,
    minuteVentilationLMin: round1(input.minuteVentilation),
    peakPressure: round1(input.peak),
    plateauPressure: round1(input.plateau),
  };
  return once(knex, actor.id, input.idempotencyKey, "ventilator_check.record", async (trx) => {
    const order = (await trx("orders")
      .where({ current_patient_id: input.patientId })
      .first(
        "id",
        "vent_mode",
        "vt_target_ml_kg",
        "vt_min_ml_kg",
        "vt_max_ml_kg",
        "plateau_limit_cmh2o",
        "driving_limit_cmh2o",
      )) as OrderForCheck | undefined;
    if (!order || order.vent_mode === null) {
      throw new ValidationError("No ventilator order is in effect for this patient.", {
        patientId: [
          "A check is held against a ventilator order's limits: a physician writes one (invasive ventilation or NIV) first.",
        ],
      });
    }
    const patient = (await trx("patients")
      .where({ id: input.patientId })
      .first("height_cm", "sex")) as { height_cm: number | null; sex: Sex };
    if (patient.height_cm === null) {
      throw new ValidationError("The patient's height is not recorded.", {
        heightCm: [
          "Height is not recorded for this patient: record it on the Chart, so VT per kg of predicted body weight can be computed. Tidemark never estimates it.",
        ],
      });
    }
    const gasRow = (await trx("blood_gases")
      .where({ admission_id: admission.admissionId, sample_type: "arterial" })
      .where("sampled_at", "<=", input.checkedAt)
      .where("sampled_at", ">=", new Date(at - PACO2_WINDOW_MS))
      .orderBy("sampled_at", "desc")
      .first("id", "paco2_mmhg", "sampled_at")) as
      { id: number; paco2_mmhg: number; sampled_at: Date } | undefined;
    const gas: CheckGas | null = gasRow
      ? { paco2: Number(gasRow.paco2_mmhg), sampledAt: new Date(gasRow.sampled_at).toISOString() }
      : null;
    const indices = evaluateCheck(
      values,
      { heightCm: Number(patient.height_cm), sex: patient.sex },
      order.vent_mode,
      gas,
    );
    const limits = {
      vtTargetMlKg: Number(order.vt_target_ml_kg),
      vtMinMlKg: Number(order.vt_min_ml_kg),
      vtMaxMlKg: Number(order.vt_max_ml_kg),
      plateauLimit: Number(order.plateau_limit_cmh2o),
      drivingLimit: Number(order.driving_limit_cmh2o),
    };
    const breaches = lungProtectionBreaches(indices, values, limits);
    const r = (v: number | undefined, f: number) =>
      v === undefined ? null : Math.round(v * f) / f;
    const [id] = await trx("ventilator_checks").insert({
      patient_id: input.patientId,
      admission_id: admission.admissionId,
      order_id: order.id,
      checked_at: input.checkedAt,
      vent_mode: order.vent_mode,
      set_vt_ml: input.setVt ?? null,
      measured_vt_ml: values.measuredVtMl,
      set_rate_per_min: input.setRate ?? null,
      measured_rate_per_min: values.measuredRate,
      minute_ventilation_l_min: values.minuteVentilationLMin ?? null,
      peak_cmh2o: values.peakPressure ?? null,
      plateau_cmh2o: values.plateauPressure ?? null,
      total_peep_cmh2o: values.totalPeep,
      paco2_mmhg: gas?.paco2 ?? null,
      paco2_blood_gas_id: gasRow?.id ?? null,
      pbw_kg: r(indices.predictedBodyWeight.value, 10),
      vt_per_kg: r(indices.vtPerKg.value, 100),
      driving_pressure_cmh2o: r(indices.drivingPressure?.value, 10),
      compliance_ml_cmh2o: r(indices.staticCompliance?.value, 10),
      mechanical_power_j_min: r(indices.mechanicalPower?.value, 10),
      ventilatory_ratio: r(indices.ventilatoryRatio?.value, 100),
      limits_json: JSON.stringify(limits),
      breaches_json: JSON.stringify(breaches),
      indices_json: JSON.stringify(indices),
      engine_version: ENGINE_VERSION,
      recorded_by: actor.id,
      created_at: now,
    });
    const view = (await getVentilatorCheck(trx, Number(id)))!;
    await appendLedger(
      trx,
      actor,
      {
        action: "ventilator_check.record",
        entityType: "ventilator_check",
        entityId: view.id,
        patientId: input.patientId,
        unitId: admission.unitId,
        after: {
          ...view,
          indices: Object.fromEntries(Object.entries(view.indices).map(([k, v]) => [k, v.value])),
        },
      },
      now,
    );
    await afterVentilatorCheckRecorded(
      trx,
      actor,
      admission,
      {
        checkId: view.id,
        checkedAt: input.checkedAt,
        orderId: order.id,
        breaches: breaches.map(breachWords),
      },
      now,
    );
    return view;
  });
}
