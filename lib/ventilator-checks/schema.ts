import { z } from "zod";
import { optionalNumber, rangedNumber } from "../number-input";
import { idempotencyKeySchema } from "../orders/schema";
import { betweenWords, RANGES, type ClinicalRange } from "../oxygen";

// One schema for the ventilator check form and the server. Pressures in
// cmH2O, volumes in mL, minute ventilation in L/min; every bound from the one
// range table (lib/oxygen/ranges.ts).

const whole = (label: string, range: ClinicalRange) =>
  rangedNumber(label, range).int(`${label} must be a whole number ${betweenWords(range)}.`);

export const ventilatorCheckSchema = z
  .object({
    patientId: z.number().int().positive(),
    checkedAt: z.coerce.date({ error: "Time checked must be a date and time." }),
    setVt: optionalNumber(whole("Set tidal volume", RANGES.tidalVolumeMl)),
    measuredVt: whole("Measured tidal volume", RANGES.tidalVolumeMl),
    setRate: optionalNumber(whole("Set rate", RANGES.respiratoryRate)),
    measuredRate: whole("Measured rate", RANGES.respiratoryRate),
    minuteVentilation: optionalNumber(rangedNumber("Minute ventilation", RANGES.minuteVentilation)),
    peak: optionalNumber(rangedNumber("Peak pressure", RANGES.peakPressure)),
    plateau: optionalNumber(rangedNumber("Plateau pressure", RANGES.plateauPressure)),
    totalPeep: rangedNumber("Total PEEP", RANGES.peep),
    idempotencyKey: idempotencyKeySchema,
  })
  .superRefine((v, ctx) => {
    // The engine's own order of pressures (lib/oxygen/ventilation.ts), refused by field here.
    if (v.plateau !== undefined && v.plateau < v.totalPeep + 1)
      ctx.addIssue({
        code: "custom",
        path: ["plateau"],
        message: `Plateau pressure must be at least total PEEP + 1 cmH2O (${v.totalPeep + 1} cmH2O here).`,
      });
    if (v.peak !== undefined && v.plateau !== undefined && v.peak < v.plateau)
      ctx.addIssue({
        code: "custom",
        path: ["peak"],
        message: `Peak pressure cannot be below the plateau pressure (${v.plateau} cmH2O).`,
      });
  });

export type VentilatorCheckInput = z.input<typeof ventilatorCheckSchema>;
/** Parsed input, as the service receives it from the boundary (lib/boundary). */
export type VentilatorCheckData = z.output<typeof ventilatorCheckSchema>;

/** A patient's checks, newest first. */
export const ventilatorChecksQuerySchema = z.object({
  patientId: z.coerce.number().int().positive("patientId must be a positive whole number."),
  limit: z.coerce
    .number()
    .int()
    .min(1, "limit must be between 1 and 200.")
    .max(200, "limit must be between 1 and 200.")
    .default(50),
});
