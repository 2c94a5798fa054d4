import { DEFAULT_DETECTION, type DetectionOptions } from "../alerts/detect";
import { ardsNetworkTable, type OrderStep, type TitrationOrder } from "../oxygen";

/**
 * Every figure a rehearsal runs on, with its default and where that default
 * comes from. The run's basis view lists {@link REHEARSAL_BASIS}; a unit may
 * override any figure, and the run records which it used.
 */

/** A range a figure is drawn from uniformly. */
export type Span = { low: number; high: number };

export type PatientParameters = {
  /** Starting shunt fraction of a patient on high-flow nasal oxygen. */
  hfncShunt: Span;
  /** Starting shunt fraction of a ventilated patient. */
  ventilatedShunt: Span;
  /** Share of the cohort on invasive ventilation (the rest on high-flow nasal oxygen). */
  ventilatedShare: number;
  /** Bounds of the shunt's walk. */
  shuntBounds: Span;
  /** Random-walk spread of the shunt fraction, per √hour. */
  driftPerRootHour: number;
  /** Time constant of the walk's pull back toward the patient's own baseline. */
  reversionHours: number;
  /** How much the baseline shunt falls per day (recovery). */
  recoveryPerDay: number;
  /** Desaturation episodes: rate, shunt rise, duration. */
  desaturationPerHour: number;
  desaturationRise: Span;
  desaturationMinutes: Span;
  /** Endotracheal suction (ventilated patients): rate, shunt rise, duration. */
  suctionPerHour: number;
  suctionRise: Span;
  suctionMinutes: Span;
  /** Position changes: interval, and the spread of the shift of the baseline each new position brings (it lasts until the next). */
  repositionHours: number;
  repositionShiftSd: number;
  /** g/dL */
  hemoglobin: Span;
  /** mmHg */
  paco2: Span;
  /** mmHg */
  barometricPressure: number;
  /** Time constant of arterial saturation settling after a change of FiO2 or shunt. */
  settleSeconds: number;
  /** How often the shunt model is solved (the walk itself moves every second). */
  physiologyEverySeconds: number;
};

export type OximeterParameters = {
  /** SD across patients of the oximeter's bias against SaO2, % points (fixed for a stay). */
  biasSd: number;
  /** SD of the slowly varying error, % points, and its time constant. */
  precisionSd: number;
  precisionSeconds: number;
  /** Motion artefacts: rate, depth of the false drop, duration. */
  artefactPerHour: number;
  artefactDepth: Span;
  artefactSeconds: Span;
  /** Probe off: rate, and the median and log-spread of the gap. */
  probeOffPerHour: number;
  probeOffMedianMinutes: number;
  probeOffSigma: number;
};

/** A delay drawn log-normally: median and σ of its logarithm. */
export type Delay = { medianMinutes: number; sigma: number };

export type CareParameters = {
  /** Fixed-interval routine: a nurse checks this often… */
  checkEveryMinutes: number;
  /** …and the therapist adjusts one step after this delay. */
  routineTherapist: Delay;
  /** Tidemark: alert detection as the app configures it by default. */
  detection: DetectionOptions;
  /** Nurse's response to an alert. */
  nurseResponse: Delay;
  /** Unacknowledged this long → escalated (ALERT_ESCALATE_MINUTES default). */
  escalateAfterMinutes: number;
  /** Response of the escalation level once escalated. */
  escalatedResponse: Delay;
  /** Therapist applying the proposal after the nurse's response. */
  therapist: Delay;
  /** While the excursion stays open, the team looks again this long after a step. */
  reassessMinutes: number;
  /** Reference: instant response, this often. */
  referenceEverySeconds: number;
};

export type RehearsalParameters = {
  patient: PatientParameters;
  oximeter: OximeterParameters;
  care: CareParameters;
  /**
   * The protocol under rehearsal: the order (band, limits, step table) each
   * device's patients get instead of {@link defaultOrder}. Orders take no
   * random numbers, so two protocols on one seed meet the same patients.
   */
  protocol?: Partial<Record<DeviceKind, TitrationOrder>>;
};

