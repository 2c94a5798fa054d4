import { CsvError, parse } from "csv-parse/sync";
import { z } from "zod";
import {
  BLOOD_GAS_COLUMNS,
  BLOOD_GAS_MEASURED_COLUMNS,
  CSV_DELIMITERS,
  MEASURED_FIELDS,
  MONITOR_COLUMNS,
  type BloodGasColumn,
  type CsvDelimiter,
  type UcumCode,
} from "./kinds";
import type { BloodGasCandidate, ReadingCandidate } from "./rows";

/** A file-level refusal: the file cannot be read as the format it claims to be. */
export class ImportFileError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "ImportFileError";
  }
}

export type CsvTable = { header: string[]; rows: { line: number; cells: string[] }[] };

/** Blood gas CSV files are small (an analyser's day is hundreds of rows); larger ones are refused. */
export const MAX_BLOOD_GAS_ROWS = 20_000;

const OTHER_DELIMITERS: Record<CsvDelimiter, string[]> = {
  ",": [";", "\t", "|"],
  ";": [",", "\t", "|"],
  "\t": [",", ";", "|"],
};
const delimiterName = (d: string) =>
  d in CSV_DELIMITERS ? CSV_DELIMITERS[d as CsvDelimiter].toLowerCase() : `'${d}'`;

/**
 * A header that came out as one column but holds another separator: the file
 * was saved with a different delimiter than the one chosen.
 */
export function wrongDelimiterMessage(
  header: string[],
  delimiter: CsvDelimiter,
): string | undefined {
  if (header.length !== 1) return undefined;
  const found = OTHER_DELIMITERS[delimiter].find((d) => (header[0] ?? "").includes(d));
  if (!found) return undefined;
  return `The header line has one column, '${(header[0] ?? "").slice(0, 60)}', and looks separated by ${delimiterName(found)}, not ${delimiterName(delimiter)}. Choose the file's delimiter, or save it as ${delimiterName(delimiter)}-separated.`;
}

/** Reads a whole (small) CSV file; quoting errors refuse the file naming the line. */
export function readCsvTable(text: string, delimiter: CsvDelimiter): CsvTable {
  let records: { record: string[]; info: { lines: number } }[];
  try {
    records = parse(text, {
      delimiter,
      bom: true,
      info: true,
      relax_column_count: true,
      skip_empty_lines: true,
      trim: true,
    }) as unknown as { record: string[]; info: { lines: number } }[];
  } catch (error) {
    if (error instanceof CsvError)
      throw new ImportFileError(`The file is not valid CSV: ${error.message}`);
    throw error;
  }
  const [first, ...rest] = records;
  if (!first) throw new ImportFileError("The file is empty.");
  if (rest.length > MAX_BLOOD_GAS_ROWS) {
    throw new ImportFileError(
      `The file has ${rest.length} rows; at most ${MAX_BLOOD_GAS_ROWS} per file.`,
    );
  }
  const wrong = wrongDelimiterMessage(first.record, delimiter);
  if (wrong) throw new ImportFileError(wrong);
  return { header: first.record, rows: rest.map((r) => ({ line: r.info.lines, cells: r.record })) };
}

const unitCode = z.enum(
  Object.keys({
    "mm[Hg]": 1,
    kPa: 1,
    "g/dL": 1,
    "g/L": 1,
    "mmol/L": 1,
    "%": 1,
    "1": 1,
    "[pH]": 1,
  }) as [UcumCode, ...UcumCode[]],
);

/** Which column holds which value, and in which unit: the CSV mapping step. */
export const bloodGasMappingSchema = z
  .object({
    delimiter: z.enum([",", ";", "\t"]).default(","),
    columns: z.partialRecord(
      z.enum(BLOOD_GAS_COLUMNS.map((c) => c.key) as [BloodGasColumn, ...BloodGasColumn[]]),
      z.string().max(200),
    ),
    units: z.partialRecord(
      z.enum(
        BLOOD_GAS_MEASURED_COLUMNS as [
          (typeof BLOOD_GAS_MEASURED_COLUMNS)[number],
          ...typeof BLOOD_GAS_MEASURED_COLUMNS,
        ],
      ),
      unitCode,
    ),
  })
  .superRefine((m, ctx) => {
    for (const c of BLOOD_GAS_COLUMNS) {
      if (c.required && !m.columns[c.key]) {
        ctx.addIssue({
          code: "custom",
          path: ["columns", c.key],
          message: `Choose the column that holds ${c.label}.`,
        });
      }
    }
    for (const key of BLOOD_GAS_MEASURED_COLUMNS) {
      const unit = m.units[key];
      if (
        m.columns[key] &&
        unit &&
        !(MEASURED_FIELDS[key].units as readonly string[]).includes(unit)
      ) {
        ctx.addIssue({
          code: "custom",
          path: ["units", key],
          message: `${MEASURED_FIELDS[key].label} cannot be given in ${unit}.`,
        });
      }
    }
  });
export type BloodGasMapping = z.output<typeof bloodGasMappingSchema>;

const norm = (h: string) => h.toLowerCase().replace(/[^a-z0-9]/g, "");

