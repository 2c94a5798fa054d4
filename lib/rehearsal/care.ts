import {
  advanceWatch,
  checkSignal,
  idleWatch,
  type WatchEvent,
  type WatchState,
} from "../alerts/detect";
import { OxygenInputError, proposeStep, type Proposal, type ProposedSetting } from "../oxygen";
import { classifySpo2 } from "../time-in-band";
import { StreamMeasures } from "./measures";
import type { Delay, RehearsalParameters } from "./parameters";
import { VirtualPatient, type PatientProfile } from "./patient";
import { mixSeed, Random } from "./random";

export type CareModel = "fixed-interval" | "tidemark" | "reference";
export const CARE_MODELS: readonly CareModel[] = ["fixed-interval", "tidemark", "reference"];

/** What one stay under one care model came to. */
export type StayResult = {
  patient: number;
  model: CareModel;
  /** ms */
  periodMs: number;
  belowMs: number;
  inBandMs: number;
  aboveMs: number;
  unknownMs: number;
  below88Ms: number;
  below85Ms: number;
  /** ∫ (FiO2 − 0.21) dt over known time, in FiO2·hours. */
  fio2HoursAboveRoomAir: number;
  adjustments: number;
  alerts: number;
  escalations: number;
};

/** A sample as it streams out of a stay (t in ms since the stay began; spo2 null while the probe is off). */
export type SampleSink = (t: number, spo2: number | null, fio2: number) => void;

/** One routine step only: the fixed-interval routine has no urgent path. */
const NO_URGENCY = { belowPct: 0, marginPct: 101 };

const delaySeconds = (random: Random, d: Delay) => 60 * random.logNormal(d.medianMinutes, d.sigma);

/**
 * Runs one patient's stay under one care model, second by second, feeding the
 * monitor's series to the app's rollup measures (and to `sink`, if given).
 */
export function runStay(
  profile: PatientProfile,
  model: CareModel,
  seed: number,
  hours: number,
  p: RehearsalParameters,
  sink?: SampleSink,
): StayResult {
  const patient = new VirtualPatient(profile, seed, p);
  const random = new Random(mixSeed(seed, profile.index, 3, CARE_MODELS.indexOf(model)));
  const { order } = profile;
  const band = order.spo2Target;
  const flow = profile.startSetting.flow ?? null;
  let setting: ProposedSetting = profile.startSetting;
  const measures = new StreamMeasures(0, band, setting.fio2, flow);
  const end = Math.round(hours * 3600);
  const care = p.care;
  let adjustments = 0;
  let alerts = 0;
  let escalations = 0;

  const propose = (spo2: number, urgency?: typeof NO_URGENCY): Proposal | null => {
    try {
      return proposeStep({
        order,
        current: { fio2: setting.fio2, peep: setting.peep, flow: setting.flow },
        latestReading: { spo2 },
        barometricPressure: profile.barometricPressure,
        ...(urgency ? { urgency } : {}),
      });
    } catch (error) {
      if (error instanceof OxygenInputError) return null;
      throw error;
    }
  };
  const apply = (t: number, step: ProposedSetting | null) => {
    if (!step) return;
    setting = step;
    adjustments++;
    measures.setFio2(t * 1000, step.fio2);
  };

  // Fixed-interval routine: the step decided at the check, applied after the therapist's delay.
  let nextCheck = Math.floor(random.next() * care.checkEveryMinutes * 60);
  let pendingStep: ProposedSetting | null = null;
  let pendingAt = Infinity;

  // Tidemark: the app's detection, a nurse, escalation, a therapist applying the proposal.
  const watch: WatchState = idleWatch();
  let respondAt = Infinity;
  let therapistAt = Infinity;
  let lastSpo2: number | null = null;
  let lastSampleAt = -Infinity;
  const onEvent = (event: WatchEvent) => {
    if (event.type !== "open" && event.type !== "upgrade" && event.type !== "signal-lost") return;
    if (event.type !== "upgrade") alerts++;
    if (respondAt !== Infinity || therapistAt !== Infinity) return;
    const nurse = delaySeconds(random, care.nurseResponse);
    const escalateAfter = care.escalateAfterMinutes * 60;
    if (nurse > escalateAfter) {
      escalations++;
      const escalated = escalateAfter + delaySeconds(random, care.escalatedResponse);
      respondAt = event.at / 1000 + Math.min(nurse, escalated);
    } else respondAt = event.at / 1000 + nurse;
  };

  let nextReference = 0;

  for (let t = 0; t < end; t++) {
    const fio2 = setting.fio2;
    if (t > 0) patient.advance(fio2);
    const spo2 = patient.spo2;
    const ms = t * 1000;
    if (spo2 !== null) {
      measures.add(ms, spo2, fio2);
      lastSpo2 = spo2;
      lastSampleAt = t;
    }
    sink?.(ms, spo2, fio2);

    if (model === "fixed-interval") {
      if (t >= pendingAt) {
        apply(t, pendingStep);
        pendingStep = null;
        pendingAt = Infinity;
      }
      if (t >= nextCheck) {
        nextCheck += care.checkEveryMinutes * 60;
        if (spo2 !== null && pendingAt === Infinity) {
          const proposal = propose(spo2, NO_URGENCY);
          if (proposal?.step && (proposal.direction === "up" || proposal.direction === "down")) {
            pendingStep = proposal.step;
            pendingAt = t + delaySeconds(random, care.routineTherapist);
          }
        }
      }
    } else if (model === "tidemark") {
      if (spo2 !== null)
        advanceWatch(
          watch,
          { t: ms, spo2, fio2, flow, source: "monitor" },
          band,
          care.detection,
          onEvent,
        );
      else checkSignal(watch, ms, band, care.detection, onEvent);
      if (t >= respondAt) {
        respondAt = Infinity;
        therapistAt = t + delaySeconds(random, care.therapist);
      }
      if (t >= therapistAt) {
        therapistAt = Infinity;
        // The therapist reads the monitor now (or the last value, if the probe is off).
        const reading = spo2 ?? (t - lastSampleAt < 300 ? lastSpo2 : null);
        const proposal = reading === null ? null : propose(reading);
        if (proposal && (proposal.direction === "up" || proposal.direction === "down"))
          apply(t, proposal.step);
        // Still out of band: the team looks again after a while.
        if (watch.phase === "open") therapistAt = t + care.reassessMinutes * 60;
      }
    } else if (t >= nextReference) {
      nextReference += care.referenceEverySeconds;
      // In band the proposal is always "hold" (proposeStep's rule): no need to ask.
      if (spo2 !== null && classifySpo2(spo2, setting, band) !== "inBand") {
        const proposal = propose(spo2);
        if (proposal && (proposal.direction === "up" || proposal.direction === "down"))
          apply(t, proposal.step);
      }
    }
  }

  const m = measures.finish(end * 1000);
  const periodMs = end * 1000;
  return {
    patient: profile.index,
    model,
    periodMs,
    belowMs: m.belowMs,
    inBandMs: m.inBandMs,
    aboveMs: m.aboveMs,
    unknownMs: Math.max(0, periodMs - m.belowMs - m.inBandMs - m.aboveMs),
    below88Ms: m.below88Ms,
    below85Ms: m.below85Ms,
    fio2HoursAboveRoomAir: m.fio2ExcessS / 3600,
    adjustments,
    alerts,
    escalations,
  };
}
