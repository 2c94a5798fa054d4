import { describe, expect, it } from "vitest";
import {
  bloodGasCandidates,
  guessBloodGasMapping,
  ImportFileError,
  readCsvTable,
  readMonitorHeader,
} from "@/lib/imports/csv";
import { reportToCsv } from "@/lib/imports/report";
import { checkBloodGasCandidate, checkReadingCandidate } from "@/lib/imports/rows";
import { parseImportTime } from "@/lib/imports/time";
import { convertToStored } from "@/lib/imports/units";

const gasRow = (
  values: Record<string, { text: string; unit: string }>,
  extra: Record<string, string> = {},
) => ({
  line: 2,
  label: "line 2",
  mrn: "KH1",
  sampledAt: "2026-11-20T08:00:00Z",
  values,
  ...extra,
});

describe("blood gas row checks", () => {
  it("converts kPa to mmHg and % FiO2 to a fraction", () => {
    const r = checkBloodGasCandidate(
      gasRow({
        pao2: { text: "10", unit: "kPa" },
        paco2: { text: "40", unit: "mm[Hg]" },
        fio2: { text: "40", unit: "%" },
      }),
      "UTC",
    );
    expect(r.ok).toBe(true);
    if (r.ok) {
      expect(r.row.pao2).toBeCloseTo(75.006, 3);
      expect(r.row.fio2).toBeCloseTo(0.4, 10);
    }
  });

  it.each([
    [
      "kPa in a mmHg column",
      { pao2: { text: "8.2", unit: "mm[Hg]" } },
      "PaO2 column is labelled mmHg but 8.2 looks like kPa; check the column's unit.",
    ],
    [
      "mmHg in a kPa column",
      { pao2: { text: "85", unit: "mm[Hg]" }, paco2: { text: "40", unit: "kPa" } },
      "PaCO2 column is labelled kPa but 40 looks like mmHg; check the column's unit.",
    ],
    [
      "out of range",
      { pao2: { text: "750", unit: "mm[Hg]" } },
      "PaO2 750 mmHg is outside 10–700 mmHg.",
    ],
    ["not a number", { pao2: { text: "<10", unit: "mm[Hg]" } }, "PaO2 '<10' is not a number."],
    [
      "an unknown unit",
      { pao2: { text: "90", unit: "bar" } },
      "PaO2 unit 'bar' is not one Tidemark can convert.",
    ],
    ["a missing value", { pao2: { text: "", unit: "mm[Hg]" } }, "PaO2 is missing."],
  ])("refuses %s, naming the field", (_, values, message) => {
    const r = checkBloodGasCandidate(
      gasRow({ paco2: { text: "40", unit: "mm[Hg]" }, ...values }),
      "UTC",
    );
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.rejected.reasons.map((x) => x.message)).toContain(message);
  });

  it("reads HL7 haemoglobin in mmol/L per monomer through UCUM", () => {
    const converted = convertToStored("hemoglobin", 7.5, "mmol/L");
    expect(converted.ok && converted.value).toBeCloseTo(12.09, 2);
  });
});

describe("reading row checks", () => {
  it("accepts an SpO2 with a whole pulse rate and refuses a fractional one", () => {
    const base = {
      line: 3,
      label: "line 3",
      mrn: "KH1",
      takenAt: "2026-11-20 08:00:01",
      spo2: { text: "94", unit: "%" },
    };
    expect(checkReadingCandidate({ ...base, pulseRate: "88" }, "UTC")).toMatchObject({
      ok: true,
      row: { spo2: 94, pulseRate: 88 },
    });
    const bad = checkReadingCandidate({ ...base, pulseRate: "88.5" }, "UTC");
    expect(bad.ok).toBe(false);
  });
});

describe("CSV reading", () => {
  it("guesses the mapping and units from headers", () => {
    const m = guessBloodGasMapping(["Patient", "Collected", "pO2 (kPa)", "pCO2 [mmHg]", "Hb g/L"]);
    expect(m.columns).toEqual({
      mrn: "Patient",
      sampledAt: "Collected",
      pao2: "pO2 (kPa)",
      paco2: "pCO2 [mmHg]",
      hemoglobin: "Hb g/L",
    });
    expect(m.units).toEqual({ pao2: "kPa", paco2: "mm[Hg]", hemoglobin: "g/L" });
  });

  it("flags a row with a different number of fields than the header", () => {
    const table = readCsvTable("MRN,time,PaO2,PaCO2\nKH1,2026-11-20T08:00Z,80\n", ",");
    const [c] = bloodGasCandidates(table, guessBloodGasMapping(table.header));
    expect(c!.reasons).toEqual([
      { code: "format", message: "Line 2 has 3 fields; the header has 4." },
    ]);
  });

  it("refuses a semicolon file read as comma-separated, and a broken quote, as whole files", () => {
    expect(() => readCsvTable("MRN;time\nKH1;x\n", ",")).toThrow(/looks separated by semicolon/);
    expect(() => readCsvTable('MRN,time\n"KH1,x\n', ",")).toThrow(ImportFileError);
    expect(() => readMonitorHeader(["time", "sat"])).toThrow(
      /must name the columns time, spo2, pulse_rate/,
    );
  });
});

describe("times", () => {
  it("reads ISO with offset, unit-clock local times and HL7 DTM", () => {
    expect(parseImportTime("2026-11-20T08:00:00+01:00", "UTC")?.toISOString()).toBe(
      "2026-11-20T07:00:00.000Z",
    );
    expect(parseImportTime("2026-07-01 08:00", "Europe/Amsterdam")?.toISOString()).toBe(
      "2026-07-01T06:00:00.000Z",
    );
    expect(parseImportTime("202611200800-0500", "UTC")?.toISOString()).toBe(
      "2026-11-20T13:00:00.000Z",
    );
    expect(parseImportTime("2026-02-30 08:00", "UTC")).toBeNull();
  });
});

describe("report CSV", () => {
  it("writes one line per reason and neutralises spreadsheet formulas", () => {
    const csv = reportToCsv({
      id: 7,
      fileName: "a.csv",
      sha256: "f".repeat(64),
      status: "imported",
      counts: { total: 2, accepted: 1, rejected: 1 },
      rejected: [
        {
          line: 3,
          label: "line 3",
          mrn: "=cmd()",
          reasons: [
            { code: "range", field: "pao2", message: "PaO2 750 mmHg is outside 10–700 mmHg." },
          ],
        },
      ],
      notes: [],
    });
    expect(csv.split("\r\n")[4]).toBe(
      "line 3,3,'=cmd(),range,pao2,PaO2 750 mmHg is outside 10–700 mmHg.",
    );
  });
});
