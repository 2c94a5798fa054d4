import { z } from "zod";
import { optionalNumber, rangedNumber } from "../number-input";
import { RANGES } from "../oxygen";

const fio2 = (label: string) => rangedNumber(label, RANGES.fio2);

export const stepRowSchema = z.object({
  fio2Min: fio2("FiO2"),
  fio2Max: fio2("FiO2 (upper end)"),
  peepMin: optionalNumber(rangedNumber("PEEP", RANGES.peep)),
  peepMax: optionalNumber(rangedNumber("PEEP", RANGES.peep)),
  flow: optionalNumber(rangedNumber("Flow", RANGES.flow)),
});
export type StepRowInput = z.input<typeof stepRowSchema>;

export const stepTableFieldsSchema = z.object({
  unitId: z.number({ error: "Choose the unit this table belongs to." }).int().positive(),
  name: z
    .string()
    .trim()
    .min(3, "Name must be 3 to 120 characters.")
    .max(120, "Name must be 3 to 120 characters."),
  kind: z.enum(["fio2_peep", "flow_fio2"], {
    error: "Kind must be FiO2 with PEEP, or flow with FiO2.",
  }),
  source: z.string().trim().max(1000, "Source must be at most 1000 characters.").default(""),
  rows: z
    .array(stepRowSchema)
    .min(2, "A step table needs at least 2 steps.")
    .max(40, "A step table has at most 40 steps."),
  rationale: z
    .string()
    .trim()
    .min(3, "Give a reason for the ledger (3 to 500 characters).")
    .max(500, "Give a reason for the ledger (3 to 500 characters)."),
});

type Fields = z.infer<typeof stepTableFieldsSchema>;

/** Steps go from least to most support; each row names its own problem. */
function checkRows(t: Fields, ctx: z.RefinementCtx): void {
  const issue = (i: number, field: string, message: string) =>
    ctx.addIssue({
      code: "custom",
      path: ["rows", i, field],
      message: `Step ${i + 1}: ${message}`,
    });
  t.rows.forEach((row, i) => {
    if (row.fio2Max < row.fio2Min)
      issue(i, "fio2Max", "the upper FiO2 must not be below the lower.");
    if (t.kind === "fio2_peep") {
      if (row.peepMin === undefined) issue(i, "peepMin", "PEEP is required in a FiO2/PEEP table.");
      if (row.peepMax !== undefined && row.peepMin !== undefined && row.peepMax < row.peepMin) {
        issue(i, "peepMax", "the upper PEEP must not be below the lower.");
      }
      if (row.flow !== undefined) issue(i, "flow", "a FiO2/PEEP table has no flow.");
    } else {
      if (row.flow === undefined) issue(i, "flow", "flow is required in a flow/FiO2 table.");
      if (row.peepMin !== undefined || row.peepMax !== undefined)
        issue(i, "peepMin", "a flow/FiO2 table has no PEEP.");
    }
    const prev = t.rows[i - 1];
    if (!prev) return;
    if (row.fio2Min < prev.fio2Min)
      issue(i, "fio2Min", "FiO2 must not fall from one step to the next.");
    if (
      t.kind === "fio2_peep" &&
      row.peepMin !== undefined &&
      prev.peepMin !== undefined &&
      row.peepMin < prev.peepMin
    ) {
      issue(i, "peepMin", "PEEP must not fall from one step to the next.");
    }
    if (
      t.kind === "flow_fio2" &&
      row.flow !== undefined &&
      prev.flow !== undefined &&
      row.flow < prev.flow
    ) {
      issue(i, "flow", "flow must not fall from one step to the next.");
    }
    const same =
      row.fio2Min === prev.fio2Min && row.peepMin === prev.peepMin && row.flow === prev.flow;
    if (same) issue(i, "fio2Min", "repeats the step before it.");
  });
}

export const stepTableCreateSchema = stepTableFieldsSchema.superRefine(checkRows);
export type StepTableCreateInput = z.input<typeof stepTableCreateSchema>;

export const stepTableUpdateSchema = stepTableFieldsSchema
  .extend({ id: z.number().int().positive(), version: z.number().int().positive() })
  .superRefine(checkRows);
export type StepTableUpdateInput = z.input<typeof stepTableUpdateSchema>;

export const stepTableActiveSchema = z.object({
  id: z.number().int().positive(),
  version: z.number().int().positive(),
  active: z.boolean(),
  rationale: z
    .string()
    .trim()
    .min(3, "Give a reason (3 to 500 characters).")
    .max(500, "Give a reason (3 to 500 characters)."),
});
export type StepTableActiveInput = z.input<typeof stepTableActiveSchema>;

/** Parsed input, as the services receive it from the boundary (lib/boundary). */
export type StepTableCreateData = z.output<typeof stepTableCreateSchema>;
export type StepTableUpdateData = z.output<typeof stepTableUpdateSchema>;
export type StepTableActiveData = z.output<typeof stepTableActiveSchema>;
