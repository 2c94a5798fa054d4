import type { Fio2Forecast } from "../oxygen/forecast";
import { UNCHECKED_REASONS } from "./reasons";
import {
  DEFAULT_PAIRING_SETTINGS,
  FORECAST_MODELS,
  type AdjustmentEvent,
  type AdmissionEvents,
  type BloodGasEvent,
  type ForecastModel,
  type ForecastPair,
  type ModelError,
  type PairingResult,
  type PairingSettings,
  type UncheckedAdjustment,
  type UncheckedReason,
} from "./types";

/**
 * Pairs each stored forecast of one admission with the arterial gas that checks it.
 *
 * A change applied at t with a stored forecast is paired with the FIRST
 * arterial gas sampled in [t + minMinutes, t + maxMinutes] such that no later
 * change of FiO2 or PEEP and no order change happened in (t, sampledAt].
 * Changes applied at the same instant are taken in id order (the higher id is
 * the later). A later change that alters neither FiO2 nor PEEP does not
 * interrupt. Venous gases are never used. Every other change is returned in
 * `unchecked` with its reason (see reasons.ts for the order of precedence).
 */
export function pairForecasts(
  events: AdmissionEvents,
  settings: PairingSettings = DEFAULT_PAIRING_SETTINGS,
): PairingResult {
  checkSettings(settings);
  const adjustments = [...events.adjustments].sort(
    (a, b) => a.appliedAt.getTime() - b.appliedAt.getTime() || a.id - b.id,
  );
  const gases = [...events.bloodGases].sort(
    (a, b) => a.sampledAt.getTime() - b.sampledAt.getTime() || a.id - b.id,
  );
  const orderChanges = events.orderChanges.map((o) => o.at.getTime()).sort((a, b) => a - b);

  const arterial = gases.filter((g) => g.sampleType === "arterial");
  const venous = gases.filter((g) => g.sampleType === "venous");
  // The first later change of FiO2 or PEEP after each change, by one backward pass.
  const nextChange: (AdjustmentEvent | undefined)[] = [];
  let upcoming: AdjustmentEvent | undefined;
  for (let i = adjustments.length - 1; i >= 0; i--) {
    const adjustment = adjustments[i];
    if (!adjustment) continue;
    nextChange[i] = upcoming;
    if (changesFio2OrPeep(adjustment)) upcoming = adjustment;
  }

  const pairs: ForecastPair[] = [];
  const unchecked: UncheckedAdjustment[] = [];
  adjustments.forEach((adjustment, index) => {
    const stop = firstInterruption(nextChange[index], orderChanges, adjustment.appliedAt.getTime());
    const outcome = checkOne(adjustment, stop, { arterial, venous }, settings);
    if ("models" in outcome) pairs.push(outcome);
    else unchecked.push(outcome);
  });
  return { pairs, unchecked, settings: { ...settings } };
}

const MINUTE_MS = 60_000;

/** FiO2 is stored with two decimals; four keep 0.45 − 0.40 at 0.05, not 0.04999…. */
export const fio2Step = (from: number, to: number): number => Math.round((to - from) * 1e4) / 1e4;

/** Whether a change alters FiO2 or PEEP (a flow-only change alters neither). */
export function changesFio2OrPeep(
  a: Pick<AdjustmentEvent, "fromFio2" | "toFio2" | "fromPeep" | "toPeep">,
): boolean {
  return fio2Step(a.fromFio2, a.toFio2) !== 0 || a.fromPeep !== a.toPeep;
}

function checkSettings(s: PairingSettings): void {
  if (!Number.isFinite(s.minMinutes) || !Number.isFinite(s.maxMinutes) || s.minMinutes < 0) {
    throw new RangeError(
      `The pairing window needs finite minutes with a minimum of 0 or more (got ${s.minMinutes}–${s.maxMinutes}).`,
    );
  }
  if (s.maxMinutes < s.minMinutes) {
    throw new RangeError(
      `The pairing window's maximum (${s.maxMinutes} min) is below its minimum (${s.minMinutes} min).`,
    );
  }
}

type Interruption = { at: number; kind: "adjustment"; id: number } | { at: number; kind: "order" };

function firstInterruption(
  change: AdjustmentEvent | undefined,
  orderChanges: readonly number[],
  t0: number,
): Interruption | null {
  const order = orderChanges.find((at) => at > t0);
  const byChange: Interruption | null = change
    ? { at: change.appliedAt.getTime(), kind: "adjustment", id: change.id }
    : null;
  const byOrder: Interruption | null = order !== undefined ? { at: order, kind: "order" } : null;
  if (byChange && byOrder) return byOrder.at <= byChange.at ? byOrder : byChange;
  return byChange ?? byOrder;
}

