import { z } from "zod";
import { optionalNumber } from "../number-input";
import { DEVICES } from "../devices";
import { idempotencyKeySchema } from "../orders/schema";
import { SPO2_READING_RANGE } from "../oxygen/oximetry";

/**
 * Accepted ranges of a reading's numbers; shared with the monitor imports
 * (lib/imports). SpO2 takes anything an oximeter shows: the deepest
 * desaturations must be charted, never refused.
 */
export const READING_RANGES = {
  spo2: { label: "SpO2", ...SPO2_READING_RANGE },
  pulseRate: { label: "Pulse rate", min: 20, max: 250, unit: "/min" },
} as const;

const SPO2_MESSAGE = `SpO2 must be between ${READING_RANGES.spo2.min} and ${READING_RANGES.spo2.max} %.`;

/** One charted observation: SpO2 with the device and oxygen in use. */
export const readingSchema = z.object({
  patientId: z.number().int().positive(),
  takenAt: z.coerce.date({ error: "Time taken must be a date and time." }),
  spo2: z
    .number({ error: SPO2_MESSAGE })
    .min(READING_RANGES.spo2.min, SPO2_MESSAGE)
    .max(READING_RANGES.spo2.max, SPO2_MESSAGE),
  respiratoryRate: optionalNumber(
    z
      .number()
      .int("Respiratory rate must be a whole number.")
      .min(2, "Respiratory rate must be between 2 and 80 /min.")
      .max(80, "Respiratory rate must be between 2 and 80 /min."),
  ),
  pulseRate: optionalNumber(
    z
      .number()
      .int("Pulse rate must be a whole number.")
      .min(20, "Pulse rate must be between 20 and 250 /min.")
      .max(250, "Pulse rate must be between 20 and 250 /min."),
  ),
  device: z.enum(DEVICES, { error: "Choose the device in use." }),
  flow: optionalNumber(
    z
      .number()
      .min(0.5, "Flow must be between 0.5 and 70 L/min.")
      .max(70, "Flow must be between 0.5 and 70 L/min."),
  ),
  fio2: optionalNumber(
    z
      .number()
      .min(0.21, "FiO2 must be between 0.21 and 1.00.")
      .max(1, "FiO2 must be between 0.21 and 1.00."),
  ),
  idempotencyKey: idempotencyKeySchema,
});
export type ReadingInput = z.input<typeof readingSchema>;
