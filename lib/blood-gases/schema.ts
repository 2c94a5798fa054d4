import { z } from "zod";
import { DEVICES } from "../orders/devices";
import { idempotencyKeySchema } from "../orders/schema";

const optional = (schema: z.ZodNumber) =>
  z.preprocess(
    (v) => (v === "" || v === null || (typeof v === "number" && Number.isNaN(v)) ? undefined : v),
    schema.optional(),
  );

const between = (label: string, min: number, max: number, unit: string) =>
  z
    .number({ error: `${label} must be a number between ${min} and ${max} ${unit}.` })
    .min(min, `${label} must be between ${min} and ${max} ${unit}.`)
    .max(max, `${label} must be between ${min} and ${max} ${unit}.`);

/**
 * One blood gas, pressures in mmHg and haemoglobin in g/dL (the form converts
 * kPa, g/L and mmol/L before sending), with the settings in use at sampling.
 */
export const bloodGasSchema = z.object({
  patientId: z.number().int().positive(),
  sampledAt: z.coerce.date({ error: "Time sampled must be a date and time." }),
  sampleType: z.enum(["arterial", "venous"], { error: "Sample type must be arterial or venous." }),
  ph: optional(between("pH", 6.5, 8, "")),
  pao2: between("PaO2", 10, 700, "mmHg"),
  paco2: between("PaCO2", 10, 150, "mmHg"),
  hco3: optional(between("HCO3", 2, 60, "mmol/L")),
  baseExcess: optional(between("Base excess", -30, 30, "mmol/L")),
  sao2: optional(between("SaO2", 40, 100, "%")),
  hemoglobin: optional(between("Haemoglobin", 3, 25, "g/dL")),
  device: z.enum(DEVICES, { error: "Choose the device in use at sampling." }),
  flow: optional(between("Flow", 0.5, 70, "L/min")),
  fio2: optional(between("FiO2", 0.21, 1, "")),
  peep: optional(between("PEEP", 0, 30, "cmH2O")),
  idempotencyKey: idempotencyKeySchema,
});
export type BloodGasInput = z.input<typeof bloodGasSchema>;
