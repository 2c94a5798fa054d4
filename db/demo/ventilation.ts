import type { Knex } from "knex";
import type { Actor } from "../../lib/auth/actor";
import type { Device } from "../../lib/devices";
import type { VentMode } from "../../lib/ventilation/settings";
import { ventilatorCheckSchema } from "../../lib/ventilator-checks/schema";
import { recordVentilatorCheck } from "../../lib/ventilator-checks/service";
import { parseInput } from "../../lib/validation";

// The demo's ventilator orders and checks (invented): each ventilated ICU
// patient gets the ventilator part of the order and a check every four hours,
// within the order's lung-protective limits (so the demo opens no lung-protection
// alert by itself). Its own random stream, so the rest of the course stays as it was.

let state = 20261208;
const random = () => (state = (state * 1664525 + 1013904223) >>> 0) / 2 ** 32;

/** The ventilator part of a plan: mode and the VT range per kg of predicted body weight [min, target, max]. */
export type VentPlan = { mode: VentMode; vt: [number, number, number] };

/** The order's ventilator fields for a plan (rate 10–35 /min; the pressure limits left to their defaults). */
export function ventilatorOrderFields(vent: VentPlan | undefined): Record<string, unknown> {
  if (!vent) return {};
  return {
    ventMode: vent.mode,
    vtMin: vent.vt[0],
    vtTarget: vent.vt[1],
    vtMax: vent.vt[2],
    rateMin: 10,
    rateMax: 35,
  };
}

/**
 * One check at `at`: the tidal volume near the target for the patient's
 * predicted body weight; on invasive ventilation a plateau 9–13 cmH2O above
 * PEEP and the peak above it (none on NIV, where no hold is made).
 */
export async function seedVentilatorCheck(
  knex: Knex,
  therapist: Actor,
  patientId: number,
  plan: { device: Device; vent: VentPlan; peep: number },
  at: Date,
): Promise<void> {
  const patient = (await knex("patients").where({ id: patientId }).first("height_cm", "sex")) as {
    height_cm: number;
    sex: "female" | "male";
  };
  const pbw = (patient.sex === "male" ? 50 : 45.5) + 0.91 * (Number(patient.height_cm) - 152.4);
  const vt = Math.round(plan.vent.vt[1] * pbw * (0.96 + random() * 0.06));
  const rate = Math.round(16 + random() * 8);
  const plateau = Math.round((plan.peep + 9 + random() * 4) * 10) / 10;
  const peak = Math.round((plateau + 4 + random() * 4) * 10) / 10;
  await recordVentilatorCheck(
    knex,
    therapist,
    parseInput(ventilatorCheckSchema, {
      patientId,
      checkedAt: at.toISOString(),
      measuredVt: vt,
      measuredRate: rate,
      totalPeep: plan.peep,
      minuteVentilation: Math.round((vt * rate) / 100) / 10,
      ...(plan.device === "invasive"
        ? { setVt: Math.round(plan.vent.vt[1] * pbw), setRate: rate, plateau, peak }
        : {}),
    }),
    at,
  );
}
