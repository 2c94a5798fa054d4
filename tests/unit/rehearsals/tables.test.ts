import { describe, expect, it } from "vitest";
import { cellText, modelsTable, modelTiles, shareChart, staysTable } from "@/lib/rehearsal/tables";
import { doneRun } from "../../fixtures/rehearsals";

const outcome = doneRun().outcome!;

describe("a run's tables", () => {
  it("lists the care models in the page's order with their measures as percentages and rates", () => {
    const table = modelsTable(outcome);
    expect(table.rows.map((r) => r.cells[0])).toEqual([
      "Fixed-interval routine",
      "Tidemark workflow",
      "Instant reference",
    ]);
    expect(table.columns.map((c) => c.label).slice(0, 6)).toEqual([
      "Care model",
      "In band, median (%)",
      "In band, pooled (%)",
      "Below (%)",
      "Above on oxygen (%)",
      "Unknown (%)",
    ]);
    const tidemark = table.rows[1]!;
    // 0.8 → 80.0 %; 8 alerts and 0.5 escalations per patient-day.
    expect(cellText(table, tidemark, 2)).toBe("80.0");
    const col = (label: string) => table.columns.findIndex((c) => c.label === label);
    expect(cellText(table, tidemark, col("Alerts/patient-day"))).toBe("8.0");
    expect(cellText(table, tidemark, col("Escalations/patient-day"))).toBe("0.50");
    expect(cellText(table, tidemark, col("SpO2 < 88 % (h/patient-day)"))).toBe("0.50");
  });

  it("stacks below, in band, above and unknown per care model, coloured by SpO2 state only", () => {
    const spec = shareChart(outcome);
    expect(spec.stacked).toBe(true);
    expect(spec.series.map((s) => [s.key, s.tone])).toEqual([
      ["below", "below"],
      ["inBand", "in-band"],
      ["above", "above"],
      ["unknown", "unknown"],
    ]);
    expect(spec.points[0]).toEqual({
      key: "fixed-interval",
      label: "Fixed-interval routine",
      values: { below: 10, inBand: 70, above: 5, unknown: 15 },
    });
  });

  it("lists every patient under every care model, patients counted from 1", () => {
    const table = staysTable(outcome);
    expect(table.rows.map((r) => `${r.cells[0]} / ${r.cells[1]}`)).toEqual([
      "Patient 1 / Fixed-interval routine",
      "Patient 1 / Tidemark workflow",
      "Patient 2 / Fixed-interval routine",
      "Patient 2 / Instant reference",
    ]);
    // 18 of 24 h in band = 75 %; 30 min under 88 %; FiO2-hours to two places.
    expect(table.rows[0]!.cells.slice(2, 10)).toEqual([24, 75, 12.5, 8.3, 4.2, 30, 6, 4.57]);
  });

  it("gives each care model a tile with the alert burden in the nurses' words", () => {
    const tiles = modelTiles(outcome);
    expect(tiles.map((t) => t.label)).toEqual([
      "Fixed-interval routine",
      "Tidemark workflow",
      "Instant reference",
    ]);
    const burden = tiles[1]!.values.find((v) => v.key === "alertsPerDay")!;
    expect(burden.label).toBe("Nurses' alert burden: alerts per patient-day");
    expect(burden.value).toBe(8);
  });
});
