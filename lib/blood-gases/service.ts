import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import { ValidationError } from "../errors";
import { once } from "../idempotency";
import { afterBloodGasRecorded } from "../alerts/service";
import { appendLedger } from "../ledger/service";
import { RESPIRATORY_SUPPORT, type Device } from "../devices";
import {
  assessBloodGas,
  barometricPressureAtAltitude,
  ENGINE_VERSION,
  type BloodGasAssessment,
} from "../oxygen";
import { findOpenAdmission, type OpenAdmission } from "../admissions/access";
import { resolveFio2 } from "../readings/service";
import { type BloodGasData } from "./schema";

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

/** One blood gas as stored: pressures in mmHg, haemoglobin in g/dL, saturations in %. */
export type BloodGasValues = {
  patientId: number;
  sampledAt: Date;
  sampleType: "arterial" | "venous";
  ph?: number | undefined;
  pao2: number;
  paco2: number;
  hco3?: number | undefined;
  baseExcess?: number | undefined;
  sao2?: number | undefined;
  hemoglobin?: number | undefined;
  device: Device;
  flow?: number | undefined;
  fio2?: number | undefined;
  peep?: number | undefined;
};

/** What the engine makes of a blood gas before it is stored. */
export type EvaluatedBloodGas = {
  fio2: number;
  fio2Estimated: boolean;
  barometricPressure: number;
  assessment: BloodGasAssessment | null;
};

/**
 * Resolves the FiO2 in use and computes the oxygenation indices of an arterial
 * sample at the unit's altitude. The one engine path for typed and imported
 * gases; throws ValidationError / OxygenInputError naming the field.
 */
export function evaluateBloodGas(values: BloodGasValues, altitudeM: number): EvaluatedBloodGas {
  const { fio2, estimated } = resolveFio2(values.device, values.flow, values.fio2);
  const barometricPressure = Math.round(barometricPressureAtAltitude(altitudeM) * 10) / 10;
  const assessment =
    values.sampleType === "arterial"
      ? assessBloodGas({
          fio2,
          pao2: values.pao2,
          paco2: values.paco2,
          barometricPressure,
          support: RESPIRATORY_SUPPORT[values.device],
          ...(values.hemoglobin !== undefined ? { hemoglobin: values.hemoglobin } : {}),
          ...(values.sao2 !== undefined ? { sao2: values.sao2 / 100 } : {}),
          ...(values.peep !== undefined ? { peep: values.peep } : {}),
          ...(values.flow !== undefined && values.device === "hfnc" ? { flow: values.flow } : {}),
        })
      : null;
  return { fio2, fio2Estimated: estimated, barometricPressure, assessment };
}

/**
 * Inserts one evaluated blood gas inside the caller's transaction. The caller
 * writes the ledger row (one per gas when typed, one per import otherwise).
 */
export async function insertBloodGas(
  trx: Knex.Transaction,
  admission: Pick<OpenAdmission, "admissionId">,
  values: BloodGasValues,
  evaluated: EvaluatedBloodGas,
  provenance: { recordedBy: number | null; importId: number | null },
): Promise<BloodGasView> {
  const { fio2, fio2Estimated, barometricPressure, assessment } = evaluated;
  const round1 = (v: number | undefined) => (v === undefined ? null : Math.round(v * 10) / 10);
  const [id] = await trx("blood_gases").insert({
    patient_id: values.patientId,
    admission_id: admission.admissionId,
    sampled_at: values.sampledAt,
    sample_type: values.sampleType,
    ph: values.ph ?? null,
    pao2_mmhg: values.pao2,
    paco2_mmhg: values.paco2,
    hco3_mmol_l: values.hco3 ?? null,
    base_excess_mmol_l: values.baseExcess ?? null,
    sao2_pct: values.sao2 ?? null,
    hb_g_dl: values.hemoglobin ?? null,
    device: values.device,
    fio2,
    fio2_estimated: fio2Estimated,
    peep_cmh2o: values.peep ?? null,
    barometric_pressure_mmhg: barometricPressure,
    pf_ratio: round1(assessment?.indices.pfRatio.value),
    aa_gradient_mmhg: round1(assessment?.indices.alveolarArterialGradient.value),
    cao2_ml_dl: round1(assessment?.indices.oxygenContent?.total.value),
    indices_json: JSON.stringify(assessment),
    engine_version: ENGINE_VERSION,
    recorded_by: provenance.recordedBy,
    import_id: provenance.importId,
  });
  return {
    id: Number(id),
    patientId: values.patientId,
    sampledAt: values.sampledAt.toISOString(),
    sampleType: values.sampleType,
    pao2: values.pao2,
    paco2: values.paco2,
    fio2,
    fio2Estimated,
    peep: values.peep ?? null,
    device: values.device,
    barometricPressure,
    assessment,
    engineVersion: ENGINE_VERSION,
  };
}

/** Records a blood gas and stores its computed indices with the engine version. */
export async function recordBloodGas(
  knex: Knex,
  actor: Actor,
  input: BloodGasData,
  now: Date = new Date(),
): Promise<BloodGasView> {
  if (
    input.sampledAt.getTime() > now.getTime() + 5 * 60_000 ||
    input.sampledAt.getTime() < now.getTime() - 72 * 3600_000
  ) {
    throw new ValidationError("Some fields need attention.", {
      sampledAt: ["Time sampled must be within the last 72 hours and not in the future."],
    });
  }
  const admission = await findOpenAdmission(knex, actor, input.patientId);
  const evaluated = evaluateBloodGas(input, admission.altitudeM);
  return once(knex, actor.id, input.idempotencyKey, "blood_gas.record", async (trx) => {
    const view = await insertBloodGas(trx, admission, input, evaluated, {
      recordedBy: actor.id,
      importId: null,
    });
    const { assessment } = view;
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
    await afterBloodGasRecorded(
      trx,
      actor,
      admission,
      {
        sampledAt: input.sampledAt,
        sampleType: input.sampleType,
        pao2: input.pao2,
        fio2: view.fio2,
        flow: input.flow ?? null,
      },
      now,
    );
    return view;
  });
}
