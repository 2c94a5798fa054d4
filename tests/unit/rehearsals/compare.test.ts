import { describe, expect, it } from "vitest";
import { compareChart, compareTable, difference, settingDiffs } from "@/lib/rehearsal/compare";
import { cellText } from "@/lib/rehearsal/tables";
import { doneRun, model, SETTINGS } from "../../fixtures/rehearsals";

const a = doneRun();
const b = doneRun({
  id: 14,
  label: "MICU conservative PEEP ladder",
  settings: { ...SETTINGS, spo2Lower: 90, peepMax: 14 },
  tables: {
    ...a.tables,
    ventilated: {
      id: 31,
      name: "MICU conservative PEEP ladder",
      source: null,
      builtIn: false,
      rows: 8,
    },
  },
  outcome: {
    ...a.outcome!,
    models: [
      model("fixed-interval", 0.65),
      model("tidemark", 0.834, { alertsPerDay: 5.5 }),
      model("reference", 0.9),
    ],
  },
});
const runA = { ...a, models: a.outcome!.models };
const runB = { ...b, models: b.outcome!.models };

describe("two runs side by side", () => {
  it("names the settings and tables that differ, A before B, and nothing that is the same", () => {
    expect(settingDiffs(a, b)).toEqual([
      {
        key: "ventilatedTable",
        label: "Ventilated step table",
        a: "ARDS Network lower PEEP / higher FiO2",
        b: "MICU conservative PEEP ladder",
      },
      { key: "spo2Lower", label: "SpO2 lower bound (%)", a: "92", b: "90" },
      { key: "peepMax", label: "PEEP maximum (cmH2O)", a: "18", b: "14" },
    ]);
    expect(settingDiffs(a, a)).toEqual([]);
  });

  it("has one row per measure and care model with a column per run and the difference B − A", () => {
    const table = compareTable(runA, runB);
    expect(table.columns.map((c) => c.label)).toEqual([
      "Measure",
      "Care model",
      "Run A (#12)",
      "Run B (#14)",
      "B − A",
    ]);
    expect(table.rows).toHaveLength(11 * 3);
    const row = (measure: string, model: string) =>
      table.rows.find((r) => r.cells[0] === measure && r.cells[1] === model)!;
    const pooled = row("In band, pooled (%)", "Tidemark workflow");
    // 80.0 % against 83.4 %: +3.4 points, written with one place like the shares.
    expect(pooled.cells.slice(2)).toEqual([80, 83.4, 3.4]);
    expect([2, 3, 4].map((i) => cellText(table, pooled, i))).toEqual(["80.0", "83.4", "+3.4"]);
    const fixed = row("In band, pooled (%)", "Fixed-interval routine");
    expect(cellText(table, fixed, 4)).toBe("−5.0");
    const alerts = row("Alerts/patient-day", "Tidemark workflow");
    expect([2, 3, 4].map((i) => cellText(table, alerts, i))).toEqual(["8.0", "5.5", "−2.5"]);
    const same = row("In band, pooled (%)", "Instant reference");
    expect(cellText(table, same, 4)).toBe("0.0");
  });

  it("rounds a difference to the measure's places without a negative zero", () => {
    expect(difference(0.1, 0.3, 1)).toBe(0.2);
    expect(Object.is(difference(1.04, 1.0, 1), 0)).toBe(true);
  });

  it("charts pooled time in band per care model, one neutral bar per run", () => {
    const spec = compareChart(runA, runB);
    expect(spec.stacked).toBe(false);
    expect(spec.series.map((s) => s.tone)).toEqual(["neutral", "unknown"]);
    expect(spec.points.map((p) => [p.label, p.values])).toEqual([
      ["Fixed-interval routine", { a: 70, b: 65 }],
      ["Tidemark workflow", { a: 80, b: 83.4 }],
      ["Instant reference", { a: 90, b: 90 }],
    ]);
  });
});
