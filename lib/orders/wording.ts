// An order's fixed words: the SpO2 target bands the composer offers and what
// each signature states (shown beside the password, stored with the signature).

/** SpO2 target bands commonly prescribed (BTS guideline for oxygen use in adults, 2017). */
export const TARGET_BAND_PRESETS = [
  { lower: 94, upper: 98, label: "94–98 % (most acutely ill adults)" },
  { lower: 88, upper: 92, label: "88–92 % (risk of hypercapnic respiratory failure)" },
  { lower: 92, upper: 96, label: "92–96 %" },
] as const;

export const SIGNATURE_MEANING =
  "I am the prescriber of this oxygen order and I have reviewed it for this patient.";

/** What a co-signature by a physician the unit designates, not the prescriber, states. */
export const DESIGNATED_COSIGN_MEANING =
  "I co-sign this oxygen order as a physician this unit designates, for its named prescriber, and I have reviewed it for this patient.";
