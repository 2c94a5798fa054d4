import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import { ValidationError } from "../errors";
import { once } from "../idempotency";
import { afterReadingsCharted } from "../alerts/service";
import { appendLedger } from "../ledger/service";
import { refreshAfterReadings } from "../rollups/store";
import { DEVICE_PROFILES, estimateFio2, type Device } from "../devices";
import { findOpenAdmission } from "../admissions/access";
import { type ReadingData } from "./schema";

export type ReadingView = {
  id: number;
  patientId: number;
  takenAt: string;
  spo2: number;
  respiratoryRate: number | null;
  pulseRate: number | null;
  device: Device;
  flow: number | null;
  fio2: number;
  fio2Estimated: boolean;
  source: "manual" | "monitor";
};

/**
 * The FiO2 a reading is charted with: what a set-FiO2 device delivers, or for a
 * low-flow device an estimate from the flow, marked as such.
 */
export function resolveFio2(
  device: Device,
  flow: number | undefined,
  fio2: number | undefined,
): { fio2: number; estimated: boolean } {
  const profile = DEVICE_PROFILES[device];
  const errors: Record<string, string[]> = {};
  if (profile.uses.flow && flow === undefined)
    errors.flow = [`Flow is required for ${profile.label}.`];
  if (profile.uses.fio2 === "set" && fio2 === undefined)
    errors.fio2 = [`FiO2 is required for ${profile.label}.`];
  if (Object.keys(errors).length) throw new ValidationError("Some fields need attention.", errors);
  if (profile.uses.fio2 === "fixed") return { fio2: 0.21, estimated: false };
  if (profile.uses.fio2 === "estimated")
    return { fio2: fio2 ?? estimateFio2(device, flow)!, estimated: true };
  return { fio2: fio2!, estimated: false };
}

/** Charts a reading (nurse, therapist, physician) with its ledger row. */
export async function chartReading(
  knex: Knex,
  actor: Actor,
  input: ReadingData,
  now: Date = new Date(),
): Promise<ReadingView> {
  if (
    input.takenAt.getTime() > now.getTime() + 5 * 60_000 ||
    input.takenAt.getTime() < now.getTime() - 72 * 3600_000
  ) {
    throw new ValidationError("Some fields need attention.", {
      takenAt: ["Time taken must be within the last 72 hours and not in the future."],
    });
  }
  const admission = await findOpenAdmission(knex, actor, input.patientId);
  const { fio2, estimated } = resolveFio2(input.device, input.flow, input.fio2);
  return once(knex, actor.id, input.idempotencyKey, "reading.chart", async (trx) => {
    const [id] = await trx("readings").insert({
      patient_id: input.patientId,
      admission_id: admission.admissionId,
      taken_at: input.takenAt,
      spo2_pct: input.spo2,
      respiratory_rate_per_min: input.respiratoryRate ?? null,
      pulse_rate_per_min: input.pulseRate ?? null,
      device: input.device,
      flow_l_min: input.flow ?? null,
      fio2,
      fio2_estimated: estimated,
      source: "manual",
      recorded_by: actor.id,
    });
    // Charting at the bedside is a reassessment.
    await trx("bedside_settings")
      .where({ admission_id: admission.admissionId })
      .andWhere("last_reassessed_at", "<", input.takenAt)
      .update({ last_reassessed_at: input.takenAt });
    const view: ReadingView = {
      id: Number(id),
      patientId: input.patientId,
      takenAt: input.takenAt.toISOString(),
      spo2: input.spo2,
      respiratoryRate: input.respiratoryRate ?? null,
      pulseRate: input.pulseRate ?? null,
      device: input.device,
      flow: input.flow ?? null,
      fio2,
      fio2Estimated: estimated,
      source: "manual",
    };
    await appendLedger(
      trx,
      actor,
      {
        action: "reading.chart",
        entityType: "reading",
        entityId: view.id,
        patientId: input.patientId,
        unitId: admission.unitId,
        after: view,
      },
      now,
    );
    await refreshAfterReadings(
      trx,
      { admissionId: admission.admissionId, patientId: input.patientId },
      input.takenAt,
      input.takenAt,
      "manual",
    );
    await afterReadingsCharted(
      trx,
      actor,
      admission,
      [
        {
          takenAt: input.takenAt,
          spo2: input.spo2,
          fio2,
          flow: input.flow ?? null,
          source: "manual",
        },
      ],
      now,
    );
    return view;
  });
}
