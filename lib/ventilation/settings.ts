import type { Device } from "../devices";
import { predictedBodyWeight, RANGES, type Sex } from "../oxygen";

// What a ventilator order adds to an oxygen order: the mode, the tidal volume
// target per kg of predicted body weight, the rate range and the
// lung-protective pressure limits. Pure data, safe for the browser.

/** Ventilation modes in the trade's words. */
export const VENT_MODES = [
  "volume_control",
  "pressure_control",
  "pressure_support",
  "cpap",
] as const;
export type VentMode = (typeof VENT_MODES)[number];

export const VENT_MODE_LABELS: Record<VentMode, string> = {
  volume_control: "Volume control (VC)",
  pressure_control: "Pressure control (PC)",
  pressure_support: "Pressure support (PS)",
  cpap: "CPAP",
};

/**
 * The modes each ventilator device offers: invasive ventilation all four; NIV
 * is given as pressure support (inspiratory over expiratory pressure) or CPAP
 * (common practice). Devices without a ventilator have none.
 */
export const VENT_MODES_BY_DEVICE: Record<Device, readonly VentMode[]> = {
  room_air: [],
  nasal_cannula: [],
  simple_mask: [],
  venturi_mask: [],
  reservoir_mask: [],
  hfnc: [],
  niv: ["pressure_support", "cpap"],
  invasive: VENT_MODES,
};

/** Invasive ventilation and NIV: the devices whose orders carry ventilator settings. */
export function isVentilatorDevice(device: Device): boolean {
  return VENT_MODES_BY_DEVICE[device].length > 0;
}

/**
 * Where a new ventilator order starts. The tidal volume goal 6 mL/kg PBW with
 * 4–8 allowed, the rate up to 35 /min and the plateau pressure at most 30
 * cmH2O are the ARDS Network protocol's (NEJM 2000;342:1301); a driving
 * pressure limit of 15 cmH2O is common practice; a lowest rate of 10 /min is
 * common practice.
 */
export const VENT_DEFAULTS = {
  vtTarget: 6,
  vtMin: 4,
  vtMax: 8,
  rateMin: 10,
  rateMax: 35,
  plateauLimit: 30,
  drivingLimit: 15,
} as const;

/** The first mode a device's order offers: volume control when invasive, pressure support on NIV. */
export function defaultModeFor(device: Device): VentMode | null {
  return VENT_MODES_BY_DEVICE[device][0] ?? null;
}

/** The ventilator part of an order, as the views show it (mL/kg of predicted body weight). */
export type VentilatorOrderSettings = {
  mode: VentMode;
  vtTargetMlKg: number;
  vtMinMlKg: number;
  vtMaxMlKg: number;
  rateMin: number;
  rateMax: number;
  plateauLimit: number;
  drivingLimit: number;
  /** The predicted body weight the order was written against, and the height it came from. */
  pbwKg: number;
  heightCm: number;
};

/** The tidal volume in mL that a target in mL/kg gives for this predicted body weight (whole mL). */
export function tidalVolumeForTarget(mlPerKg: number, pbwKg: number): number {
  return Math.round(mlPerKg * pbwKg);
}

/**
 * A patient's predicted body weight for the screens, or null when the height
 * is not recorded or lies outside the equation's adult range (RANGES.heightCm):
 * then the height is asked for, never guessed.
 */
export function bodyWeightOf(patient: {
  heightCm: number | null;
  sex: Sex;
}): { pbwKg: number; heightCm: number; sex: Sex } | null {
  const { heightCm, sex } = patient;
  if (heightCm === null || heightCm < RANGES.heightCm.min || heightCm > RANGES.heightCm.max)
    return null;
  return { pbwKg: Math.round(predictedBodyWeight({ heightCm, sex }) * 10) / 10, heightCm, sex };
}
