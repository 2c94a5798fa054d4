import { z } from "zod";
import {
  type BloodGasInput,
  type ForecastInput,
  fromGramsPerDecilitre,
  type HemoglobinUnit,
  type InputRange,
  type PressureUnit,
  RANGES,
  restatePressureRange,
  type RespiratorySupport,
  roundInward,
  toGramsPerDecilitre,
  toMmHg,
} from "../oxygen";

// One schema per request, shared by the Chart's blood-gas form (zodResolver)
// and the api/v1/oxygenation routes. Pressures and haemoglobin arrive in the
// unit the person typed and leave converted to the engine's units (mmHg, g/dL,
// fractions); range messages speak the typed unit.

export const PRESSURE_UNITS = ["mmHg", "kPa"] as const satisfies readonly PressureUnit[];
export const HEMOGLOBIN_UNITS = [
  "g/dL",
  "g/L",
  "mmol/L",
] as const satisfies readonly HemoglobinUnit[];
export const RESPIRATORY_SUPPORTS = [
  "none",
  "conventional",
  "hfnc",
  "niv",
  "invasive",
] as const satisfies readonly RespiratorySupport[];

/** Short enough for a form's select; the engine's RespiratorySupport documents each. */
export const SUPPORT_LABELS: Record<RespiratorySupport, string> = {
  none: "Room air",
  conventional: "Cannula or mask",
  hfnc: "HFNC",
  niv: "NIV or CPAP",
  invasive: "Invasive",
};

/** The words each request field is called by in messages. */
export const FIELD_LABELS: Record<string, string> = {
  fio2: "FiO2",
  fio2Percent: "FiO2",
  nextFio2: "Proposed FiO2",
  pao2: "PaO2",
  paco2: "PaCO2",
  hemoglobin: "Haemoglobin",
  spo2: "SpO2",
  sao2: "SaO2",
  peep: "PEEP/CPAP",
  meanAirwayPressure: "Mean airway pressure",
  respiratoryRate: "Respiratory rate",
  flow: "Flow",
  barometricPressure: "Barometric pressure",
  ageYears: "Age",
  cardiacOutput: "Cardiac output",
  unitId: "Unit",
};

/** Fields whose accepted range depends on the unit chosen beside them. */
export const PRESSURE_FIELDS = ["pao2", "paco2", "barometricPressure"] as const;
type PressureField = (typeof PRESSURE_FIELDS)[number];
const PRESSURE_RANGES: Record<PressureField, InputRange> = {
  pao2: RANGES.pao2,
  paco2: RANGES.paco2,
  barometricPressure: RANGES.barometricPressure,
};

// The form types FiO2 as a percentage: the table's fraction range, in %.
const FIO2_PERCENT: InputRange = {
  min: RANGES.fio2.min * 100,
  max: RANGES.fio2.max * 100,
  unit: "%",
};

/** `rangeMessage("PaO2", 1.34, 93.32, "kPa")` → "PaO2 must be between 1.34 and 93.32 kPa." */
export function rangeMessage(label: string, min: number, max: number, unit: string): string {
  if (unit === "fraction")
    return `${label} must be between ${min} and ${max} (a fraction: 0.4 for 40 %).`;
  return `${label} must be between ${min} and ${max} ${unit}.`;
}

// Bounds converted to kPa or mmol/L are rounded inward to two decimals, so any
// value the message allows is also inside the engine's range once converted.
const DECIMALS = 2;

/** A pressure field's accepted range in `unit` (the engine's mmHg range, converted). */
export function pressureRangeIn(field: PressureField, unit: PressureUnit): InputRange {
  return restatePressureRange(PRESSURE_RANGES[field], unit, DECIMALS);
}

/** Haemoglobin's accepted range in `unit` (the engine's g/dL range, converted). */
export function hemoglobinRangeIn(unit: HemoglobinUnit): InputRange {
  const range = RANGES.hemoglobin;
  switch (unit) {
    case "g/dL":
      return range;
    case "g/L":
      return {
        min: fromGramsPerDecilitre(range.min, unit),
        max: fromGramsPerDecilitre(range.max, unit),
        unit,
      };
    case "mmol/L": {
      const [min, max] = roundInward(
        fromGramsPerDecilitre(range.min, unit),
        fromGramsPerDecilitre(range.max, unit),
        DECIMALS,
      );
      return { min, max, unit };
    }
  }
}

