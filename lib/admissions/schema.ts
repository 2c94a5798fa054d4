import { z } from "zod";
import { optionalNumber, rangedNumber } from "../number-input";
import { idempotencyKeySchema } from "../orders/schema";
import { RANGES } from "../oxygen/ranges";

// One schema per admission write, shared by the forms and the server.

/** Heights and weights an adult or child in an ICU or ward can have (common practice). */
export const BODY_RANGES = {
  heightCm: { min: 40, max: 250, unit: "cm" },
  weightKg: { min: 0.5, max: 400, unit: "kg" },
} as const;

export const DISPOSITIONS = ["home", "other_hospital", "death"] as const;
export type Disposition = (typeof DISPOSITIONS)[number];
export const DISPOSITION_LABELS: Record<Disposition, string> = {
  home: "Home",
  other_hospital: "Another hospital",
  death: "Death",
};

const reason = (what: string, min: number) =>
  z
    .string({ error: `${what} is required (${min} to 500 characters).` })
    .trim()
    .min(min, `${what} is required (${min} to 500 characters).`)
    .max(500, `${what} must be at most 500 characters.`);

const eventTime = (label: string) =>
  z.coerce.date({ error: `${label} must be a date and time.` }).optional();

/** A medical record number as hospitals print them: letters, digits and dashes. */
export const mrnSchema = z
  .string({ error: "MRN is required." })
  .trim()
  .toUpperCase()
  .regex(/^[A-Z0-9-]{4,20}$/, "MRN must be 4 to 20 letters, digits or dashes.");

const nameSchema = (label: string) =>
  z
    .string({ error: `${label} is required.` })
    .trim()
    .min(1, `${label} is required.`)
    .max(80, `${label} must be at most 80 characters.`);

export const patientDetailsSchema = z.object({
  mrn: mrnSchema,
  familyName: nameSchema("Family name"),
  givenName: nameSchema("Given name"),
  birthDate: z
    .string({ error: "Date of birth is required." })
    .regex(/^\d{4}-\d{2}-\d{2}$/, "Date of birth must be a date (YYYY-MM-DD).")
    .refine((v) => {
      const d = new Date(`${v}T00:00:00Z`);
      return (
        !Number.isNaN(d.getTime()) &&
        d.toISOString().slice(0, 10) === v &&
        d.getTime() <= Date.now() &&
        d.getUTCFullYear() >= 1900
      );
    }, "Date of birth must be a real date between 1900-01-01 and today."),
  sex: z.enum(["female", "male"], {
    error: "Choose the sex at birth (it sets the predicted body weight).",
  }),
  heightCm: optionalNumber(rangedNumber("Height", BODY_RANGES.heightCm)),
  weightKg: optionalNumber(rangedNumber("Weight", BODY_RANGES.weightKg)),
});
export type PatientDetails = z.output<typeof patientDetailsSchema>;

/** Admit a new patient, or a returning one found by MRN, into a free bed. */
export const admitSchema = patientDetailsSchema.extend({
  bedId: z.number({ error: "Choose a free bed." }).int().positive(),
  admittedAt: eventTime("Admission time"),
  rationale: z
    .string()
    .trim()
    .max(500, "Reason must be at most 500 characters.")
    .optional()
    .default(""),
  idempotencyKey: idempotencyKeySchema,
});
export type AdmitInput = z.input<typeof admitSchema>;
export type AdmitData = z.output<typeof admitSchema>;

/** Move an admitted patient to another bed of the same or another unit. */
export const transferSchema = z.object({
  admissionId: z.number().int().positive(),
  bedId: z.number({ error: "Choose the bed to move to." }).int().positive(),
  rationale: reason("Reason for the move", 3),
  idempotencyKey: idempotencyKeySchema,
});
export type TransferInput = z.input<typeof transferSchema>;
export type TransferData = z.output<typeof transferSchema>;

export const dischargeSchema = z.object({
  admissionId: z.number().int().positive(),
  disposition: z.enum(DISPOSITIONS, {
    error: "Choose where the patient goes: home, another hospital, or death.",
  }),
  dischargedAt: eventTime("Discharge time"),
  rationale: z
    .string()
    .trim()
    .max(500, "Note must be at most 500 characters.")
    .optional()
    .default(""),
  idempotencyKey: idempotencyKeySchema,
});
export type DischargeInput = z.input<typeof dischargeSchema>;
export type DischargeData = z.output<typeof dischargeSchema>;

/** The header's patient search: MRN, name or bed, on the user's units. */
export const patientSearchSchema = z.object({
  query: z
    .string({ error: "Type at least 2 characters of an MRN, a name or a bed." })
    .trim()
    .min(2, "Type at least 2 characters of an MRN, a name or a bed.")
    .max(80, "The search must be at most 80 characters."),
});

/** Height in cm, within the predicted body weight equation's adult range (RANGES.heightCm). */
export const heightSchema = z.object({
  patientId: z.number().int().positive(),
  heightCm: rangedNumber("Height", RANGES.heightCm),
  idempotencyKey: idempotencyKeySchema,
});
export type HeightInput = z.input<typeof heightSchema>;
export type HeightData = z.output<typeof heightSchema>;
