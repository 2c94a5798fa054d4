import { alveolarPO2, saturationFromPO2, shuntArterialPO2 } from "../oxygen";
import type { ProposedSetting, TitrationOrder } from "../oxygen";
import { candidates, withinLimits } from "../oxygen/step-geometry";
import { orderFor, type DeviceKind, type RehearsalParameters, type Span } from "./parameters";
import { mixSeed, Random } from "./random";

/** Who a virtual patient is: drawn once, the same for every care model. */
export type PatientProfile = {
  index: number;
  device: DeviceKind;
  order: TitrationOrder;
  /** g/dL */
  hemoglobin: number;
  /** mmHg */
  paco2: number;
  barometricPressure: number;
  /** Shunt fraction at admission, 0–1. */
  startShunt: number;
  /** The oximeter's bias against SaO2 for this stay, % points. */
  oximeterBias: number;
  /** The setting the stay starts on (a row of the order's table, within its limits). */
  startSetting: ProposedSetting;
};

const draw = (random: Random, s: Span) => random.between(s.low, s.high);

/** Seconds until the next event of a Poisson process with `perHour` events an hour (never, at 0). */
function waitSeconds(random: Random, perHour: number): number {
  if (perHour <= 0) return Infinity;
  return Math.max(1, Math.round((-Math.log(1 - random.next()) * 3600) / perHour));
}

/**
 * Arterial saturation (%) at steady state for a shunt fraction and FiO2: the
 * alveolar gas equation, the engine's shunt model and the Severinghaus curve —
 * the same functions the bedside forecast uses.
 */
export function steadySaturation(
  profile: Pick<PatientProfile, "hemoglobin" | "paco2" | "barometricPressure">,
  shunt: number,
  fio2: number,
): number {
  return 100 * saturationFromPO2(steadyPao2(profile, shunt, fio2));
}

/** The arterial PO2 (mmHg) at steady state, for building a matching blood gas. */
export function steadyPao2(
  profile: Pick<PatientProfile, "hemoglobin" | "paco2" | "barometricPressure">,
  shunt: number,
  fio2: number,
): number {
  const alveolar = alveolarPO2({
    fio2,
    paco2: profile.paco2,
    barometricPressure: profile.barometricPressure,
  });
  return shuntArterialPO2(profile.hemoglobin, alveolar, shunt);
}

/** The least support within the order's limits that puts the patient at least one point into the band. */
function startingSetting(
  order: TitrationOrder,
  profile: Omit<PatientProfile, "startSetting" | "order" | "index" | "device">,
): ProposedSetting {
  const allowed = candidates(order.steps).filter((c) => withinLimits(c, order.limits));
  for (const c of allowed) {
    if (steadySaturation(profile, profile.startShunt, c.fio2) >= order.spo2Target.lower + 1)
      return c;
  }
  const last = allowed[allowed.length - 1];
  if (!last) throw new RangeError("The order has no step within its limits");
  return last;
}

/** The cohort's patient number `index` for a run seed. */
export function drawPatient(seed: number, index: number, p: RehearsalParameters): PatientProfile {
  const random = new Random(mixSeed(seed, index, 1));
  const device: DeviceKind = random.chance(p.patient.ventilatedShare) ? "ventilator" : "hfnc";
  const order = orderFor(device, p);
  const base = {
    hemoglobin: draw(random, p.patient.hemoglobin),
    paco2: draw(random, p.patient.paco2),
    barometricPressure: p.patient.barometricPressure,
    startShunt: draw(random, device === "hfnc" ? p.patient.hfncShunt : p.patient.ventilatedShunt),
    oximeterBias: p.oximeter.biasSd * random.normal(),
  };
  return { index, device, order, ...base, startSetting: startingSetting(order, base) };
}

/**
 * One patient's course second by second. What happens to the patient (the
 * shunt's walk, events, the oximeter's error, artefacts, the probe coming off)
 * depends only on the seed, never on the care given, so every care model meets
 * the same course; only the FiO2 given changes the saturation.
 * Mutated in place, one object per stay: the 1 Hz loop allocates nothing.
 */
export class VirtualPatient {
  /** Seconds since the stay began. */
  t = 0;
  /** Shunt fraction now, events included. */
  shunt: number;
  /** Arterial saturation now, %. */
  sao2: number;
  /** What the monitor shows now (whole %), or null while the probe is off. */
  spo2: number | null = null;

