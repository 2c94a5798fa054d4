import { z } from "zod";
import { optionalNumber, rangedNumber } from "../number-input";
import { idempotencyKeySchema } from "../orders/schema";
import { RANGES } from "../oxygen";

export const ADJUSTMENT_REASONS = [
  { value: "below_band", label: "SpO2 below the target band" },
  { value: "above_band", label: "SpO2 above the target band on oxygen" },
  { value: "wean", label: "Weaning per step table" },
  { value: "blood_gas", label: "Blood gas result" },
  { value: "work_of_breathing", label: "Work of breathing" },
  { value: "procedure", label: "Procedure, transfer or suction" },
  { value: "other", label: "Other (explain in the rationale)" },
] as const;
export type AdjustmentReason = (typeof ADJUSTMENT_REASONS)[number]["value"];
const reasonValues = ADJUSTMENT_REASONS.map((r) => r.value) as [
  AdjustmentReason,
  ...AdjustmentReason[],
];

/** One applied settings change at the bedside. */
export const adjustmentSchema = z.object({
  patientId: z.number().int().positive(),
  /** The bedside settings version the change starts from (conflict guard). */
  settingsVersion: z.number().int().positive(),
  toFio2: rangedNumber("New FiO2", RANGES.fio2),
  toPeep: optionalNumber(rangedNumber("New PEEP", RANGES.peep)),
  toFlow: optionalNumber(rangedNumber("New flow", RANGES.flow)),
  reason: z.enum(reasonValues, { error: "Choose a reason from the list." }),
  rationale: z
    .string()
    .trim()
    .min(3, "Rationale is required (3 to 1000 characters).")
    .max(1000, "Rationale must be at most 1000 characters."),
  appliedAt: z.coerce.date({ error: "Time applied must be a date and time." }),
  /** Forecast from the latest arterial gas even though it is older than the site's limit. */
  useStaleBloodGas: z.boolean({ error: "useStaleBloodGas must be true or false." }).optional(),
  idempotencyKey: idempotencyKeySchema,
});
export type AdjustmentInput = z.input<typeof adjustmentSchema>;

/** Parsed input, as the services receive it from the boundary (lib/boundary). */
export type AdjustmentData = z.output<typeof adjustmentSchema>;
