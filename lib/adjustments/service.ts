import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import { refreshFrom } from "../rollups/store";
import { ConflictError, ForbiddenError, ValidationError } from "../errors";
import { once } from "../idempotency";
import { afterSettingsChanged } from "../alerts/service";
import { appendLedger } from "../ledger/service";
import { DEVICE_PROFILES, estimateFio2 } from "../devices";
import { getCurrentOrder, type OrderView } from "../orders/queries";
import { findOpenAdmission } from "../admissions/access";
import {
  barometricPressureAtAltitude,
  ENGINE_VERSION,
  forecastBaseline,
  forecastFio2Change,
  OxygenInputError,
  type Fio2Forecast,
} from "../oxygen";
import { gasAgeCaveat } from "../blood-gases/freshness";
import { loadLatestArterialGas } from "../chart/bedside";
import { type AdjustmentData } from "./schema";
import { mayAdjustDevice } from "../auth/permissions";
import { proposalFollowed } from "./proposal";

export type AdjustmentView = {
  id: number;
  patientId: number;
  orderId: number;
  from: { fio2: number; peep: number | null; flow: number | null };
  to: { fio2: number; peep: number | null; flow: number | null };
  reason: string;
  rationale: string;
  appliedAt: string;
  forecast: Fio2Forecast | null;
  engineVersion: string;
  settingsVersion: number;
};

const NEW_ORDER = "To go beyond it, ask the physician for a new order.";

/** Refuses a change outside the order's limits, naming the limit and the way out. */
export function checkWithinLimits(
  order: OrderView,
  to: { fio2: number; peep?: number; flow?: number },
): void {
  const errors: Record<string, string[]> = {};
  const { limits } = order;
  if (to.fio2 < limits.fio2Min || to.fio2 > limits.fio2Max) {
    const side =
      to.fio2 > limits.fio2Max
        ? `above this order's maximum of ${limits.fio2Max.toFixed(2)}`
        : `below this order's minimum of ${limits.fio2Min.toFixed(2)}`;
    errors.toFio2 = [`FiO2 ${to.fio2.toFixed(2)} is ${side}. ${NEW_ORDER}`];
  }
  const uses = DEVICE_PROFILES[order.device].uses;
  if (uses.peep) {
    if (to.peep === undefined) errors.toPeep = ["New PEEP is required for this device."];
    else if (
      limits.peepMin !== null &&
      limits.peepMax !== null &&
      (to.peep < limits.peepMin || to.peep > limits.peepMax)
    ) {
      errors.toPeep = [
        `PEEP ${to.peep} cmH2O is outside this order's limits (${limits.peepMin}–${limits.peepMax} cmH2O). ${NEW_ORDER}`,
      ];
    }
  } else if (to.peep !== undefined) {
    errors.toPeep = [`${DEVICE_PROFILES[order.device].label} has no PEEP setting.`];
  }
  if (uses.flow) {
    if (to.flow === undefined) errors.toFlow = ["New flow is required for this device."];
    else if (
      limits.flowMin !== null &&
      limits.flowMax !== null &&
      (to.flow < limits.flowMin || to.flow > limits.flowMax)
    ) {
      errors.toFlow = [
        `Flow ${to.flow} L/min is outside this order's limits (${limits.flowMin}–${limits.flowMax} L/min). ${NEW_ORDER}`,
      ];
    }
  } else if (to.flow !== undefined) {
    errors.toFlow = [`${DEVICE_PROFILES[order.device].label} has no flow setting.`];
  }
  if (Object.keys(errors).length > 0) {
    throw new ValidationError(`This change is outside the order's limits. ${NEW_ORDER}`, errors);
  }
}

/**
 * Records one applied settings change within the order in effect, with the
 * forecast the engine makes for it (stored with the engine version). Exactly one
 * of two concurrent changes from the same settings version wins.
 */
