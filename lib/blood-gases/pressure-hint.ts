export type GasPressureField = "pao2" | "paco2";

/**
 * The unit a gas pressure more plausibly is in when it is not the one it is
 * labelled with: a PaO2 below 20 or a PaCO2 below 13 "mmHg" is kPa (both would
 * be incompatible with life in mmHg), a PaO2 above 95 or a PaCO2 above 21 "kPa"
 * is mmHg. Shared by the upload's row check and the blood-gas form's hint;
 * never used to correct a value silently.
 */
export function otherPressureUnit(
  field: GasPressureField,
  value: number,
  unit: "mmHg" | "kPa",
): "mmHg" | "kPa" | undefined {
  if (!Number.isFinite(value) || value <= 0) return undefined;
  if (unit === "mmHg" && value < (field === "pao2" ? 20 : 13)) return "kPa";
  if (unit === "kPa" && value > (field === "pao2" ? 95 : 21)) return "mmHg";
  return undefined;
}
