import { z } from "zod";
import {
  ANY_SATURATION,
  BLOOD_GAS_RANGES,
  saturationIssue,
  type BloodGasRangeKey,
} from "../blood-gases/schema";
import { RANGES, unitSuffix } from "../oxygen";
import {
  MEASURED_FIELDS,
  type BloodGasMeasuredColumn,
  type MeasuredField,
  type RejectedRow,
  type RowReason,
} from "./kinds";
import { parseImportTime } from "./time";
import { convertToStored, normalizeUnit, unitMismatch } from "./units";

// Row checks shared by every format: a row arrives as text with its unit,
// is parsed, checked for a unit mix-up, converted with UCUM, then validated
// with a zod schema whose messages name the field, the value and the range.

/** One value as it stood in the file, with the unit its column or OBX-6 gave. */
export type RawValue = { text: string; unit: string };

export type BloodGasCandidate = {
  line: number;
  label: string;
  mrn: string;
  sampledAt: string;
  sampleType?: string;
  values: Partial<Record<BloodGasMeasuredColumn, RawValue>>;
  /** Problems found while reading the row (e.g. a preliminary HL7 result). */
  reasons?: RowReason[];
};

export type ReadingCandidate = {
  line: number;
  label: string;
  mrn: string;
  takenAt: string;
  spo2: RawValue | undefined;
  pulseRate: string | undefined;
  reasons?: RowReason[];
};

const fmt = (v: number) => String(Math.round(v * 1000) / 1000);

/** A number inside a range of the range table, refused with "PaO2 5 mmHg is outside 10–700 mmHg." */
function measured(range: { label: string; min: number; max: number; unit: string }) {
  const unit = unitSuffix(range.unit);
  const outside = (input: unknown) =>
    `${range.label} ${typeof input === "number" ? fmt(input) : String(input)}${unit} is outside ${range.min}–${range.max}${unit}.`;
  return z
    .number()
    .min(range.min, { error: (issue) => outside(issue.input) })
    .max(range.max, { error: (issue) => outside(issue.input) });
}
const gas = (key: BloodGasRangeKey) => measured(BLOOD_GAS_RANGES[key]);

/** A blood gas row after unit conversion: pressures in mmHg, Hb in g/dL, saturations in %, FiO2 a fraction. */
export const importedBloodGasSchema = z
  .object({
    mrn: z.string().min(1),
    sampledAt: z.date(),
    sampleType: z.enum(["arterial", "venous"]),
    pao2: gas("pao2"),
    paco2: gas("paco2"),
    ph: gas("ph").optional(),
    hco3: gas("hco3").optional(),
    baseExcess: gas("baseExcess").optional(),
    // Any saturation here; the sample type's own range is checked below.
    sao2: measured(ANY_SATURATION).optional(),
    hemoglobin: gas("hemoglobin").optional(),
    fio2: gas("fio2").optional(),
  })
  .superRefine((v, ctx) => {
    const message = saturationIssue(v.sampleType, v.sao2);
    if (message)
      ctx.addIssue({
        code: "custom",
        path: ["sao2"],
        message: `${message.slice(0, -1)} (${v.sao2} % given).`,
      });
  });
export type ImportedBloodGas = z.infer<typeof importedBloodGasSchema>;

/** A monitor or HL7 SpO2 reading after conversion. */
export const importedReadingSchema = z.object({
  mrn: z.string().min(1),
  takenAt: z.date(),
  spo2: measured(RANGES.spo2),
  pulseRate: measured(RANGES.pulseRate)
    .refine(Number.isInteger, { error: "Pulse rate must be a whole number of beats per minute." })
    .optional(),
});
export type ImportedReading = z.infer<typeof importedReadingSchema>;

const NUMBER = /^[+-]?(\d+(\.\d*)?|\.\d+)$/;

/** Parses and converts one measured value; undefined when absent. */
export function readMeasured(
  field: MeasuredField,
  raw: RawValue | undefined,
  reasons: RowReason[],
): number | undefined {
  const label = MEASURED_FIELDS[field].label;
  const text = raw?.text.trim() ?? "";
  if (!raw || text === "") return undefined;
  if (!NUMBER.test(text)) {
    reasons.push({
      code: "format",
      field,
      message: `${label} '${text.slice(0, 20)}' is not a number.`,
    });
    return undefined;
  }
  const value = Number(text);
  const unitText = raw.unit.trim() || (field === "ph" ? "[pH]" : "");
  if (!unitText) {
    reasons.push({ code: "unit", field, message: `${label} ${text} has no unit.` });
    return undefined;
  }
  const unit = normalizeUnit(unitText);
  if (!unit) {
    reasons.push({
      code: "unit",
      field,
      message: `${label} unit '${unitText}' is not one Tidemark can convert.`,
    });
    return undefined;
  }
  const mismatch = unitMismatch(field, value, unit);
  if (mismatch) {
    reasons.push(mismatch);
    return undefined;
  }
  const converted = convertToStored(field, value, unit);
  if (!converted.ok) {
    reasons.push(converted.reason);
    return undefined;
  }
  return converted.value;
}