export const DEFAULT_PARAMETERS: RehearsalParameters = {
  patient: {
    hfncShunt: { low: 0.15, high: 0.3 },
    ventilatedShunt: { low: 0.2, high: 0.33 },
    ventilatedShare: 0.25,
    shuntBounds: { low: 0.03, high: 0.45 },
    driftPerRootHour: 0.012,
    reversionHours: 6,
    recoveryPerDay: 0.02,
    desaturationPerHour: 1 / 8,
    desaturationRise: { low: 0.05, high: 0.15 },
    desaturationMinutes: { low: 5, high: 40 },
    suctionPerHour: 1 / 4,
    suctionRise: { low: 0.05, high: 0.15 },
    suctionMinutes: { low: 1, high: 5 },
    repositionHours: 2,
    repositionShiftSd: 0.03,
    hemoglobin: { low: 8, high: 14 },
    paco2: { low: 35, high: 50 },
    barometricPressure: 760,
    settleSeconds: 90,
    physiologyEverySeconds: 20,
  },
  oximeter: {
    biasSd: 1.5,
    precisionSd: 1,
    precisionSeconds: 120,
    artefactPerHour: 1,
    artefactDepth: { low: 5, high: 20 },
    artefactSeconds: { low: 10, high: 60 },
    probeOffPerHour: 1 / 6,
    probeOffMedianMinutes: 3,
    probeOffSigma: 0.8,
  },
  care: {
    checkEveryMinutes: 60,
    routineTherapist: { medianMinutes: 10, sigma: 0.5 },
    detection: DEFAULT_DETECTION,
    nurseResponse: { medianMinutes: 4, sigma: 0.7 },
    escalateAfterMinutes: 10,
    escalatedResponse: { medianMinutes: 5, sigma: 0.5 },
    therapist: { medianMinutes: 5, sigma: 0.5 },
    reassessMinutes: 15,
    referenceEverySeconds: 30,
  },
};

const ASSUMED = "assumed — common practice";

/** One line of the basis view: the figure, its default in words, and its source. */
export type BasisEntry = { name: string; value: string; source: string };

const span = (s: Span, unit = "") => `${s.low}–${s.high}${unit}`;
const delay = (d: Delay) => `median ${d.medianMinutes} min, log-normal σ ${d.sigma}`;

/**
 * Every figure of a run with its source, for the run's basis view; a figure
 * set for the run (not the default) says so and keeps the default's source.
 */
export function rehearsalBasis(p: RehearsalParameters = DEFAULT_PARAMETERS): BasisEntry[] {
  const defaults = basisOf(DEFAULT_PARAMETERS);
  return basisOf(p).map((entry, i) => {
    const d = defaults[i]!;
    if (entry.value === d.value || entry.name.startsWith("Order,")) return entry;
    return { ...entry, source: `set for this run; the default ${d.value}: ${d.source}` };
  });
}