  private readonly random: Random;
  private readonly p: RehearsalParameters;
  private deviation = 0;
  private reposition = 0;
  private nextReposition: number;
  private eventRise = 0;
  private eventEnd = 0;
  private error = 0;
  private artefactDrop = 0;
  private artefactEnd = 0;
  private probeOffEnd = 0;
  private nextDesaturation: number;
  private nextSuction: number;
  private nextArtefact: number;
  private nextProbeOff: number;
  private steadyAt = -1;
  private steadyFio2 = -1;
  private steady: number;
  private readonly settleFactor: number;
  private readonly errorFactor: number;
  private readonly errorNoise: number;

  constructor(
    readonly profile: PatientProfile,
    seed: number,
    p: RehearsalParameters,
  ) {
    this.p = p;
    this.random = new Random(mixSeed(seed, profile.index, 2));
    this.shunt = profile.startShunt;
    this.nextReposition = p.patient.repositionHours * 3600;
    this.steady = steadySaturation(profile, this.shunt, profile.startSetting.fio2);
    this.sao2 = this.steady;
    this.settleFactor = 1 - Math.exp(-1 / p.patient.settleSeconds);
    const a = Math.exp(-1 / p.oximeter.precisionSeconds);
    this.errorFactor = a;
    this.errorNoise = p.oximeter.precisionSd * Math.sqrt(1 - a * a);
    this.error = p.oximeter.precisionSd * this.random.normal();
    // Events come as Poisson processes: each waits an exponential time for the next.
    const suctionRate = profile.device === "ventilator" ? p.patient.suctionPerHour : 0;
    this.nextDesaturation = waitSeconds(this.random, p.patient.desaturationPerHour);
    this.nextSuction = waitSeconds(this.random, suctionRate);
    this.nextArtefact = waitSeconds(this.random, p.oximeter.artefactPerHour);
    this.nextProbeOff = waitSeconds(this.random, p.oximeter.probeOffPerHour);
    this.show();
  }

  /** One second on, at the FiO2 given during it. */
  advance(fio2: number): void {
    const { patient: v, oximeter: o } = this.p;
    const r = this.random;
    this.t += 1;
    const t = this.t;
    // The walk: Ornstein–Uhlenbeck around the patient's own, slowly recovering baseline.
    this.deviation +=
      -this.deviation / (v.reversionHours * 3600) + (v.driftPerRootHour / 60) * r.normal();
    if (t >= this.nextReposition) {
      this.nextReposition += v.repositionHours * 3600;
      this.reposition = v.repositionShiftSd * r.normal();
    }
    if (t >= this.eventEnd) this.eventRise = 0;
    if (t >= this.nextDesaturation) {
      this.nextDesaturation = t + waitSeconds(r, v.desaturationPerHour);
      this.eventRise = draw(r, v.desaturationRise);
      this.eventEnd = t + 60 * draw(r, v.desaturationMinutes);
    }
    if (t >= this.nextSuction) {
      this.nextSuction = t + waitSeconds(r, v.suctionPerHour);
      this.eventRise = Math.max(this.eventRise, draw(r, v.suctionRise));
      this.eventEnd = Math.max(this.eventEnd, t + 60 * draw(r, v.suctionMinutes));
    }
    const baseline = this.profile.startShunt - (v.recoveryPerDay * t) / 86400 + this.reposition;
    const shunt = baseline + this.deviation + this.eventRise;
    this.shunt = Math.min(v.shuntBounds.high, Math.max(v.shuntBounds.low, shunt));
    // The shunt model is solved every few seconds, and at once when FiO2 changes.
    if (fio2 !== this.steadyFio2 || t - this.steadyAt >= v.physiologyEverySeconds) {
      this.steady = steadySaturation(this.profile, this.shunt, fio2);
      this.steadyFio2 = fio2;
      this.steadyAt = t;
    }
    this.sao2 += (this.steady - this.sao2) * this.settleFactor;
    // The oximeter.
    this.error = this.errorFactor * this.error + this.errorNoise * r.normal();
    if (t >= this.artefactEnd) this.artefactDrop = 0;
    if (t >= this.nextArtefact) {
      this.nextArtefact = t + waitSeconds(r, o.artefactPerHour);
      this.artefactDrop = draw(r, o.artefactDepth);
      this.artefactEnd = t + draw(r, o.artefactSeconds);
    }
    if (t >= this.nextProbeOff) {
      this.probeOffEnd = t + 60 * r.logNormal(o.probeOffMedianMinutes, o.probeOffSigma);
      this.nextProbeOff = this.probeOffEnd + waitSeconds(r, o.probeOffPerHour);
    }
    this.show();
  }

  private show(): void {
    if (this.t < this.probeOffEnd) {
      this.spo2 = null;
      return;
    }
    const shown = this.sao2 + this.profile.oximeterBias + this.error - this.artefactDrop;
    this.spo2 = Math.round(Math.min(100, Math.max(0, shown)));
  }
}