function checkOne(
  adjustment: AdjustmentEvent,
  stop: Interruption | null,
  gases: { arterial: readonly BloodGasEvent[]; venous: readonly BloodGasEvent[] },
  settings: PairingSettings,
): ForecastPair | UncheckedAdjustment {
  const t0 = adjustment.appliedAt.getTime();
  const after = (ms: number) => minutesText((ms - t0) / MINUTE_MS);
  const unchecked = (
    reason: UncheckedReason,
    detail: string,
    gas: BloodGasEvent | undefined = undefined,
    interruptedAt: number | null = null,
  ): UncheckedAdjustment => ({
    adjustmentId: adjustment.id,
    device: adjustment.device,
    appliedAt: adjustment.appliedAt,
    fromFio2: adjustment.fromFio2,
    toFio2: adjustment.toFio2,
    fio2Step: fio2Step(adjustment.fromFio2, adjustment.toFio2),
    reason,
    label: UNCHECKED_REASONS[reason].label,
    detail,
    gasId: gas?.id ?? null,
    interruptedAt: interruptedAt === null ? null : new Date(interruptedAt),
  });

  const { forecast } = adjustment;
  if (!forecast) {
    return unchecked(
      "no_forecast",
      fio2Step(adjustment.fromFio2, adjustment.toFio2) === 0
        ? "FiO2 was not changed (a PEEP or flow change only): the engine forecasts FiO2 changes only."
        : "No forecast was stored with this FiO2 change (no usable arterial gas to start from, or the engine withheld it).",
    );
  }

  const opens = t0 + settings.minMinutes * MINUTE_MS;
  const closes = t0 + settings.maxMinutes * MINUTE_MS;
  const window = `${settings.minMinutes}–${settings.maxMinutes} min`;
  const stopAt = stop?.at ?? Infinity;
  const at = (g: BloodGasEvent) => g.sampledAt.getTime();
  const { arterial } = gases;
  const inWindow = (g: BloodGasEvent) => at(g) >= opens && at(g) <= closes;

  const gas = arterial.find((g) => inWindow(g) && at(g) < stopAt);
  if (gas) return pairOf(adjustment, forecast, gas);

  const venous = gases.venous.find((g) => inWindow(g) && at(g) < stopAt);
  const venousNote = venous
    ? ` A venous gas (gas ${venous.id}, ${after(at(venous))}) was not used: venous gases never are.`
    : "";

  if (stop && stop.at <= closes) {
    const blocked = arterial.find(inWindow);
    const what =
      stop.kind === "adjustment"
        ? `FiO2 or PEEP was changed again (adjustment ${stop.id}) ${after(stop.at)}`
        : `The order changed ${after(stop.at)}`;
    const gasNote = blocked
      ? `, before the first arterial gas in the window (gas ${blocked.id}, ${after(at(blocked))})`
      : `, and no arterial gas came before it in the ${window} window`;
    return unchecked(
      stop.kind === "adjustment" ? "changed_again" : "order_changed",
      `${what}${gasNote}.${venousNote}`,
      blocked,
      stop.at,
    );
  }
  if (venous) {
    return unchecked(
      "venous_only",
      `The only gas in the ${window} window was venous (gas ${venous.id}, ${after(at(venous))}); venous gases are never used.`,
      venous,
    );
  }
  const early = arterial.filter((g) => at(g) > t0 && at(g) < opens);
  const late = arterial.find((g) => at(g) > closes);
  const lateNote = late
    ? `the next arterial gas (gas ${late.id}) came ${after(at(late))}, after the window closed`
    : "no arterial gas came in the window";
  const firstEarly = early[0];
  if (firstEarly) {
    const count = early.length === 1 ? "arterial gas" : `first of ${early.length} arterial gases`;
    return unchecked(
      "gas_too_early",
      `The ${count} after the change (gas ${firstEarly.id}) was sampled ${after(at(firstEarly))}, before the ${window} window opened; ${lateNote}.`,
      firstEarly,
    );
  }
  if (late) {
    return unchecked(
      "gas_too_late",
      `The first arterial gas after the change (gas ${late.id}) was sampled ${after(at(late))}, after the ${window} window closed.`,
      late,
    );
  }
  const before = arterial.filter((g) => at(g) <= t0).at(-1);
  return unchecked(
    "no_arterial_gas",
    before
      ? `No arterial gas was sampled after the change; the latest (gas ${before.id}) was sampled before it.`
      : "No arterial gas was sampled after the change.",
  );
}

function pairOf(
  adjustment: AdjustmentEvent,
  forecast: Fio2Forecast,
  gas: BloodGasEvent,
): ForecastPair {
  const measured = gas.pao2;
  const models = Object.fromEntries(
    FORECAST_MODELS.map((m) => [m, modelError(forecast.models[m].pao2, measured)]),
  ) as Record<ForecastModel, ModelError>;
  const range = { low: forecast.range.low.pao2, high: forecast.range.high.pao2 };
  return {
    adjustmentId: adjustment.id,
    gasId: gas.id,
    device: adjustment.device,
    appliedAt: adjustment.appliedAt,
    sampledAt: gas.sampledAt,
    minutesAfter: (gas.sampledAt.getTime() - adjustment.appliedAt.getTime()) / MINUTE_MS,
    fromFio2: adjustment.fromFio2,
    toFio2: adjustment.toFio2,
    fio2Step: fio2Step(adjustment.fromFio2, adjustment.toFio2),
    peepChanged: adjustment.fromPeep !== adjustment.toPeep,
    measured,
    range,
    inRange: measured >= range.low && measured <= range.high,
    models,
  };
}

export function modelError(predicted: number, measured: number): ModelError {
  const error = predicted - measured;
  return { predicted, measured, error, absoluteError: Math.abs(error) };
}

function minutesText(minutes: number): string {
  const rounded = Math.round(minutes * 10) / 10;
  return `${rounded} min after this change`;
}
