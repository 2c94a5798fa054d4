import { z } from "zod";
import { formatFio2Value, localDateTimeSchema } from "@/components/bedside/BedsideFormParts";
import { adjustmentSchema, type AdjustmentReason } from "@/lib/adjustments/schema";
import { emptyToUndefined } from "@/lib/number-input";
import { betweenWords, RANGES } from "@/lib/oxygen";
import { DEVICE_PROFILES, type Device } from "@/lib/devices";
import type { OrderView } from "@/lib/orders/queries";
import type { BedsideContext, BedsideSettings } from "@/lib/chart/bedside";
import { classifySpo2 } from "@/lib/time-in-band";

// The adjustment form's rules apart from its screen: the schema it validates
// with, the limit warnings shown while typing, and the reason it starts from.

const SAME = 1e-9;

/**
 * The adjustment form's schema: the shared adjustmentSchema's fields and
 * messages, with the settings the order's device uses required, the FiO2 left
 * to the flow for low-flow devices, and the time in the unit's wall clock.
 */
export function adjustmentFormSchema(device: Device, current: BedsideSettings | null) {
  const uses = DEVICE_PROFILES[device].uses;
  const shared = adjustmentSchema.shape;
  return z
    .object({
      toFio2: z.preprocess(emptyToUndefined, shared.toFio2.optional()),
      toPeep: shared.toPeep,
      toFlow: shared.toFlow,
      reason: shared.reason,
      rationale: shared.rationale,
      appliedAt: localDateTimeSchema("Time applied"),
    })
    .superRefine(
      (raw, ctx) => {
        // Runs even when other fields failed, so every field shows its error at once.
        const v = raw as { toFio2?: unknown; toPeep?: unknown; toFlow?: unknown };
        const given = (value: unknown): value is number =>
          typeof value === "number" && Number.isFinite(value);
        const issue = (path: string, message: string) =>
          ctx.addIssue({ code: "custom", path: [path], message });
        if (uses.fio2 === "set" && v.toFio2 === undefined)
          issue("toFio2", `New FiO2 must be a number ${betweenWords(RANGES.fio2)}.`);
        if (uses.peep && v.toPeep === undefined)
          issue("toPeep", "New PEEP is required for this device.");
        if (uses.flow && v.toFlow === undefined)
          issue("toFlow", "New flow is required for this device.");
        if (!current) return;
        const same = (a: unknown, b: number | null) =>
          (b === null && a === undefined) || (given(a) && b !== null && Math.abs(a - b) < SAME);
        const unchanged =
          (uses.fio2 !== "set" || same(v.toFio2, current.fio2)) &&
          (!uses.peep || same(v.toPeep, current.peep)) &&
          (!uses.flow || same(v.toFlow, current.flow));
        if (unchanged && (uses.fio2 === "set" || uses.flow || uses.peep)) {
          issue(
            uses.fio2 === "set" ? "toFio2" : "toFlow",
            "These are the settings in effect now: change at least one value (to record a reassessment, chart SpO2).",
          );
        }
      },
      { when: () => true },
    );
}
export type FormInput = z.input<ReturnType<typeof adjustmentFormSchema>>;
export type FormOutput = z.output<ReturnType<typeof adjustmentFormSchema>>;
export type FieldName = "toFio2" | "toPeep" | "toFlow" | "reason" | "rationale" | "appliedAt";
export const FIELDS: readonly FieldName[] = [
  "toFio2",
  "toPeep",
  "toFlow",
  "reason",
  "rationale",
  "appliedAt",
];

const NEW_ORDER = "ask the physician for a new order.";

/**
 * Warnings shown while typing, before anything is sent, when a value lies
 * outside the order's limits. They do not block: the server refuses, in the
 * same words, beside the same field.
 */
export function limitWarnings(
  order: OrderView,
  typed: { fio2?: number; peep?: number; flow?: number },
  fio2Estimated: boolean,
): Partial<Record<"toFio2" | "toPeep" | "toFlow", string>> {
  const out: Partial<Record<"toFio2" | "toPeep" | "toFlow", string>> = {};
  const { limits } = order;
  const finite = (v: number | undefined): v is number => v !== undefined && Number.isFinite(v);
  const label = fio2Estimated ? "Estimated FiO2" : "FiO2";
  if (finite(typed.fio2)) {
    if (typed.fio2 > 1 && !fio2Estimated) {
      const percent = Math.round(typed.fio2);
      out.toFio2 = `FiO2 is a fraction ${betweenWords(RANGES.fio2)}: type ${formatFio2Value(percent / 100)} for ${percent} %.`;
    } else if (typed.fio2 > limits.fio2Max) {
      out.toFio2 = `${label} ${formatFio2Value(typed.fio2)} is above this order's maximum of ${formatFio2Value(limits.fio2Max)} — ${NEW_ORDER}`;
    } else if (typed.fio2 < limits.fio2Min) {
      out.toFio2 = `${label} ${formatFio2Value(typed.fio2)} is below this order's minimum of ${formatFio2Value(limits.fio2Min)} — ${NEW_ORDER}`;
    }
  }
  const pair = (
    key: "toPeep" | "toFlow",
    value: number | undefined,
    min: number | null,
    max: number | null,
    name: string,
    unit: string,
  ) => {
    if (!finite(value) || min === null || max === null) return;
    if (value > max)
      out[key] =
        `${name} ${value} ${unit} is above this order's maximum of ${max} ${unit} — ${NEW_ORDER}`;
    else if (value < min)
      out[key] =
        `${name} ${value} ${unit} is below this order's minimum of ${min} ${unit} — ${NEW_ORDER}`;
  };
  pair("toPeep", typed.peep, limits.peepMin, limits.peepMax, "PEEP", "cmH2O");
  pair("toFlow", typed.flow, limits.flowMin, limits.flowMax, "Flow", "L/min");
  return out;
}

export function reasonFor(context: BedsideContext): AdjustmentReason | undefined {
  const { order, latestReading } = context;
  if (!order || !latestReading) return undefined;
  const side = classifySpo2(latestReading.spo2, latestReading, order.spo2Band);
  return side === "below" ? "below_band" : side === "above" ? "above_band" : undefined;
}

export const asNumber = (v: unknown): number | undefined => (typeof v === "number" ? v : undefined);
