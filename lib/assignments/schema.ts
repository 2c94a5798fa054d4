import { z } from "zod";
import { idempotencyKeySchema } from "../orders/schema";
import { DATETIME_RANGE } from "../validation";

// One schema per write, shared by the assignments grid (zodResolver) and the server.

export const DUTIES = ["nurse", "therapist", "physician"] as const;
export type Duty = (typeof DUTIES)[number];

const isoStart = (label: string) =>
  z.iso
    .datetime({
      offset: true,
      error: `${label} must be "current", "next" or a shift's start time.`,
    })
    .transform((s) => new Date(s))
    .refine(
      (d) => d.getTime() >= DATETIME_RANGE.min && d.getTime() <= DATETIME_RANGE.max,
      `${label} must be a date and time between 1000 and 9999.`,
    );

const readShift = z.union([z.enum(["current", "next", "previous"]), isoStart("Shift")], {
  error: 'Shift must be "current", "next", "previous" or a shift\'s start time.',
});

const writeShift = z.union([z.enum(["current", "next"]), isoStart("Shift")], {
  error: 'Shift must be "current", "next" or a shift\'s start time.',
});

const unitId = z.number({ error: "Unit must be a unit id." }).int().positive();

export const assignmentReadSchema = z.object({
  unitId,
  shift: readShift.optional().default("current"),
});

const id = (label: string) =>
  z
    .number({ error: `${label} must be a positive whole number.` })
    .int()
    .positive();

export const assignmentCellSchema = z.object({
  bedId: id("Bed"),
  duty: z.enum(DUTIES, { error: `Duty must be one of: ${DUTIES.join(", ")}.` }),
  /** null empties the cell. */
  userId: id("User").nullable(),
});

export const MAX_CELLS = 600;

export const assignmentWriteSchema = z.object({
  unitId,
  shift: writeShift,
  /** Left out: the charge nurse stays as it is; null: none. */
  chargeNurseId: id("Charge nurse").nullable().optional(),
  cells: z
    .array(assignmentCellSchema)
    .max(MAX_CELLS, `At most ${MAX_CELLS} cells in one save.`)
    .optional()
    .default([]),
  /** Fill the cells still empty after this write from the previous shift. */
  copyFrom: z.literal("previous", { error: 'copyFrom must be "previous".' }).optional(),
  idempotencyKey: idempotencyKeySchema,
});

export type AssignmentReadData = z.output<typeof assignmentReadSchema>;
export type AssignmentWriteInput = z.input<typeof assignmentWriteSchema>;
export type AssignmentWriteData = z.output<typeof assignmentWriteSchema>;
export type AssignmentCell = z.output<typeof assignmentCellSchema>;
