import { z } from "zod";
import { DEVICES } from "../devices";
import { optionalNumber, rangedNumber } from "../number-input";
import { idempotencyKeySchema } from "../orders/schema";
import { type ClinicalRange, RANGES, rangeRefusal } from "../oxygen";

/**
 * The blood gas values' ranges from the one table (lib/oxygen/ranges.ts), in
 * the unit each is stored in; shared by the form, the server and the file
 * imports (lib/imports).
 */
export const BLOOD_GAS_RANGES = {
  ph: RANGES.ph,
  pao2: RANGES.pao2,
  paco2: RANGES.paco2,
  hco3: RANGES.hco3,
  baseExcess: RANGES.baseExcess,
  sao2: RANGES.sao2,
  svo2: RANGES.svo2,
  hemoglobin: RANGES.hemoglobin,
  flow: RANGES.flow,
  fio2: RANGES.fio2,
  peep: RANGES.peep,
} as const satisfies Record<string, ClinicalRange>;
export type BloodGasRangeKey = keyof typeof BLOOD_GAS_RANGES;

const between = (key: BloodGasRangeKey) =>
  rangedNumber(BLOOD_GAS_RANGES[key].label, BLOOD_GAS_RANGES[key]);

/** The saturation range of a sample: SaO2 for arterial blood, SvO2/ScvO2 for venous. */
export function saturationRangeFor(sampleType: "arterial" | "venous") {
  return BLOOD_GAS_RANGES[sampleType === "venous" ? "svo2" : "sao2"];
}

/** The refusal for a saturation outside its sample type's range, or null. */
export function saturationIssue(sampleType: unknown, value: unknown): string | null {
  if (typeof value !== "number" || !Number.isFinite(value)) return null;
  if (sampleType !== "arterial" && sampleType !== "venous") return null;
  const range = saturationRangeFor(sampleType);
  return value < range.min || value > range.max ? rangeRefusal(range.label, range) : null;
}

/** Any saturation in %, before the sample type's own range is checked on the whole gas. */
export const ANY_SATURATION = {
  ...RANGES.saturationFraction,
  min: RANGES.saturationFraction.min * 100,
  max: RANGES.saturationFraction.max * 100,
  unit: "%",
  why: "Any saturation in %; the sample type's range (SaO2 or SvO2/ScvO2) is checked after.",
} as const satisfies ClinicalRange;
const saturation = rangedNumber(ANY_SATURATION.label, ANY_SATURATION);

/**
 * One blood gas, pressures in mmHg and haemoglobin in g/dL (the form converts
 * kPa, g/L and mmol/L before sending), with the settings in use at sampling.
 */
export const bloodGasSchema = z
  .object({
    patientId: z.number().int().positive(),
    sampledAt: z.coerce.date({ error: "Time sampled must be a date and time." }),
    sampleType: z.enum(["arterial", "venous"], {
      error: "Sample type must be arterial or venous.",
    }),
    ph: optionalNumber(between("ph")),
    pao2: between("pao2"),
    paco2: between("paco2"),
    hco3: optionalNumber(between("hco3")),
    baseExcess: optionalNumber(between("baseExcess")),
    sao2: optionalNumber(saturation),
    hemoglobin: optionalNumber(between("hemoglobin")),
    device: z.enum(DEVICES, { error: "Choose the device in use at sampling." }),
    flow: optionalNumber(between("flow")),
    fio2: optionalNumber(between("fio2")),
    peep: optionalNumber(between("peep")),
    idempotencyKey: idempotencyKeySchema,
  })
  .superRefine((v, ctx) => {
    const message = saturationIssue(v.sampleType, v.sao2);
    if (message) ctx.addIssue({ code: "custom", path: ["sao2"], message });
  });
export type BloodGasInput = z.input<typeof bloodGasSchema>;

/** Parsed input, as the services receive it from the boundary (lib/boundary). */
export type BloodGasData = z.output<typeof bloodGasSchema>;
