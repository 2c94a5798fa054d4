import { z } from "zod";
import { DEVICE_PROFILES, type Device } from "../devices";
import { optionalNumber, rangedNumber } from "../number-input";
import { betweenWords, RANGES } from "../oxygen";
import {
  VENT_MODE_LABELS,
  VENT_MODES,
  VENT_MODES_BY_DEVICE,
  type VentMode,
} from "../ventilation/settings";

// The ventilator part of the order schema (invasive ventilation and NIV):
// fields and cross-field rules, shared by the composer and the server.

const wholeRate = (label: string) =>
  rangedNumber(label, RANGES.ventilatorRate).int(
    `${label} must be a whole number ${betweenWords(RANGES.ventilatorRate)}.`,
  );

export const ventilatorOrderFields = {
  ventMode: z
    .enum(VENT_MODES, {
      error: "Mode must be volume control, pressure control, pressure support or CPAP.",
    })
    .optional(),
  vtTarget: optionalNumber(rangedNumber("Tidal volume target", RANGES.tidalVolumeTarget)),
  vtMin: optionalNumber(rangedNumber("Tidal volume minimum", RANGES.tidalVolumeTarget)),
  vtMax: optionalNumber(rangedNumber("Tidal volume maximum", RANGES.tidalVolumeTarget)),
  rateMin: optionalNumber(wholeRate("Rate minimum")),
  rateMax: optionalNumber(wholeRate("Rate maximum")),
  /** Omitted on a ventilator order: 30 cmH2O (VENT_DEFAULTS). */
  plateauLimit: optionalNumber(rangedNumber("Plateau pressure limit", RANGES.plateauLimit)),
  /** Omitted on a ventilator order: 15 cmH2O (VENT_DEFAULTS). */
  drivingLimit: optionalNumber(rangedNumber("Driving pressure limit", RANGES.drivingLimit)),
};

export const VENTILATOR_FIELDS = Object.keys(
  ventilatorOrderFields,
) as (keyof typeof ventilatorOrderFields)[];

type VentilatorFields = {
  device: Device;
  ventMode?: VentMode | undefined;
  vtTarget?: number | undefined;
  vtMin?: number | undefined;
  vtMax?: number | undefined;
  rateMin?: number | undefined;
  rateMax?: number | undefined;
  plateauLimit?: number | undefined;
  drivingLimit?: number | undefined;
};

/**
 * A ventilator device needs its mode (one the device offers), the tidal volume
 * target inside its range and the rate range; the pressure limits default.
 * Any other device takes none of them.
 */
export function checkVentilatorFields(
  o: VentilatorFields,
  issue: (path: string, message: string) => void,
): void {
  const label = DEVICE_PROFILES[o.device].label;
  const modes = VENT_MODES_BY_DEVICE[o.device];
  if (modes.length === 0) {
    const given = VENTILATOR_FIELDS.find((f) => o[f] !== undefined);
    if (given)
      issue(
        given,
        `${label} has no ventilator settings; leave mode, tidal volume, rate and pressure limits empty.`,
      );
    return;
  }
  if (o.ventMode === undefined) issue("ventMode", `Mode is required for ${label}.`);
  else if (!modes.includes(o.ventMode))
    issue(
      "ventMode",
      `${label} offers ${modes.map((m) => VENT_MODE_LABELS[m]).join(" or ")}, not ${VENT_MODE_LABELS[o.ventMode]}.`,
    );
  const required: [keyof VentilatorFields, string][] = [
    ["vtTarget", "Tidal volume target"],
    ["vtMin", "Tidal volume minimum"],
    ["vtMax", "Tidal volume maximum"],
    ["rateMin", "Rate minimum"],
    ["rateMax", "Rate maximum"],
  ];
  for (const [field, words] of required)
    if (o[field] === undefined)
      issue(field, `${words} is required for ${label} (mL/kg PBW or /min).`);
  if (o.vtMin !== undefined && o.vtMax !== undefined && o.vtMin > o.vtMax)
    issue("vtMax", "Tidal volume maximum must not be below the minimum.");
  else if (
    o.vtTarget !== undefined &&
    o.vtMin !== undefined &&
    o.vtMax !== undefined &&
    (o.vtTarget < o.vtMin || o.vtTarget > o.vtMax)
  )
    issue(
      "vtTarget",
      `Tidal volume target must lie within its range (${o.vtMin}–${o.vtMax} mL/kg PBW).`,
    );
  if (o.rateMin !== undefined && o.rateMax !== undefined && o.rateMin > o.rateMax)
    issue("rateMax", "Rate maximum must not be below the minimum.");
}
