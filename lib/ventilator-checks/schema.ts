import { z } from "zod";
import { optionalNumber, rangedNumber } from "../number-input";
import { idempotencyKeySchema } from "../orders/schema";
import { betweenWords, RANGES, type ClinicalRange } from "../oxygen";

// One schema for the ventilator check form and the server. Pressures in
// cmH2O, volumes in mL, minute ventilation in L/min; every bound from the one
// range table (lib/oxygen/ranges.ts).

const whole = (label: string, range: ClinicalRange) =>
  rangedNumber(label, range).int(`${label} must be a whole number ${betweenWords(range)}.`);

/** The fields alone, for the form to pick from (the cross-field rule is `checkPressures`). */
export const ventilatorCheckFields = z.object({
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
});

/**
 * The engine's own order of pressures (lib/oxygen/ventilation.ts), refused by
 * field: plateau at least total PEEP + 1, peak not below plateau.
 */
export function checkPressures(
  v: { totalPeep?: unknown; plateau?: unknown; peak?: unknown },
  ctx: z.RefinementCtx,
): void {
  const n = (x: unknown) => (typeof x === "number" && Number.isFinite(x) ? x : undefined);
  const peep = n(v.totalPeep);
  const plateau = n(v.plateau);
  const peak = n(v.peak);
  if (plateau !== undefined && peep !== undefined && plateau < peep + 1)
    ctx.addIssue({
      code: "custom",
      path: ["plateau"],
      message: `Plateau pressure must be at least total PEEP + 1 cmH2O (${peep + 1} cmH2O here).`,
    });
  if (peak !== undefined && plateau !== undefined && peak < plateau)
    ctx.addIssue({
      code: "custom",
      path: ["peak"],
      message: `Peak pressure cannot be below the plateau pressure (${plateau} cmH2O).`,
    });
}

export const ventilatorCheckSchema = ventilatorCheckFields.superRefine(checkPressures);

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
