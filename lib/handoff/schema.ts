import { z } from "zod";
import { idempotencyKeySchema } from "../orders/schema";
import type { HandoverChoice } from "./handover";

// The handoff's inputs, shared by the page's buttons and the API.

export const MAX_ACKNOWLEDGED_BEDS = 100;

const shiftWords =
  'Shift must be "next" or the ISO start of a shift, such as 2026-12-05T19:00:00Z.';

/** "next" (the default) or a shift's start instant. */
export const shiftChoiceSchema = z
  .string({ error: shiftWords })
  .trim()
  .refine((s) => s === "next" || z.iso.datetime({ offset: true }).safeParse(s).success, shiftWords)
  .transform((s): HandoverChoice => (s === "next" ? "next" : new Date(s)))
  .optional()
  .default("next");

const unitId = z.number().int().positive();

export const handoffQuerySchema = z.object({
  unitId: z.coerce.number().int().positive(),
  shift: shiftChoiceSchema,
});
export type HandoffQuery = z.output<typeof handoffQuerySchema>;

const bedsWords = `Name 1 to ${MAX_ACKNOWLEDGED_BEDS} admissions to acknowledge.`;
export const handoffAcknowledgeSchema = z.object({
  unitId,
  shift: shiftChoiceSchema,
  admissionIds: z
    .array(
      z.number({ error: "Each admission id must be a positive whole number." }).int().positive(),
      {
        error: bedsWords,
      },
    )
    .min(1, bedsWords)
    .max(MAX_ACKNOWLEDGED_BEDS, bedsWords),
  idempotencyKey: idempotencyKeySchema,
});
export type HandoffAcknowledgeInput = z.input<typeof handoffAcknowledgeSchema>;
export type HandoffAcknowledgeData = z.output<typeof handoffAcknowledgeSchema>;
