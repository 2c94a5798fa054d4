import { z } from "zod";
import { optionalNumber, rangedNumber } from "../number-input";
import { RANGES } from "../oxygen";
import { DEVICES } from "../devices";
import { idempotencyKeySchema } from "../orders/schema";

// One schema per write, shared by the request form, the reply form and the server.

/** Where a request was asked from: the refused change, the "order limits reached" alert, the Chart. */
export const ORDER_REQUEST_SOURCES = ["limit_refusal", "limits_alert", "chart"] as const;
export type OrderRequestSource = (typeof ORDER_REQUEST_SOURCES)[number];

export const orderRequestSchema = z.object({
  patientId: z.number().int().positive(),
  source: z.enum(ORDER_REQUEST_SOURCES, {
    error: "Source must be limit_refusal, limits_alert or chart.",
  }),
  /** The "order limits reached" alert the request answers, if any. */
  alertId: optionalNumber(z.number().int().positive()),
  need: z
    .string({ error: "Say what is needed (5 to 500 characters)." })
    .trim()
    .min(5, "Say what is needed (5 to 500 characters).")
    .max(500, "What is needed must be at most 500 characters."),
  reason: z
    .string({ error: "Say why (5 to 1000 characters)." })
    .trim()
    .min(5, "Say why (5 to 1000 characters).")
    .max(1000, "Why must be at most 1000 characters."),
  /** What the requester proposes; the composer starts from it. */
  device: z.enum(DEVICES, { error: "Choose a delivery device." }).optional(),
  fio2Max: optionalNumber(rangedNumber("Proposed FiO2 maximum", RANGES.fio2)),
  peepMax: optionalNumber(rangedNumber("Proposed PEEP maximum", RANGES.peep)),
  flowMax: optionalNumber(rangedNumber("Proposed flow maximum", RANGES.flow)),
  idempotencyKey: idempotencyKeySchema,
});
export type OrderRequestInput = z.input<typeof orderRequestSchema>;
export type OrderRequestData = z.output<typeof orderRequestSchema>;

export const orderRequestReplySchema = z.object({
  requestId: z.coerce.number().int().positive(),
  reply: z
    .string({ error: "Give the reason for your answer (5 to 1000 characters)." })
    .trim()
    .min(5, "Give the reason for your answer (5 to 1000 characters).")
    .max(1000, "The reason must be at most 1000 characters."),
});
export type OrderRequestReplyInput = z.input<typeof orderRequestReplySchema>;
export type OrderRequestReplyData = z.output<typeof orderRequestReplySchema>;

export const orderRequestFilterSchema = z.object({
  status: z.enum(["open", "closed", "all"]).default("open"),
  patientId: z.coerce.number().int().positive().optional(),
  requestId: z.coerce.number().int().positive().optional(),
  limit: z.coerce.number().int().min(1).max(200).default(100),
});
export type OrderRequestFilter = z.output<typeof orderRequestFilterSchema>;
