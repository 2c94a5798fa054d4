import type { Basis } from "./basis";
import { checkChoice, OxygenChoiceError, OxygenInputError } from "./errors";
import { checkBetween, checkRange, RANGES } from "./ranges";
import { SOURCES } from "./sources";

export type CylinderSize = "D" | "E" | "M" | "G" | "H" | "K";
export type CylinderPressureUnit = "psi" | "bar" | "kPa";

/** Litres of oxygen per psi of gauge pressure for the common US sizes (common practice). */
export const CYLINDER_FACTORS: Readonly<Record<CylinderSize, number>> = Object.freeze({
  D: 0.16,
  E: 0.28,
  M: 1.56,
  G: 2.41,
  H: 3.14,
  K: 3.14,
});
const SIZES = Object.keys(CYLINDER_FACTORS) as CylinderSize[];
const UNITS = ["psi", "bar", "kPa"] as const satisfies readonly CylinderPressureUnit[];

/** Left in a cylinder so it is changed before it runs dry: 200 psi, about 14 bar (common practice). */
export const DEFAULT_CYLINDER_RESERVE_PSI = 200;
/** 1 bar = 100 kPa = 14.5038 psi (1 psi = 6894.757 Pa). */
export const PSI_PER_BAR = 14.5037738;
const PER_BAR: Record<CylinderPressureUnit, number> = { bar: 1, psi: PSI_PER_BAR, kPa: 100 };

const convert = (value: number, from: CylinderPressureUnit, to: CylinderPressureUnit) =>
  from === to ? value : (value / PER_BAR[from]) * PER_BAR[to];

export interface CylinderDurationInput {
  /** A US size letter (cylinder factor in L/psi); give this or waterCapacityLitres. */
  size?: CylinderSize | null;
  /** Water capacity in litres, the European label; give this or size. */
  waterCapacityLitres?: number | null;
  /** Gauge pressure as read. */
  pressure: { value: number; unit: CylinderPressureUnit };
  /** In the pressure's unit; 200 psi converted to it when omitted. */
  reserve?: number | null;
  flowLMin: number;
}

export interface CylinderDuration {
  minutes: number;
  /** Litres of oxygen at atmospheric pressure above the reserve. */
  litresAvailable: number;
  /** The reserve used, in the pressure's unit; `assumed` when the default was taken. */
  reserve: { value: number; unit: CylinderPressureUnit; assumed: boolean };
  basis: Basis;
}

/**
 * How long an oxygen cylinder lasts at a flow (see SOURCES.oxygenCylinder):
 * by US size, minutes = (pressure − reserve) (psi) × cylinder factor (L/psi) ÷ flow;
 * by water capacity, litres = water capacity (L) × (pressure − reserve) (bar),
 * minutes = litres ÷ flow (ideal gas). Pressures in psi, bar or kPa are
 * converted to the unit the method counts in. Refuses a pressure not above the
 * reserve, a flow outside 0.5–70 L/min, an unknown size, and a cylinder given
 * by both or neither of size and water capacity.
 */
export function cylinderDuration({
  size,
  waterCapacityLitres,
  pressure,
  reserve,
  flowLMin,
}: CylinderDurationInput): CylinderDuration {
  const unit = checkChoice("pressure.unit", pressure.unit, UNITS);
  const highest = convert(RANGES.cylinderPressure.max, "bar", unit);
  checkBetween("pressure.value", pressure.value, RANGES.cylinderPressure.min, highest, unit);
  const assumed = reserve === undefined || reserve === null;
  const reserveValue =
    reserve === undefined || reserve === null
      ? convert(DEFAULT_CYLINDER_RESERVE_PSI, "psi", unit)
      : checkBetween("reserve", reserve, RANGES.cylinderPressure.min, highest, unit);
  if (!(pressure.value > reserveValue)) {
    throw new OxygenInputError({
      field: "pressure.value",
      value: pressure.value,
      min: reserveValue,
      max: highest,
      unit,
      reason: `the pressure must exceed the reserve of ${Number(reserveValue.toPrecision(4))} ${unit} left in the cylinder${assumed ? " (common practice)" : ""}`,
    });
  }
  checkRange("flowLMin", flowLMin, RANGES.flow);

  const given = (value: unknown) => value !== undefined && value !== null;
  if (given(size) === given(waterCapacityLitres)) {
    throw new OxygenChoiceError({
      field: "cylinder",
      value: given(size) ? "size and waterCapacityLitres" : "neither",
      allowed: ["size", "waterCapacityLitres"],
      reason: "give exactly one: a US size letter or the water capacity in litres",
    });
  }

  const usable = pressure.value - reserveValue;
  const common = {
    pressure: { value: pressure.value, unit },
    reserve: { value: reserveValue, unit },
    flow: { value: flowLMin, unit: "L/min" },
  };
  const assumptions = [
    assumed
      ? `Reserve ${DEFAULT_CYLINDER_RESERVE_PSI} psi (${Number(convert(DEFAULT_CYLINDER_RESERVE_PSI, "psi", "bar").toFixed(1))} bar) left in the cylinder (common practice).`
      : `Reserve ${reserveValue} ${unit} as given.`,
    "Gauge pressure as read; the flow as set, constant until the reserve is reached.",
  ];
  let litresAvailable: number;
  let basis: Basis;
  if (waterCapacityLitres === undefined || waterCapacityLitres === null) {
    const factor = CYLINDER_FACTORS[checkChoice("size", size, SIZES)];
    litresAvailable = convert(usable, unit, "psi") * factor;
    basis = {
      name: `Oxygen cylinder duration (size ${size})`,
      formula: "minutes = (pressure − reserve) (psi) × cylinder factor (L/psi) ÷ flow (L/min)",
      inputs: { ...common, factor: { value: factor, unit: "L/psi" } },
      source: SOURCES.oxygenCylinder,
      assumptions: [...assumptions, "US cylinder factors (common practice)."],
    };
  } else {
    const capacity = checkRange(
      "waterCapacityLitres",
      waterCapacityLitres,
      RANGES.cylinderWaterCapacity,
    );
    litresAvailable = capacity * convert(usable, unit, "bar");
    basis = {
      name: "Oxygen cylinder duration (water capacity)",
      formula:
        "litres = water capacity (L) × (pressure − reserve) (bar); minutes = litres ÷ flow (L/min)",
      inputs: { ...common, waterCapacity: { value: capacity, unit: "L" } },
      source: SOURCES.oxygenCylinder,
      assumptions: [
        ...assumptions,
        "Ideal gas: at full pressure the real content differs by a few percent (common practice).",
      ],
    };
  }
  return {
    minutes: litresAvailable / flowLMin,
    litresAvailable,
    reserve: { value: reserveValue, unit, assumed },
    basis,
  };
}
