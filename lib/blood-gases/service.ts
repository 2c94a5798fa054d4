import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import { assertRole } from "../auth/actor-queries";
import { ValidationError } from "../errors";
import { once } from "../idempotency";
import { appendLedger } from "../ledger/service";
import { RESPIRATORY_SUPPORT, type Device } from "../orders/devices";
import {
  assessBloodGas,
  barometricPressureAtAltitude,
  ENGINE_VERSION,
  type BloodGasAssessment,
} from "../oxygen";
import { findOpenAdmission } from "../patients/access";
import { resolveFio2 } from "../readings/service";
import { parseInput } from "../validation";
import { bloodGasSchema, type BloodGasInput } from "./schema";

export type BloodGasView = {
  id: number;
  patientId: number;
  sampledAt: string;
  sampleType: "arterial" | "venous";
  pao2: number;
  paco2: number;
  fio2: number;
  fio2Estimated: boolean;
  peep: number | null;
  device: Device;
  barometricPressure: number;
  /** Computed on save for arterial samples; a venous PO2 says nothing about oxygenation. */
  assessment: BloodGasAssessment | null;
  engineVersion: string;
};

/** Records a blood gas and stores its computed indices with the engine version. */
export async function recordBloodGas(
  knex: Knex,
  actor: Actor,
  raw: BloodGasInput,
  now: Date = new Date(),
): Promise<BloodGasView> {
  assertRole(actor, ["physician", "therapist", "nurse"]);
  const input = parseInput(bloodGasSchema, raw);
  if (
    input.sampledAt.getTime() > now.getTime() + 5 * 60_000 ||
    input.sampledAt.getTime() < now.getTime() - 72 * 3600_000
  ) {
    throw new ValidationError("Some fields need attention.", {
      sampledAt: ["Time sampled must be within the last 72 hours and not in the future."],
    });
  }
  const admission = await findOpenAdmission(knex, actor, input.patientId);
  const { fio2, estimated } = resolveFio2(input.device, input.flow, input.fio2);
  const barometricPressure =
    Math.round(barometricPressureAtAltitude(admission.altitudeM) * 10) / 10;
  const assessment =
    input.sampleType === "arterial"
      ? assessBloodGas({
          fio2,
          pao2: input.pao2,
          paco2: input.paco2,
          barometricPressure,
          support: RESPIRATORY_SUPPORT[input.device],
          ...(input.hemoglobin !== undefined ? { hemoglobin: input.hemoglobin } : {}),
          ...(input.sao2 !== undefined ? { sao2: input.sao2 / 100 } : {}),
          ...(input.peep !== undefined ? { peep: input.peep } : {}),
          ...(input.flow !== undefined && input.device === "hfnc" ? { flow: input.flow } : {}),
        })
      : null;
  return once(knex, actor.id, input.idempotencyKey, "blood_gas.record", async (trx) => {
    const round1 = (v: number | undefined) => (v === undefined ? null : Math.round(v * 10) / 10);
    const [id] = await trx("blood_gases").insert({
      patient_id: input.patientId,
      admission_id: admission.admissionId,
      sampled_at: input.sampledAt,
      sample_type: input.sampleType,
      ph: input.ph ?? null,
      pao2_mmhg: input.pao2,
      paco2_mmhg: input.paco2,
      hco3_mmol_l: input.hco3 ?? null,
      base_excess_mmol_l: input.baseExcess ?? null,
      sao2_pct: input.sao2 ?? null,
      hb_g_dl: input.hemoglobin ?? null,
      device: input.device,
      fio2,
      fio2_estimated: estimated,
      peep_cmh2o: input.peep ?? null,
      barometric_pressure_mmhg: barometricPressure,
      pf_ratio: round1(assessment?.indices.pfRatio.value),
      aa_gradient_mmhg: round1(assessment?.indices.alveolarArterialGradient.value),
      cao2_ml_dl: round1(assessment?.indices.oxygenContent?.total.value),
      indices_json: JSON.stringify(assessment),
      engine_version: ENGINE_VERSION,
      recorded_by: actor.id,
    });
    const view: BloodGasView = {
      id: Number(id),
      patientId: input.patientId,
      sampledAt: input.sampledAt.toISOString(),
      sampleType: input.sampleType,
      pao2: input.pao2,
      paco2: input.paco2,
      fio2,
      fio2Estimated: estimated,
      peep: input.peep ?? null,
      device: input.device,
      barometricPressure,
      assessment,
      engineVersion: ENGINE_VERSION,
    };
    await appendLedger(
      trx,
      actor,
      {
        action: "blood_gas.record",
        entityType: "blood_gas",
        entityId: view.id,
        patientId: input.patientId,
        unitId: admission.unitId,
        after: {
          ...view,
          assessment: assessment
            ? { pfRatio: assessment.indices.pfRatio.value, inconsistent: assessment.inconsistent }
            : null,
        },
      },
      now,
    );
    return view;
  });
}
