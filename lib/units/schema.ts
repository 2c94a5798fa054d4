import { z } from "zod";
import { DEVICES, DEVICE_PROFILES } from "../devices";
import { idempotencyKeySchema } from "../orders/schema";
import { isKnownTimeZone } from "../time/zone";
import { SHIFT_HOURS, SHIFT_START_PATTERN } from "./shifts";

// One schema per write, shared by the admin forms (zodResolver) and the server.

/** The database's check on units.altitude_m; the alveolar gas equation reads it. */
export const ALTITUDE_RANGE = { min: -500, max: 5500 } as const;
export const UNIT_KINDS = ["icu", "ward"] as const;
export const MAX_INITIAL_BEDS = 60;

const code = z
  .string()
  .trim()
  .toUpperCase()
  .regex(/^[A-Z0-9]{2,16}$/, "Code must be 2 to 16 upper-case letters or digits (e.g. MICU).");

const name = z
  .string()
  .trim()
  .min(2, "Name must be 2 to 120 characters.")
  .max(120, "Name must be 2 to 120 characters.");

const kind = z.enum(UNIT_KINDS, { error: "Kind must be ICU or ward." });

const altitudeWords = `Altitude must be a whole number of metres from ${ALTITUDE_RANGE.min} to ${ALTITUDE_RANGE.max}.`;
const altitudeM = z
  .number({ error: altitudeWords })
  .int(altitudeWords)
  .min(ALTITUDE_RANGE.min, altitudeWords)
  .max(ALTITUDE_RANGE.max, altitudeWords);

const timeZone = z
  .string({ error: "Time zone must be an IANA name such as Europe/Amsterdam." })
  .trim()
  .min(1, "Time zone must be an IANA name such as Europe/Amsterdam.")
  .max(64, "Time zone must be at most 64 characters.")
  .refine(isKnownTimeZone, "Time zone must be an IANA name such as Europe/Amsterdam.");

const shiftStart = z
  .string({ error: "Shift start must be a time from 00:00 to 23:59 (HH:MM)." })
  .regex(SHIFT_START_PATTERN, "Shift start must be a time from 00:00 to 23:59 (HH:MM).");

const shiftWords = `Shift length must be ${SHIFT_HOURS.join(", ")} hours.`;
const shiftHours = z
  .number({ error: shiftWords })
  .refine((h) => (SHIFT_HOURS as readonly number[]).includes(h), shiftWords)
  .transform((h) => h as (typeof SHIFT_HOURS)[number]);

const allowedDevices = z
  .array(
    z.enum(DEVICES, {
      error: `Each device must be one of: ${DEVICES.map((d) => DEVICE_PROFILES[d].label).join(", ")}.`,
    }),
  )
  .min(1, "Allow at least one device.")
  .max(DEVICES.length, `At most ${DEVICES.length} devices.`)
  // Stored in the order of lib/devices, each once.
  .transform((list) => DEVICES.filter((d) => list.includes(d)));

/** Empty means none: alerts with nobody assigned then go to the charge nurse only. */
const fallbackEmail = z
  .string()
  .trim()
  .toLowerCase()
  .max(254, "Fallback e-mail must be at most 254 characters.")
  .pipe(z.union([z.literal(""), z.email("Fallback e-mail must be a valid e-mail address.")]))
  .optional()
  .default("");

const rationale = z
  .string()
  .trim()
  .max(500, "Reason must be at most 500 characters.")
  .optional()
  .default("");

/** Fields shared by create and edit. */
export const unitFieldsSchema = z.object({
  name,
  kind,
  altitudeM,
  timeZone,
  shiftStart,
  shiftHours,
  allowedDevices,
  fallbackEmail,
  rationale,
});
export type UnitFormValues = z.input<typeof unitFieldsSchema>;

export const unitCreateSchema = unitFieldsSchema.extend({
  code,
  initialBeds: z
    .number({ error: `Beds must be a whole number from 0 to ${MAX_INITIAL_BEDS}.` })
    .int(`Beds must be a whole number from 0 to ${MAX_INITIAL_BEDS}.`)
    .min(0, `Beds must be a whole number from 0 to ${MAX_INITIAL_BEDS}.`)
    .max(MAX_INITIAL_BEDS, `Beds must be a whole number from 0 to ${MAX_INITIAL_BEDS}.`)
    .optional()
    .default(0),
  idempotencyKey: idempotencyKeySchema,
});
export type UnitCreateInput = z.input<typeof unitCreateSchema>;
export type UnitCreateData = z.output<typeof unitCreateSchema>;

/** Full edit; the code stays. The input names the version it was based on (409 if stale). */
export const unitUpdateSchema = unitFieldsSchema.extend({
  unitId: z.number().int().positive(),
  version: z.number().int().positive(),
});
export type UnitUpdateInput = z.input<typeof unitUpdateSchema>;
export type UnitUpdateData = z.output<typeof unitUpdateSchema>;

const label = z
  .string({ error: "Bed label must be 1 to 16 characters." })
  .trim()
  .min(1, "Bed label must be 1 to 16 characters.")
  .max(16, "Bed label must be 1 to 16 characters.");

export const bedCreateSchema = z.object({
  unitId: z.number().int().positive(),
  label,
  idempotencyKey: idempotencyKeySchema,
});
export type BedCreateInput = z.input<typeof bedCreateSchema>;
export type BedCreateData = z.output<typeof bedCreateSchema>;

/** Rename, retire (active: false) or restore (active: true) a bed; at least one of the two. */
export const bedUpdateSchema = z
  .object({
    unitId: z.number().int().positive(),
    bedId: z.number().int().positive(),
    label: label.optional(),
    active: z.boolean({ error: "Active must be true or false." }).optional(),
  })
  .refine((b) => b.label !== undefined || b.active !== undefined, {
    message: "Give a new label, or active true (restore) or false (retire).",
    path: ["label"],
  });
export type BedUpdateInput = z.input<typeof bedUpdateSchema>;
export type BedUpdateData = z.output<typeof bedUpdateSchema>;
