import { describe, expect, it } from "vitest";
import { ardsNetworkTable, ardsNetworkTableSource, type SettingValue } from "@/lib/oxygen";

// The published rows, typed in again from the tables: ARMA, NEJM 2000 (lower
// PEEP/higher FiO2) and ALVEOLI, Brower et al., NEJM 2004 (higher PEEP/lower
// FiO2). Recalled from memory and checked against stored secondary copies
// (a protocol pocket card, code reproductions), not the NEJM originals.
const LOWER_PEEP: Array<[SettingValue, SettingValue]> = [
  [0.3, 5],
  [0.4, 5],
  [0.4, 8],
  [0.5, 8],
  [0.5, 10],
  [0.6, 10],
  [0.7, 10],
  [0.7, 12],
  [0.7, 14],
  [0.8, 14],
  [0.9, 14],
  [0.9, 16],
  [0.9, 18],
  [1.0, [18, 24]],
];
const HIGHER_PEEP: Array<[SettingValue, SettingValue]> = [
  [0.3, 5],
  [0.3, 8],
  [0.3, 10],
  [0.3, 12],
  [0.3, 14],
  [0.4, 14],
  [0.4, 16],
  [0.5, 16],
  [0.5, 18],
  [[0.5, 0.8], 20],
  [0.8, 22],
  [0.9, 22],
  [1.0, 22],
  [1.0, 24],
];

// The same tables as a pocket card groups them: PEEP range allowed at each
// FiO2 (medist.org "Protective lung ventilation" card, stored copy).
const POCKET_CARD: Record<number, { lower: [number, number]; higher: [number, number] }> = {
  0.3: { lower: [5, 5], higher: [5, 14] },
  0.4: { lower: [5, 8], higher: [14, 16] },
  0.5: { lower: [8, 10], higher: [16, 20] },
  0.6: { lower: [10, 10], higher: [20, 20] },
  0.7: { lower: [10, 14], higher: [20, 20] },
  0.8: { lower: [14, 14], higher: [20, 22] },
  0.9: { lower: [14, 18], higher: [22, 22] },
  1.0: { lower: [18, 24], higher: [22, 24] },
};

const ends = (value: SettingValue): readonly [number, number] =>
  typeof value === "number" ? [value, value] : value;

function peepRangeAt(table: ReturnType<typeof ardsNetworkTable>, fio2: number): [number, number] {
  const peeps = table
    .filter((row) => {
      const [low, high] = ends(row.fio2);
      return fio2 >= low - 1e-9 && fio2 <= high + 1e-9;
    })
    .flatMap((row) => ends(row.peep));
  return [Math.min(...peeps), Math.max(...peeps)];
}

describe("ardsNetworkTable — ARDS Network step tables", () => {
  it("reproduces the ARMA lower PEEP/higher FiO2 table row by row (NEJM 2000)", () => {
    expect(ardsNetworkTable("lower-peep").map((row) => [row.fio2, row.peep])).toEqual(LOWER_PEEP);
    expect(ardsNetworkTableSource("lower-peep")).toContain("2000");
  });

  it("reproduces the ALVEOLI higher PEEP/lower FiO2 table row by row (NEJM 2004)", () => {
    expect(ardsNetworkTable("higher-peep").map((row) => [row.fio2, row.peep])).toEqual(HIGHER_PEEP);
    expect(ardsNetworkTableSource("higher-peep")).toContain("2004");
  });

  it.each(Object.keys(POCKET_CARD).map(Number))(
    "allows the pocket card's PEEP range at FiO2 %s in both tables",
    (fio2) => {
      const card = POCKET_CARD[fio2];
      expect(peepRangeAt(ardsNetworkTable("lower-peep"), fio2)).toEqual(card?.lower);
      expect(peepRangeAt(ardsNetworkTable("higher-peep"), fio2)).toEqual(card?.higher);
    },
  );

  it.each(["lower-peep", "higher-peep"] as const)(
    "%s never lowers FiO2 or PEEP from one step to the next",
    (name) => {
      const rows = ardsNetworkTable(name);
      rows.slice(1).forEach((row, index) => {
        const previous = rows[index];
        if (!previous) throw new Error("unreachable");
        expect(ends(row.fio2)[0]).toBeGreaterThanOrEqual(ends(previous.fio2)[0]);
        expect(ends(row.peep)[0]).toBeGreaterThanOrEqual(ends(previous.peep)[0]);
      });
    },
  );

  it("cannot be changed by a caller (built-in data)", () => {
    const rows = ardsNetworkTable("lower-peep");
    expect(Object.isFrozen(rows)).toBe(true);
    expect(Object.isFrozen(rows[0])).toBe(true);
  });
});