const numberError = (label: string) => (issue: { input: unknown }) =>
  issue.input === undefined ? `Enter ${label}.` : `${label} must be a number.`;

/** A number with a fixed range and unit. */
function measured(field: string, range: InputRange) {
  const label = FIELD_LABELS[field] ?? field;
  const message = rangeMessage(label, range.min, range.max, range.unit);
  return z
    .number({ error: numberError(label) })
    .min(range.min, message)
    .max(range.max, message);
}

/** A number whose range is checked against the unit chosen beside it (see checkUnitRanges). */
const inUnit = (field: string) => z.number({ error: numberError(FIELD_LABELS[field] ?? field) });

const pressureUnit = z
  .enum(PRESSURE_UNITS, { error: "Pressure unit must be mmHg or kPa." })
  .default("mmHg");
const hemoglobinUnit = z
  .enum(HEMOGLOBIN_UNITS, { error: "Haemoglobin unit must be g/dL, g/L or mmol/L." })
  .default("g/dL");

/** Checks pressures and haemoglobin against their range in the chosen unit. */
function checkUnitRanges(values: unknown, ctx: z.RefinementCtx): void {
  // Runs even when other fields failed (see `when` below), so read defensively:
  // every field can then show its own error at once.
  if (typeof values !== "object" || values === null) return;
  const record = values as Record<string, unknown>;
  const pressure = PRESSURE_UNITS.find((u) => u === record.pressureUnit);
  const hemoglobin = HEMOGLOBIN_UNITS.find((u) => u === record.hemoglobinUnit);
  const check = (field: string, range: InputRange) => {
    const value = record[field];
    if (typeof value !== "number" || !Number.isFinite(value)) return;
    if (value < range.min || value > range.max) {
      ctx.addIssue({
        code: "custom",
        path: [field],
        message: rangeMessage(FIELD_LABELS[field] ?? field, range.min, range.max, range.unit),
      });
    }
  };
  if (pressure) for (const field of PRESSURE_FIELDS) check(field, pressureRangeIn(field, pressure));
  if (hemoglobin) check("hemoglobin", hemoglobinRangeIn(hemoglobin));
}
const always = { when: () => true };

// The measurements of one blood gas and the support in use when it was taken.
const bloodGasFields = {
  pressureUnit,
  hemoglobinUnit,
  pao2: inUnit("pao2"),
  paco2: inUnit("paco2"),
  hemoglobin: inUnit("hemoglobin").optional(),
  spo2: measured("spo2", RANGES.spo2).optional(),
  sao2: measured("sao2", RANGES.sao2).optional(),
  support: z
    .enum(RESPIRATORY_SUPPORTS, {
      error: `Support must be one of: ${RESPIRATORY_SUPPORTS.join(", ")}.`,
    })
    .optional(),
  peep: measured("peep", RANGES.peep).optional(),
  flow: measured("flow", RANGES.flow).optional(),
  meanAirwayPressure: measured("meanAirwayPressure", RANGES.meanAirwayPressure).optional(),
  respiratoryRate: measured("respiratoryRate", RANGES.respiratoryRate).optional(),
  barometricPressure: inUnit("barometricPressure").optional(),
};

/**
 * What the Chart's blood-gas form holds: the same fields as the API, except
 * that FiO2 is typed as a percentage (21–100 %); `assessRequestFromForm` turns
 * it into the API's fraction.
 */
export const assessFormSchema = z
  .object({ ...bloodGasFields, fio2Percent: measured("fio2Percent", FIO2_PERCENT) })
  .superRefine(checkUnitRanges, always);
export type AssessFormValues = z.input<typeof assessFormSchema>;
export type AssessFormOutput = z.output<typeof assessFormSchema>;

const unitId = z
  .number({ error: "Unit must be a unit id (a positive whole number)." })
  .int()
  .positive();

const unitsOf = (values: { pressureUnit: PressureUnit; hemoglobinUnit: HemoglobinUnit }) => ({
  pressureUnit: values.pressureUnit,
  hemoglobinUnit: values.hemoglobinUnit,
});
const optionally = <T, R>(value: T | undefined, convert: (v: T) => R): R | undefined =>
  value === undefined ? undefined : convert(value);

