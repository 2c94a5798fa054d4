import { z } from "zod";
import { optionalNumber, rangedNumber } from "../number-input";
import { betweenWords, RANGES } from "../oxygen";
import { DEVICE_PROFILES, DEVICES } from "../devices";
import { checkVentilatorFields, ventilatorOrderFields } from "./ventilator-schema";

// One schema per write, shared by the order composer and the server.

const fio2 = (label: string) => rangedNumber(label, RANGES.fio2);
const peep = (label: string) => rangedNumber(label, RANGES.peep);
const flow = (label: string) => rangedNumber(label, RANGES.flow);
const pao2 = (label: string) => rangedNumber(label, RANGES.pao2Target);
const spo2Bound = (label: string) =>
  rangedNumber(label, RANGES.spo2Target).int(
    `${label} must be a whole number ${betweenWords(RANGES.spo2Target)}.`,
  );

export const idempotencyKeySchema = z
  .string()
  .regex(/^[A-Za-z0-9-]{8,64}$/, "idempotencyKey must be 8 to 64 letters, digits or dashes.")
  .optional();

export const orderFieldsSchema = z.object({
  patientId: z.number().int().positive(),
  device: z.enum(DEVICES, { error: "Choose a delivery device." }),
  spo2Lower: spo2Bound("SpO2 lower bound"),
  spo2Upper: spo2Bound("SpO2 upper bound"),
  pao2Lower: optionalNumber(pao2("PaO2 lower bound")),
  pao2Upper: optionalNumber(pao2("PaO2 upper bound")),
  fio2Min: fio2("FiO2 minimum"),
  fio2Max: fio2("FiO2 maximum"),
  peepMin: optionalNumber(peep("PEEP minimum")),
  peepMax: optionalNumber(peep("PEEP maximum")),
  flowMin: optionalNumber(flow("Flow minimum")),
  flowMax: optionalNumber(flow("Flow maximum")),
  initialFio2: fio2("Starting FiO2"),
  initialPeep: optionalNumber(peep("Starting PEEP")),
  initialFlow: optionalNumber(flow("Starting flow")),
  stepTableId: optionalNumber(z.number().int().positive()),
  ...ventilatorOrderFields,
  reassessMinutes: z
    .number({ error: "Reassessment interval must be between 15 and 1440 minutes." })
    .int()
    .min(15, "Reassessment interval must be between 15 and 1440 minutes.")
    .max(1440, "Reassessment interval must be between 15 and 1440 minutes."),
  rationale: z
    .string()
    .trim()
    .min(5, "Rationale is required (5 to 2000 characters).")
    .max(2000, "Rationale must be at most 2000 characters."),
  /** The order the writer saw in effect; a different one in effect now is a conflict. */
  supersedesOrderId: z.number().int().positive().nullable(),
  idempotencyKey: idempotencyKeySchema,
});

type OrderFields = z.infer<typeof orderFieldsSchema>;

/** A PaO2 band is both bounds or none: a one-sided band is never shown as a band. */
export const PAO2_BAND_INCOMPLETE = "Give both PaO2 bounds, or leave both empty.";

