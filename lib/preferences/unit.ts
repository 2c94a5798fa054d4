import { z } from "zod";

export const UNIT_COOKIE = "tm-unit";

export const unitChoiceSchema = z.union([z.literal("all"), z.coerce.number().int().positive()]);
export type UnitChoice = z.infer<typeof unitChoiceSchema>;

/** The units a page shows: the chosen one if the user may see it, else all of theirs. */
export function resolveUnitChoice(
  cookieValue: string | undefined,
  allowedUnitIds: readonly number[],
): { choice: UnitChoice; unitIds: number[] } {
  const parsed = unitChoiceSchema.safeParse(cookieValue ?? "all");
  if (parsed.success && parsed.data !== "all" && allowedUnitIds.includes(parsed.data)) {
    return { choice: parsed.data, unitIds: [parsed.data] };
  }
  return { choice: "all", unitIds: [...allowedUnitIds] };
}