/**
 * POST /api/v1/oxygenation/assess. FiO2 as a fraction; SpO2 and SaO2 in %;
 * PaO2, PaCO2 and barometric pressure in `pressureUnit` (default mmHg);
 * haemoglobin in `hemoglobinUnit` (default g/dL); `unitId` lets the server
 * take the barometric pressure from the unit's altitude when none is given.
 * Parses to the engine's input (mmHg, g/dL, fractions) and the units typed.
 */
export const assessRequestSchema = z
  .strictObject({
    ...bloodGasFields,
    fio2: measured("fio2", RANGES.fio2),
    ageYears: measured("ageYears", RANGES.ageYears).optional(),
    cardiacOutput: measured("cardiacOutput", RANGES.cardiacOutput).optional(),
    unitId: unitId.optional(),
  })
  .superRefine(checkUnitRanges, always)
  .transform((values) => {
    const { pressureUnit: p, hemoglobinUnit: h } = values;
    const input: BloodGasInput = {
      fio2: values.fio2,
      pao2: toMmHg(values.pao2, p),
      paco2: toMmHg(values.paco2, p),
      hemoglobin: optionally(values.hemoglobin, (v) => toGramsPerDecilitre(v, h)),
      spo2: values.spo2,
      sao2: optionally(values.sao2, (v) => v / 100),
      peep: values.peep,
      meanAirwayPressure: values.meanAirwayPressure,
      respiratoryRate: values.respiratoryRate,
      barometricPressure: optionally(values.barometricPressure, (v) => toMmHg(v, p)),
      support: values.support,
      flow: values.flow,
      ageYears: values.ageYears,
      cardiacOutput: values.cardiacOutput,
    };
    return { ...unitsOf(values), unitId: values.unitId, input: withoutUndefined(input) };
  });
export type AssessRequest = z.input<typeof assessRequestSchema>;
export type ParsedAssessRequest = z.output<typeof assessRequestSchema>;

/**
 * POST /api/v1/oxygenation/forecast: the blood gas the forecast starts from
 * (same units as assess; haemoglobin required by the shunt model) and the
 * proposed FiO2 as a fraction.
 */
export const forecastRequestSchema = z
  .strictObject({
    pressureUnit,
    hemoglobinUnit,
    fio2: measured("fio2", RANGES.fio2),
    pao2: inUnit("pao2"),
    paco2: inUnit("paco2"),
    hemoglobin: inUnit("hemoglobin"),
    nextFio2: measured("nextFio2", RANGES.fio2),
    barometricPressure: inUnit("barometricPressure").optional(),
    unitId: unitId.optional(),
  })
  .superRefine(checkUnitRanges, always)
  .transform((values) => {
    const { pressureUnit: p, hemoglobinUnit: h } = values;
    const input: ForecastInput = {
      fio2: values.fio2,
      pao2: toMmHg(values.pao2, p),
      paco2: toMmHg(values.paco2, p),
      hemoglobin: toGramsPerDecilitre(values.hemoglobin, h),
      nextFio2: values.nextFio2,
      barometricPressure: optionally(values.barometricPressure, (v) => toMmHg(v, p)),
    };
    return { ...unitsOf(values), unitId: values.unitId, input: withoutUndefined(input) };
  });
export type ForecastRequest = z.input<typeof forecastRequestSchema>;
export type ParsedForecastRequest = z.output<typeof forecastRequestSchema>;

/** The API body for what the form holds, plus what the Chart knows (unit, age). */
export function assessRequestFromForm(
  values: AssessFormOutput,
  context: { unitId?: number; ageYears?: number } = {},
): AssessRequest {
  const { fio2Percent, ...rest } = values;
  const ageYears =
    context.ageYears !== undefined &&
    context.ageYears >= RANGES.ageYears.min &&
    context.ageYears <= RANGES.ageYears.max
      ? context.ageYears
      : undefined;
  return withoutUndefined({ ...rest, fio2: fio2Percent / 100, unitId: context.unitId, ageYears });
}

/** Maps an API field error's path to the form field that shows it. */
export function formFieldOf(path: string): keyof AssessFormValues | undefined {
  if (path === "fio2") return "fio2Percent";
  const fields = Object.keys(assessFormSchema.shape) as (keyof AssessFormValues)[];
  return fields.find((f) => f === path);
}

// Optional keys are left out rather than sent or passed as undefined.
function withoutUndefined<T extends object>(value: T): T {
  return Object.fromEntries(Object.entries(value).filter(([, v]) => v !== undefined)) as T;
}
