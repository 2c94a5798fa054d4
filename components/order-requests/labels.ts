import type { RecipientBasis } from "@/lib/alerts/recipients";

/** Why someone was told, short, as the screens show it beside the name. */
export const BASIS_LABELS: Record<RecipientBasis, string> = {
  assigned: "responsible physician",
  prescriber: "prescriber — no physician assigned",
  charge: "charge nurse — no physician to reach",
  fallback: "unit fallback address",
};
