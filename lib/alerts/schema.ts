import { z } from "zod";
import { ALERT_KINDS } from "./kinds";

// One schema per write, shared by the form (zodResolver) and the service.

export const acknowledgeSchema = z.object({
  alertId: z.coerce.number().int().positive(),
  note: z
    .string()
    .trim()
    .max(500, "Note must be at most 500 characters.")
    .optional()
    .transform((v) => (v ? v : undefined)),
});
export type AcknowledgeInput = z.input<typeof acknowledgeSchema>;

export const resolveSchema = z.object({
  alertId: z.coerce.number().int().positive(),
  reason: z
    .string()
    .trim()
    .min(3, "Say why the alert is closed (at least 3 characters).")
    .max(500, "Reason must be at most 500 characters."),
});
export type ResolveInput = z.input<typeof resolveSchema>;

export const alertFilterSchema = z.object({
  status: z.enum(["open", "unacknowledged", "resolved", "all"]).default("open"),
  kind: z.enum(ALERT_KINDS).optional(),
  unitId: z.coerce.number().int().positive().optional(),
  patientId: z.coerce.number().int().positive().optional(),
  /** One alert (the link in an alert e-mail). */
  alertId: z.coerce.number().int().positive().optional(),
  limit: z.coerce.number().int().min(1).max(200).default(100),
});
export type AlertFilter = z.infer<typeof alertFilterSchema>;

export const emailPreferencesSchema = z.object({
  below_band: z.boolean(),
  above_band: z.boolean(),
  limits_exhausted: z.boolean(),
  reassessment_overdue: z.boolean(),
  signal_loss: z.boolean(),
  pao2_above_band: z.boolean(),
  order_change: z.boolean(),
  lung_protection: z.boolean(),
});
export type EmailPreferences = z.infer<typeof emailPreferencesSchema>;

/** Parsed input, as the services receive it from the boundary (lib/boundary). */
export type AcknowledgeData = z.output<typeof acknowledgeSchema>;
export type ResolveData = z.output<typeof resolveSchema>;