/** Cross-field rules: band order and completeness, limits that fit the device, start inside limits. */
function checkOrder(o: OrderFields, ctx: z.RefinementCtx): void {
  const issue = (path: string, message: string) =>
    ctx.addIssue({ code: "custom", path: [path], message });
  const profile = DEVICE_PROFILES[o.device];
  if (o.spo2Lower >= o.spo2Upper)
    issue("spo2Upper", "SpO2 upper bound must be above the lower bound.");
  if ((o.pao2Lower === undefined) !== (o.pao2Upper === undefined)) {
    issue(o.pao2Lower === undefined ? "pao2Lower" : "pao2Upper", PAO2_BAND_INCOMPLETE);
  } else if (o.pao2Lower !== undefined && o.pao2Upper !== undefined && o.pao2Lower >= o.pao2Upper) {
    issue("pao2Upper", "PaO2 upper bound must be above the lower bound.");
  }
  if (o.fio2Min > o.fio2Max) issue("fio2Max", "FiO2 maximum must not be below the minimum.");
  if (o.fio2Min < profile.fio2.min || o.fio2Max > profile.fio2.max) {
    issue(
      o.fio2Min < profile.fio2.min ? "fio2Min" : "fio2Max",
      `${profile.label} delivers FiO2 between ${profile.fio2.min.toFixed(2)} and ${profile.fio2.max.toFixed(2)}.`,
    );
  }
  if (o.initialFio2 < o.fio2Min || o.initialFio2 > o.fio2Max) {
    issue(
      "initialFio2",
      `Starting FiO2 must lie within the order's limits (${o.fio2Min.toFixed(2)}–${o.fio2Max.toFixed(2)}).`,
    );
  }
  const pair = (
    name: "peep" | "flow",
    min: number | undefined,
    max: number | undefined,
    start: number | undefined,
    unit: string,
    label: string,
  ) => {
    const range = profile[name];
    if (!profile.uses[name] || !range) {
      if (min !== undefined || max !== undefined || start !== undefined) {
        issue(`${name}Min`, `${profile.label} has no ${label} setting; leave ${label} empty.`);
      }
      return;
    }
    if (min === undefined)
      issue(
        `${name}Min`,
        `${label[0]!.toUpperCase()}${label.slice(1)} minimum is required for ${profile.label}.`,
      );
    if (max === undefined)
      issue(
        `${name}Max`,
        `${label[0]!.toUpperCase()}${label.slice(1)} maximum is required for ${profile.label}.`,
      );
    if (start === undefined)
      issue(
        `initial${name === "peep" ? "Peep" : "Flow"}`,
        `Starting ${label} is required for ${profile.label}.`,
      );
    if (min === undefined || max === undefined) return;
    if (min > max)
      issue(
        `${name}Max`,
        `${label[0]!.toUpperCase()}${label.slice(1)} maximum must not be below the minimum.`,
      );
    if (min < range.min || max > range.max) {
      issue(
        min < range.min ? `${name}Min` : `${name}Max`,
        `${profile.label} ${label} must be between ${range.min} and ${range.max} ${unit}.`,
      );
    }
    if (start !== undefined && (start < min || start > max)) {
      issue(
        `initial${name === "peep" ? "Peep" : "Flow"}`,
        `Starting ${label} must lie within the order's limits (${min}–${max} ${unit}).`,
      );
    }
  };
  pair("peep", o.peepMin, o.peepMax, o.initialPeep, "cmH2O", "PEEP");
  pair("flow", o.flowMin, o.flowMax, o.initialFlow, "L/min", "flow");
  checkVentilatorFields(o, issue);
}

/** A physician's written order, signed by re-entering the password. */
export const writtenOrderSchema = orderFieldsSchema
  .extend({
    entryMode: z.literal("written"),
    password: z.string().min(1, "Re-enter your password to sign.").max(200),
  })
  .superRefine(checkOrder);

/** A verbal or telephone order taken by a nurse or therapist, read back, awaiting co-signature. */
export const verbalOrderSchema = orderFieldsSchema
  .extend({
    entryMode: z.enum(["verbal", "telephone"]),
    prescriberId: z.number({ error: "Name the physician who gave the order." }).int().positive(),
    readBackConfirmed: z.literal(true, {
      error: "Confirm that you read the order back to the physician.",
    }),
  })
  .superRefine(checkOrder);

export const orderInputSchema = z.discriminatedUnion("entryMode", [
  writtenOrderSchema,
  verbalOrderSchema,
]);
export type OrderInput = z.input<typeof orderInputSchema>;

export const cosignSchema = z.object({
  orderId: z.number().int().positive(),
  version: z.number().int().positive(),
  password: z.string().min(1, "Re-enter your password to co-sign.").max(200),
});
export type CosignInput = z.input<typeof cosignSchema>;

export const discontinueSchema = z.object({
  orderId: z.number().int().positive(),
  version: z.number().int().positive(),
  reason: z
    .string()
    .trim()
    .min(5, "Give a reason (5 to 1000 characters).")
    .max(1000, "Give a reason (5 to 1000 characters)."),
  password: z.string().min(1, "Re-enter your password to sign.").max(200),
});
export type DiscontinueInput = z.input<typeof discontinueSchema>;

/** Parsed input, as the services receive it from the boundary (lib/boundary). */
export type OrderData = z.output<typeof orderInputSchema>;
export type CosignData = z.output<typeof cosignSchema>;
export type DiscontinueData = z.output<typeof discontinueSchema>;