function zodReasons(error: z.ZodError, labels: Record<string, string>): RowReason[] {
  return error.issues.map((issue) => {
    const field = String(issue.path[0] ?? "");
    const missing =
      (issue.code === "invalid_type" && issue.input === undefined) ||
      (issue.code === "too_small" && issue.origin === "string");
    return {
      code: missing ? ("missing" as const) : ("range" as const),
      field,
      message: missing ? `${labels[field] ?? field} is missing.` : issue.message,
    };
  });
}

function readTime(
  text: string,
  field: string,
  label: string,
  timeZone: string,
  reasons: RowReason[],
): Date | undefined {
  if (!text.trim()) return undefined;
  const at = parseImportTime(text, timeZone);
  if (!at) {
    reasons.push({
      code: "time",
      field,
      message: `${label} '${text.trim().slice(0, 30)}' is not a date and time (use 2026-11-20 08:15, ISO 8601 or HL7 format).`,
    });
  }
  return at ?? undefined;
}

const GAS_LABELS: Record<string, string> = {
  mrn: "MRN",
  sampledAt: "Time sampled",
  sampleType: "Sample type",
  ...Object.fromEntries(Object.entries(MEASURED_FIELDS).map(([k, v]) => [k, v.label])),
};

export type RowCheck<T> =
  { ok: true; line: number; label: string; row: T } | { ok: false; rejected: RejectedRow };

/** Checks one blood gas row of any format. Patient, duplicates and bedside settings are checked later, against the database. */
export function checkBloodGasCandidate(
  c: BloodGasCandidate,
  timeZone: string,
): RowCheck<ImportedBloodGas> {
  const reasons: RowReason[] = [...(c.reasons ?? [])];
  const sampledAt = readTime(c.sampledAt, "sampledAt", "Time sampled", timeZone, reasons);
  const typeText = (c.sampleType ?? "").trim().toLowerCase();
  const sampleType =
    typeText === "" || typeText.startsWith("art") || typeText === "a"
      ? "arterial"
      : typeText.startsWith("ven") || typeText === "v"
        ? "venous"
        : undefined;
  if (!sampleType) {
    reasons.push({
      code: "format",
      field: "sampleType",
      message: `Sample type '${typeText}' must be arterial or venous.`,
    });
  }
  const values: Record<string, number | undefined> = {};
  for (const [field, raw] of Object.entries(c.values) as [BloodGasMeasuredColumn, RawValue][]) {
    values[field] = readMeasured(field, raw, reasons);
  }
  const alreadyReported = new Set(reasons.map((r) => r.field));
  const parsed = importedBloodGasSchema.safeParse({
    mrn: c.mrn.trim(),
    sampledAt,
    sampleType: sampleType ?? "arterial",
    ...values,
  });
  if (!parsed.success) {
    for (const r of zodReasons(parsed.error, GAS_LABELS)) {
      if (!alreadyReported.has(r.field)) reasons.push(r);
    }
  }
  if (reasons.length > 0 || !parsed.success) {
    return {
      ok: false,
      rejected: { line: c.line, label: c.label, mrn: c.mrn.trim() || null, reasons },
    };
  }
  return { ok: true, line: c.line, label: c.label, row: parsed.data };
}

const READING_LABELS: Record<string, string> = {
  mrn: "MRN",
  takenAt: "Time",
  spo2: "SpO2",
  pulseRate: "Pulse rate",
};
const INTEGER = /^[+-]?\d+(\.0*)?$/;

/** Checks one SpO2 reading of a monitor file or an HL7 message. */
export function checkReadingCandidate(
  c: ReadingCandidate,
  timeZone: string,
): RowCheck<ImportedReading> {
  const reasons: RowReason[] = [...(c.reasons ?? [])];
  const takenAt = readTime(c.takenAt, "takenAt", "Time", timeZone, reasons);
  const spo2 = readMeasured("spo2", c.spo2, reasons);
  let pulseRate: number | undefined;
  const pulseText = c.pulseRate?.trim() ?? "";
  if (pulseText !== "") {
    if (!INTEGER.test(pulseText)) {
      reasons.push({
        code: "format",
        field: "pulseRate",
        message: `Pulse rate '${pulseText.slice(0, 20)}' is not a whole number.`,
      });
    } else pulseRate = Number(pulseText);
  }
  const alreadyReported = new Set(reasons.map((r) => r.field));
  const parsed = importedReadingSchema.safeParse({ mrn: c.mrn.trim(), takenAt, spo2, pulseRate });
  if (!parsed.success) {
    for (const r of zodReasons(parsed.error, READING_LABELS)) {
      if (!alreadyReported.has(r.field)) reasons.push(r);
    }
  }
  if (reasons.length > 0 || !parsed.success) {
    return {
      ok: false,
      rejected: { line: c.line, label: c.label, mrn: c.mrn.trim() || null, reasons },
    };
  }
  return { ok: true, line: c.line, label: c.label, row: parsed.data };
}