export async function recordAdjustment(
  knex: Knex,
  actor: Actor,
  input: AdjustmentData,
  now: Date = new Date(),
): Promise<AdjustmentView> {
  if (
    input.appliedAt.getTime() > now.getTime() + 5 * 60_000 ||
    input.appliedAt.getTime() < now.getTime() - 24 * 3600_000
  ) {
    throw new ValidationError("Some fields need attention.", {
      appliedAt: ["Time applied must be within the last 24 hours and not in the future."],
    });
  }
  const admission = await findOpenAdmission(knex, actor, input.patientId);

  // Order, settings and the gas are read once, under the locks the change
  // is written under: what was checked is what is changed.
  return once(knex, actor.id, input.idempotencyKey, "adjustment.record", async (trx) => {
    const current = (await trx("bedside_settings")
      .where({ admission_id: admission.admissionId })
      .forUpdate()
      .first()) as
      | { version: number; fio2: number; peep_cmh2o: number | null; flow_l_min: number | null }
      | undefined;
    await trx("orders").where({ current_patient_id: input.patientId }).forUpdate().first("id");
    const order = await getCurrentOrder(trx, input.patientId);
    if (!order || !current) {
      throw new ValidationError(
        "There is no oxygen order in effect for this patient; a physician must write one first.",
        {
          toFio2: ["No order in effect: settings cannot be changed without one."],
        },
      );
    }
    if (!mayAdjustDevice(actor, DEVICE_PROFILES[order.device])) {
      throw new ForbiddenError(
        `Nurses record changes on low-flow devices only; ${DEVICE_PROFILES[order.device].label} changes are recorded by a therapist or physician.`,
      );
    }
    const estimated = DEVICE_PROFILES[order.device].uses.fio2 === "estimated";
    const toFio2 = estimated
      ? (estimateFio2(order.device, input.toFlow) ?? input.toFio2)
      : input.toFio2;
    checkWithinLimits(order, {
      fio2: toFio2,
      ...(input.toPeep !== undefined ? { peep: input.toPeep } : {}),
      ...(input.toFlow !== undefined ? { flow: input.toFlow } : {}),
    });
    if (current.version !== input.settingsVersion) {
      throw new ConflictError(
        `The settings were changed by someone else a moment ago (now FiO2 ${current.fio2.toFixed(2)}${current.peep_cmh2o !== null ? `, PEEP ${current.peep_cmh2o}` : ""}${current.flow_l_min !== null ? `, flow ${current.flow_l_min} L/min` : ""}). Review the current settings, then record your change again if it is still needed.`,
      );
    }

    // The forecast stored with the change starts from the latest arterial gas,
    // measured at its own FiO2 — if it is fresh, or a clinician chose it anyway.
    // A gas that contradicts itself (PaO2 above PAO2) gives no forecast.
    const arterial = await loadLatestArterialGas(trx, admission.admissionId, now);
    const gas =
      arterial && (arterial.freshness.fresh || input.useStaleBloodGas === true) ? arterial : null;
    let forecast: Fio2Forecast | null = null;
    let forecastWithheld: string | null = null;
    if (gas && toFio2 !== gas.fio2) {
      try {
        forecast = forecastFio2Change({
          ...forecastBaseline(
            { ...gas, hemoglobin: gas.hb },
            barometricPressureAtAltitude(admission.altitudeM),
          ),
          nextFio2: toFio2,
        });
        forecast.caveats.unshift(gasAgeCaveat(gas.freshness, true));
      } catch (error) {
        if (!(error instanceof OxygenInputError)) throw error;
        forecastWithheld = error.message;
      }
    }

    const from = { fio2: current.fio2, peep: current.peep_cmh2o, flow: current.flow_l_min };
    const to = { fio2: toFio2, peep: input.toPeep ?? null, flow: input.toFlow ?? null };
    const followed = await proposalFollowed(trx, admission, order, gas, from, to);
    const [id] = await trx("adjustments").insert({
      patient_id: input.patientId,
      admission_id: admission.admissionId,
      order_id: order.id,
      device: order.device,
      from_fio2: from.fio2,
      to_fio2: to.fio2,
      from_peep_cmh2o: from.peep,
      to_peep_cmh2o: to.peep,
      from_flow_l_min: from.flow,
      to_flow_l_min: to.flow,
      reason: input.reason,
      rationale: input.rationale,
      applied_at: input.appliedAt,
      recorded_by: actor.id,
      forecast_json: forecast ? JSON.stringify(forecast) : null,
      engine_version: ENGINE_VERSION,
      followed_proposal: followed,
    });
    await trx("bedside_settings")
      .where({ admission_id: admission.admissionId })
      .update({
        fio2: to.fio2,
        fio2_estimated: estimated,
        peep_cmh2o: to.peep,
        flow_l_min: to.flow,
        version: current.version + 1,
        updated_at: now,
        last_reassessed_at: input.appliedAt,
      });
    // The applied FiO2 changes from here on: oxygen exposure in the rollups.
    await refreshFrom(trx, admission.admissionId, input.appliedAt, now);
    const view: AdjustmentView = {
      id: Number(id),
      patientId: input.patientId,
      orderId: order.id,
      from,
      to,
      reason: input.reason,
      rationale: input.rationale,
      appliedAt: input.appliedAt.toISOString(),
      forecast,
      engineVersion: ENGINE_VERSION,
      settingsVersion: current.version + 1,
    };
    await appendLedger(
      trx,
      actor,
      {
        action: "adjustment.record",
        entityType: "adjustment",
        entityId: view.id,
        patientId: input.patientId,
        unitId: admission.unitId,
        before: from,
        after: {
          to,
          reason: input.reason,
          orderId: order.id,
          forecastRange: forecast
            ? { low: forecast.range.low.pao2, high: forecast.range.high.pao2 }
            : null,
          ...(forecastWithheld ? { forecastWithheld } : {}),
          engineVersion: ENGINE_VERSION,
        },
        rationale: input.rationale,
      },
      now,
    );
    await afterSettingsChanged(trx, actor, admission, input.appliedAt, now, {
      from: { fio2: from.fio2, flow: from.flow },
      to: { fio2: to.fio2, flow: to.flow },
    });
    return view;
  });
}
