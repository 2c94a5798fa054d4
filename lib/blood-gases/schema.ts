import { z } from "zod";
import { optionalNumber } from "../number-input";
import { DEVICES } from "../devices";
import { idempotencyKeySchema } from "../orders/schema";

/**
 * The accepted range of each blood gas value, in the unit it is stored in.
 * Shared by the form, the server and the file imports (lib/imports).
 */
export const BLOOD_GAS_RANGES = {
  ph: { label: "pH", min: 6.5, max: 8, unit: "" },
  pao2: { label: "PaO2", min: 10, max: 700, unit: "mmHg" },
  paco2: { label: "PaCO2", min: 10, max: 150, unit: "mmHg" },
  hco3: { label: "HCO3", min: 2, max: 60, unit: "mmol/L" },
  baseExcess: { label: "Base excess", min: -30, max: 30, unit: "mmol/L" },
  // Arterial saturation keeps a physiological floor; a venous (mixed or
  // central) saturation is normally 60–80 % and falls far lower in shock.
  sao2: { label: "SaO2", min: 40, max: 100, unit: "%" },
  svo2: { label: "SvO2/ScvO2", min: 20, max: 100, unit: "%" },
  hemoglobin: { label: "Haemoglobin", min: 3, max: 25, unit: "g/dL" },
  flow: { label: "Flow", min: 0.5, max: 70, unit: "L/min" },
  fio2: { label: "FiO2", min: 0.21, max: 1, unit: "" },
  peep: { label: "PEEP", min: 0, max: 30, unit: "cmH2O" },
} as const;
export type BloodGasRangeKey = keyof typeof BLOOD_GAS_RANGES;

const between = (key: BloodGasRangeKey) => {
  const { label, min, max, unit } = BLOOD_GAS_RANGES[key];
  return z
    .number({ error: `${label} must be a number between ${min} and ${max} ${unit}.` })
    .min(min, `${label} must be between ${min} and ${max} ${unit}.`)
    .max(max, `${label} must be between ${min} and ${max} ${unit}.`);
};

/** The saturation range of a sample: SaO2 for arterial blood, SvO2/ScvO2 for venous. */
export function saturationRangeFor(sampleType: "arterial" | "venous") {
  return BLOOD_GAS_RANGES[sampleType === "venous" ? "svo2" : "sao2"];
}

/** The refusal for a saturation outside its sample type's range, or null. */
export function saturationIssue(sampleType: unknown, value: unknown): string | null {
  if (typeof value !== "number" || !Number.isFinite(value)) return null;
  if (sampleType !== "arterial" && sampleType !== "venous") return null;
  const { label, min, max, unit } = saturationRangeFor(sampleType);
  return value < min || value > max ? `${label} must be between ${min} and ${max} ${unit}.` : null;
}

// Any saturation; the sample type's own range is checked on the whole object.
const saturation = z
  .number({ error: "Saturation must be a number between 0 and 100 %." })
  .min(0, "Saturation must be between 0 and 100 %.")
  .max(100, "Saturation must be between 0 and 100 %.");

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
