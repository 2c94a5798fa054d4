import Papa from "papaparse";
import { describe, expect, it } from "vitest";
import { compareTable } from "@/lib/rehearsal/compare";
import { rehearsalCsv, rehearsalCsvFileName, runLine } from "@/lib/rehearsal/csv";
import { modelsTable, staysTable } from "@/lib/rehearsal/tables";
import { doneRun } from "../../fixtures/rehearsals";

const run = doneRun();

describe("a rehearsal's CSV", () => {
  it("starts with a line naming the table, the run, its unit, seed and cohort on the unit's clock", () => {
    expect(runLine(run, "Europe/Oslo")).toBe(
      "Run #12 “Lower PEEP, 92–96 %”, MICU, seed 42, 2 patients × 24 h, asked for 2026-12-03 09:15 (Europe/Oslo)",
    );
    const lines = rehearsalCsv(modelsTable(run.outcome!), [run], "Europe/Oslo").split("\r\n");
    expect(lines[0]).toBe(
      '"Protocol rehearsal: Care models; Run #12 “Lower PEEP, 92–96 %”, MICU, seed 42, 2 patients × 24 h, asked for 2026-12-03 09:15 (Europe/Oslo)"',
    );
    expect(lines[1]).toMatch(
      /^Care model,"In band, median \(%\)","In band, pooled \(%\)",Below \(%\)/,
    );
    expect(lines[2]).toMatch(/^Fixed-interval routine,70,70,10,5,15,0\.5,0\.13,4\.5,6,0,0$/);
    expect(lines).toHaveLength(6); // three models and the closing line break
  });

  it("writes both runs into the side by side's heading and keeps numbers plain", () => {
    const b = doneRun({ id: 14, label: "=cmd|' /C calc'!A0" });
    const table = compareTable(
      { ...run, models: run.outcome!.models },
      { ...b, models: b.outcome!.models },
    );
    const rows = Papa.parse<string[]>(rehearsalCsv(table, [run, b], "UTC").trim()).data;
    // Run A and run B by letter; a name a spreadsheet would run stays inside the text.
    expect(rows[0]![0]).toBe(
      "Protocol rehearsal: Measures of run A and run B; A: Run #12 “Lower PEEP, 92–96 %”, MICU, seed 42, 2 patients × 24 h, asked for 2026-12-03 08:15 (UTC); B: Run #14 “=cmd|' /C calc'!A0”, MICU, seed 42, 2 patients × 24 h, asked for 2026-12-03 08:15 (UTC)",
    );
    expect(rows[1]).toEqual(["Measure", "Care model", "Run A (#12)", "Run B (#14)", "B − A"]);
    expect(rows[2]).toEqual(["In band, median (%)", "Fixed-interval routine", "70", "70", "0"]);
  });

  it("writes an empty field for a missing share", () => {
    const table = staysTable({
      stays: [{ ...run.outcome!.stays[0]!, periodMs: 0, inBandMs: 0 }],
    });
    const rows = Papa.parse<string[]>(rehearsalCsv(table, [run], "UTC").trim()).data;
    expect(rows[2]![3]).toBe("");
  });

  it("names the file after the run(s) and the table", () => {
    expect(rehearsalCsvFileName({ id: "models" }, [run])).toBe("rehearsal-12-models.csv");
    expect(rehearsalCsvFileName({ id: "compare" }, [run, { id: 14 }])).toBe(
      "rehearsal-12-vs-14-compare.csv",
    );
  });
});
