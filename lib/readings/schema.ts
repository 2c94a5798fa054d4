import { z } from "zod";
import { DEVICES } from "../devices";
import { optionalNumber, rangedNumber } from "../number-input";
import { idempotencyKeySchema } from "../orders/schema";
import { RANGES } from "../oxygen";

// Ranges from the one table (lib/oxygen/ranges.ts), shared with the monitor
// imports: SpO2 takes anything an oximeter shows, since the deepest
// desaturations must be charted, never refused.

/** One charted observation: SpO2 with the device and oxygen in use. */
export const readingSchema = z.object({
  patientId: z.number().int().positive(),
  takenAt: z.coerce.date({ error: "Time taken must be a date and time." }),
  spo2: rangedNumber("SpO2", RANGES.spo2),
  respiratoryRate: optionalNumber(
    rangedNumber("Respiratory rate", RANGES.respiratoryRate).int(
      "Respiratory rate must be a whole number.",
    ),
  ),
  pulseRate: optionalNumber(
    rangedNumber("Pulse rate", RANGES.pulseRate).int("Pulse rate must be a whole number."),
  ),
  device: z.enum(DEVICES, { error: "Choose the device in use." }),
  flow: optionalNumber(rangedNumber("Flow", RANGES.flow)),
  fio2: optionalNumber(rangedNumber("FiO2", RANGES.fio2)),
  idempotencyKey: idempotencyKeySchema,
});
export type ReadingInput = z.input<typeof readingSchema>;

/** Parsed input, as the services receive it from the boundary (lib/boundary). */
export type ReadingData = z.output<typeof readingSchema>;
