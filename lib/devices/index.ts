import type { RespiratorySupport } from "../oxygen";
import type { StepTableView } from "../step-tables/queries";

// What Tidemark knows about oxygen delivery devices, in one place: which are
// low-flow, what each can deliver, the limits a prescriber starts from, the
// FiO2 a low-flow device gives at a flow, and which step tables fit. Pure data
// and functions, safe for the browser; orders, bedside forms, readings, blood
// gases, imports, the FHIR export and the seeds import it.

/** Oxygen delivery devices an order can prescribe (DEVELOPERS.md, "The product's words"). */
export const DEVICES = [
  "room_air",
  "nasal_cannula",
  "simple_mask",
  "venturi_mask",
  "reservoir_mask",
  "hfnc",
  "niv",
  "invasive",
] as const;
export type Device = (typeof DEVICES)[number];

type Range = { min: number; max: number };

export type DeviceProfile = {
  label: string;
  /** Low-flow devices: the delivered FiO2 varies with breathing, so it is an estimate. */
  lowFlow: boolean;
  /** Which settings the order limits and the bedside team titrates. */
  uses: { fio2: "set" | "estimated" | "fixed"; peep: boolean; flow: boolean };
  /** What the device can physically deliver; limits outside this are refused. */
  fio2: Range;
  peep?: Range;
  flow?: Range;
};

// Flow and FiO2 ranges per device are common practice (typical manufacturer
// and ward ranges), not a single published source.
export const DEVICE_PROFILES: Record<Device, DeviceProfile> = {
  room_air: {
    label: "Room air",
    lowFlow: true,
    uses: { fio2: "fixed", peep: false, flow: false },
    fio2: { min: 0.21, max: 0.21 },
  },
  nasal_cannula: {
    label: "Nasal cannula",
    lowFlow: true,
    uses: { fio2: "estimated", peep: false, flow: true },
    fio2: { min: 0.21, max: 0.45 },
    flow: { min: 0.5, max: 6 },
  },
  simple_mask: {
    label: "Simple face mask",
    lowFlow: true,
    uses: { fio2: "estimated", peep: false, flow: true },
    fio2: { min: 0.35, max: 0.6 },
    flow: { min: 5, max: 10 },
  },
  venturi_mask: {
    label: "Venturi mask",
    lowFlow: false,
    uses: { fio2: "set", peep: false, flow: false },
    fio2: { min: 0.24, max: 0.6 },
  },
  reservoir_mask: {
    label: "Reservoir (non-rebreather) mask",
    lowFlow: true,
    uses: { fio2: "estimated", peep: false, flow: true },
    fio2: { min: 0.6, max: 0.9 },
    flow: { min: 10, max: 15 },
  },
  hfnc: {
    label: "High-flow nasal cannula",
    lowFlow: false,
    uses: { fio2: "set", peep: false, flow: true },
    fio2: { min: 0.21, max: 1 },
    flow: { min: 10, max: 70 },
  },
  niv: {
    label: "NIV / CPAP",
    lowFlow: false,
    uses: { fio2: "set", peep: true, flow: false },
    fio2: { min: 0.21, max: 1 },
    peep: { min: 3, max: 20 },
  },
  invasive: {
    label: "Invasive ventilation",
    lowFlow: false,
    uses: { fio2: "set", peep: true, flow: false },
    fio2: { min: 0.21, max: 1 },
    peep: { min: 0, max: 30 },
  },
};

/** A limit pair and the starting value inside it: [minimum, maximum, start]. */
export type LimitTriple = readonly [min: number, max: number, start: number];

export type DeviceDefaults = { fio2: LimitTriple; peep?: LimitTriple; flow?: LimitTriple };

/**
 * Limits a prescriber usually starts from for each device, inside
 * DEVICE_PROFILES' physical ranges. The values are common practice, not a
 * single published source. For low-flow devices the FiO2 limits follow the
 * estimate at the flow limits and the starting FiO2 is the estimate at the
 * starting flow (estimateFio2).
 */
export const DEVICE_DEFAULTS: Record<Device, DeviceDefaults> = {
  room_air: { fio2: [0.21, 0.21, 0.21] },
  nasal_cannula: { fio2: [0.24, 0.37, 0.29], flow: [1, 4, 2] },
  simple_mask: { fio2: [0.35, 0.55, 0.39], flow: [5, 10, 6] },
  venturi_mask: { fio2: [0.24, 0.4, 0.28] },
  reservoir_mask: { fio2: [0.6, 0.9, 0.9], flow: [10, 15, 15] },
  hfnc: { fio2: [0.3, 0.6, 0.4], flow: [30, 60, 40] },
  niv: { fio2: [0.3, 0.6, 0.4], peep: [5, 10, 5] },
  invasive: { fio2: [0.3, 0.8, 0.4], peep: [5, 14, 8] },
};

/**
 * Whether a step table can guide a device: FiO2/PEEP tables only where the
 * device has a PEEP setting, flow/FiO2 tables only where it has a flow setting.
 */
export function stepTableFitsDevice(kind: StepTableView["kind"], device: Device): boolean {
  const uses = DEVICE_PROFILES[device].uses;
  switch (kind) {
    case "fio2_peep":
      return uses.peep;
    case "flow_fio2":
      return uses.flow;
  }
}

/** Why a step table does not fit a device, in words (the refusal on `stepTableId`). */
export function stepTableMismatchMessage(
  table: { name: string; kind: StepTableView["kind"] },
  device: Device,
): string {
  const steps = table.kind === "fio2_peep" ? "FiO2 and PEEP" : "flow and FiO2";
  const missing = table.kind === "fio2_peep" ? "PEEP" : "flow";
  return `${table.name} steps ${steps}, but ${DEVICE_PROFILES[device].label} has no ${missing} setting. Choose a table that fits the device, or none.`;
}

/**
 * Estimated FiO2 for a low-flow device at a given flow. Rules of thumb of the
 * trade (common practice, recalled from memory): nasal cannula adds about 4 %
 * per L/min above air; a simple mask gives about 35–55 % at 5–10 L/min; a
 * reservoir mask about 60–90 % at 10–15 L/min.
 */
export function estimateFio2(device: Device, flowLMin: number | null | undefined): number | null {
  // A flow still being typed (NaN) gives no estimate rather than a NaN FiO2.
  if (flowLMin != null && !Number.isFinite(flowLMin)) return null;
  const clamp = (v: number, p: DeviceProfile) => Math.min(p.fio2.max, Math.max(p.fio2.min, v));
  const round = (v: number) => Math.round(v * 100) / 100;
  const profile = DEVICE_PROFILES[device];
  switch (device) {
    case "room_air":
      return 0.21;
    case "nasal_cannula":
      return flowLMin == null ? null : round(clamp(0.21 + 0.04 * flowLMin, profile));
    case "simple_mask":
      return flowLMin == null ? null : round(clamp(0.35 + 0.04 * (flowLMin - 5), profile));
    case "reservoir_mask":
      return flowLMin == null ? null : round(clamp(0.6 + 0.06 * (flowLMin - 10), profile));
    case "venturi_mask":
    case "hfnc":
    case "niv":
    case "invasive":
      return null;
  }
}

/** The kind of respiratory support each device is, as the ARDS definitions classify it. */
export const RESPIRATORY_SUPPORT: Record<Device, RespiratorySupport> = {
  room_air: "none",
  nasal_cannula: "conventional",
  simple_mask: "conventional",
  venturi_mask: "conventional",
  reservoir_mask: "conventional",
  hfnc: "hfnc",
  niv: "niv",
  invasive: "invasive",
};