const HEADER_GUESSES: Record<BloodGasColumn, RegExp> = {
  mrn: /^(mrn|patientid|patient|medicalrecordnumber|pid)$/,
  sampledAt: /^(sampledat|sampletime|time|datetime|timestamp|collected|collectedat|date)/,
  sampleType: /^(sampletype|type|specimen)$/,
  pao2: /^(pao2|po2)/,
  paco2: /^(paco2|pco2)/,
  ph: /^ph$/,
  hco3: /^(hco3|bicarb|bicarbonate)/,
  baseExcess: /^(be|baseexcess|beb|beecf|abe|sbe)/,
  sao2: /^(sao2|so2|o2sat)/,
  hemoglobin: /^(hb|hgb|haemoglobin|hemoglobin|ctHb|cthb)/,
  fio2: /^fio2/,
};

function unitInHeader(header: string): UcumCode | undefined {
  const h = header.toLowerCase();
  if (/kpa/.test(h)) return "kPa";
  if (/mm ?\[?hg\]?/.test(h)) return "mm[Hg]";
  if (/g\/dl/.test(h)) return "g/dL";
  if (/g\/l/.test(h)) return "g/L";
  if (/mmol\/l/.test(h)) return "mmol/L";
  if (/%/.test(h)) return "%";
  return undefined;
}

/** A first guess of the mapping from the header names ("PaO2 (kPa)" → PaO2 in kPa); the person checks it. */
export function guessBloodGasMapping(
  header: string[],
  delimiter: CsvDelimiter = ",",
): BloodGasMapping {
  const columns: BloodGasMapping["columns"] = {};
  const units: BloodGasMapping["units"] = {};
  for (const c of BLOOD_GAS_COLUMNS) {
    const match = header.find(
      (h) => HEADER_GUESSES[c.key].test(norm(h)) && !Object.values(columns).includes(h),
    );
    if (match) columns[c.key] = match;
  }
  for (const key of BLOOD_GAS_MEASURED_COLUMNS) {
    const col = columns[key];
    if (!col) continue;
    const inHeader = unitInHeader(col);
    const allowed = MEASURED_FIELDS[key].units as readonly UcumCode[];
    units[key] = inHeader && allowed.includes(inHeader) ? inHeader : allowed[0]!;
  }
  return { delimiter, columns, units };
}

/** Turns CSV rows into blood gas candidates by the mapping. */
export function bloodGasCandidates(table: CsvTable, mapping: BloodGasMapping): BloodGasCandidate[] {
  const index = (name: string | undefined) =>
    name === undefined ? -1 : table.header.indexOf(name);
  for (const [key, name] of Object.entries(mapping.columns)) {
    if (name && index(name) < 0) {
      throw new ImportFileError(
        `The mapping names a column '${name}' for ${key} that is not in the file's header.`,
      );
    }
  }
  const cell = (cells: string[], name: string | undefined) => {
    const i = index(name);
    return i < 0 ? "" : (cells[i] ?? "");
  };
  return table.rows.map(({ line, cells }) => {
    const values: BloodGasCandidate["values"] = {};
    for (const key of BLOOD_GAS_MEASURED_COLUMNS) {
      const name = mapping.columns[key];
      if (name)
        values[key] = {
          text: cell(cells, name),
          unit: mapping.units[key] ?? MEASURED_FIELDS[key].units[0],
        };
    }
    const reasons =
      cells.length !== table.header.length
        ? [
            {
              code: "format" as const,
              message: `Line ${line} has ${cells.length} fields; the header has ${table.header.length}.`,
            },
          ]
        : [];
    return {
      line,
      label: `line ${line}`,
      mrn: cell(cells, mapping.columns.mrn),
      sampledAt: cell(cells, mapping.columns.sampledAt),
      sampleType: cell(cells, mapping.columns.sampleType),
      values,
      reasons,
    };
  });
}

export type MonitorHeader = { time: number; spo2: number; pulseRate: number };

/** Checks a monitor file's header line: `time,spo2[,pulse_rate]`, any order, comma-separated. */
export function readMonitorHeader(cells: string[]): MonitorHeader {
  const wrong = wrongDelimiterMessage(cells, ",");
  if (wrong) throw new ImportFileError(wrong);
  const names = cells.map((c) => c.trim().toLowerCase());
  const time = names.indexOf("time");
  const spo2 = names.indexOf("spo2");
  if (time < 0 || spo2 < 0) {
    throw new ImportFileError(
      `The header line must name the columns ${MONITOR_COLUMNS.join(", ")} (pulse_rate optional); it has '${cells.join(",").slice(0, 80)}'.`,
    );
  }
  return { time, spo2, pulseRate: names.indexOf("pulse_rate") };
}

/** One monitor CSV row as a reading candidate (the patient is named outside the file). */
export function monitorCandidate(
  cells: string[],
  line: number,
  header: MonitorHeader,
  width: number,
  mrn: string,
): ReadingCandidate {
  return {
    line,
    label: `line ${line}`,
    mrn,
    takenAt: cells[header.time] ?? "",
    spo2: { text: cells[header.spo2] ?? "", unit: "%" },
    pulseRate: header.pulseRate >= 0 ? cells[header.pulseRate] : undefined,
    reasons:
      cells.length !== width
        ? [
            {
              code: "format",
              message: `Line ${line} has ${cells.length} fields; the header has ${width}.`,
            },
          ]
        : [],
  };
}