function basisOf(p: RehearsalParameters): BasisEntry[] {
  const { patient: v, oximeter: o, care: c } = p;
  return [
    { name: "Starting shunt, high-flow nasal oxygen", value: span(v.hfncShunt), source: ASSUMED },
    { name: "Starting shunt, ventilated", value: span(v.ventilatedShunt), source: ASSUMED },
    { name: "Share ventilated", value: `${v.ventilatedShare}`, source: ASSUMED },
    { name: "Shunt bounds", value: span(v.shuntBounds), source: ASSUMED },
    { name: "Shunt drift", value: `${v.driftPerRootHour} per √h`, source: ASSUMED },
    { name: "Pull toward baseline", value: `${v.reversionHours} h`, source: ASSUMED },
    { name: "Recovery", value: `${v.recoveryPerDay} shunt per day`, source: ASSUMED },
    {
      name: "Desaturation episodes",
      value: `${v.desaturationPerHour}/h, +${span(v.desaturationRise)} for ${span(v.desaturationMinutes, " min")}`,
      source: ASSUMED,
    },
    {
      name: "Suction (ventilated)",
      value: `${v.suctionPerHour}/h, +${span(v.suctionRise)} for ${span(v.suctionMinutes, " min")}`,
      source: ASSUMED,
    },
    {
      name: "Position changes",
      value: `every ${v.repositionHours} h, each position shifts the baseline (SD ${v.repositionShiftSd}) until the next`,
      source: "two-hourly repositioning: common practice; the shift it brings: assumed",
    },
    { name: "Haemoglobin", value: span(v.hemoglobin, " g/dL"), source: ASSUMED },
    { name: "PaCO2", value: span(v.paco2, " mmHg"), source: ASSUMED },
    {
      name: "Saturation settling",
      value: `time constant ${v.settleSeconds} s`,
      source:
        "PaO2 settles within about 5–10 min of an FiO2 step in ventilated patients (Cakar N, et al. Intensive Care Med 2001;27:655–9; recalled from memory)",
    },
    {
      name: "Shunt model and curve",
      value: "lib/oxygen shunt model, Severinghaus curve",
      source: "Berggren 1942; Severinghaus 1979 (lib/oxygen/sources.ts)",
    },
    {
      name: "Oximeter bias and precision",
      value: `bias SD ${o.biasSd} (per patient), precision SD ${o.precisionSd} (time constant ${o.precisionSeconds} s): Arms ≈ ${Math.hypot(o.biasSd, o.precisionSd).toFixed(1)} %, displayed in whole %`,
      source:
        "ISO 80601-2-61 requires Arms ≤ 4 % over SaO2 70–100 % (recalled from memory); the split between bias and precision: assumed",
    },
    {
      name: "Motion artefacts",
      value: `${o.artefactPerHour}/h, false drop ${span(o.artefactDepth, " points")} for ${span(o.artefactSeconds, " s")}`,
      source: ASSUMED,
    },
    {
      name: "Probe off",
      value: `${o.probeOffPerHour}/h, median ${o.probeOffMedianMinutes} min`,
      source: ASSUMED,
    },
    {
      name: "Fixed-interval check",
      value: `every ${c.checkEveryMinutes} min`,
      source: "hourly observations on high-dependency and intensive care units (common practice)",
    },
    { name: "Routine therapist delay", value: delay(c.routineTherapist), source: ASSUMED },
    {
      name: "Alert detection",
      value: `sustain ${c.detection.sustainMs / 1000} s at ${c.detection.sustainShare * 100} %, urgent ${c.detection.urgentSustainMs / 1000} s`,
      source: "the app's defaults (lib/alerts/detect.ts DEFAULT_DETECTION)",
    },
    { name: "Nurse response to an alert", value: delay(c.nurseResponse), source: ASSUMED },
    {
      name: "Escalation",
      value: `after ${c.escalateAfterMinutes} min unacknowledged; then ${delay(c.escalatedResponse)}`,
      source: "the app's default ALERT_ESCALATE_MINUTES; the response after it: assumed",
    },
    { name: "Therapist applying the proposal", value: delay(c.therapist), source: ASSUMED },
    {
      name: "Look again while the excursion is open",
      value: `${c.reassessMinutes} min`,
      source: ASSUMED,
    },
    {
      name: "Reference",
      value: `instant response every ${c.referenceEverySeconds} s`,
      source: "an upper bound, not a workflow",
    },
    ...(["hfnc", "ventilator"] as const).map((device) => {
      const o = orderFor(device, p);
      return {
        name: `Order, ${device === "hfnc" ? "high-flow nasal oxygen" : "ventilated"}`,
        value: `SpO2 ${o.spo2Target.lower}–${o.spo2Target.upper} %, FiO2 ${o.limits.fio2Min}–${o.limits.fio2Max}, ${o.steps.length} steps`,
        source: p.protocol?.[device]
          ? "the protocol under rehearsal"
          : "the default cohort's order",
      };
    }),
  ];
}

/** The default SpO2 band (92–96 %, a usual adult intensive care target; common practice). */
export const DEFAULT_BAND = { lower: 92, upper: 96 } as const;

/** High-flow nasal oxygen at 40 L/min, FiO2 in 0.05 steps to 0.5, then 0.1 (assumed — common practice). */
const HFNC_STEPS: readonly OrderStep[] = [
  0.21, 0.25, 0.3, 0.35, 0.4, 0.45, 0.5, 0.6, 0.7, 0.8, 0.9, 1,
].map((fio2) => ({ fio2, flow: 40 }));

export type DeviceKind = "hfnc" | "ventilator";

/** The order a device's patients get: the protocol's, else the default cohort's. */
export function orderFor(
  device: DeviceKind,
  p: Pick<RehearsalParameters, "protocol">,
): TitrationOrder {
  return p.protocol?.[device] ?? defaultOrder(device);
}

/** The order each device gets in the default cohort. */
export function defaultOrder(device: DeviceKind): TitrationOrder {
  if (device === "hfnc")
    return {
      spo2Target: { ...DEFAULT_BAND },
      limits: { fio2Min: 0.21, fio2Max: 0.8, flowMin: 40, flowMax: 40 },
      steps: HFNC_STEPS,
    };
  return {
    spo2Target: { ...DEFAULT_BAND },
    limits: { fio2Min: 0.3, fio2Max: 1, peepMin: 5, peepMax: 18 },
    steps: ardsNetworkTable("lower-peep"),
  };
}
