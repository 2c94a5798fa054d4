import { describe, expect, it } from "vitest";
import { ledgerDiff } from "@/lib/ledger/diff";

describe("ledgerDiff", () => {
  it("lists every field with what it was and what it became, marking the changed ones", () => {
    const rows = ledgerDiff(
      JSON.stringify({ fio2: 0.4, flow: 40, device: "hfnc" }),
      JSON.stringify({ fio2: 0.45, flow: 40, device: "hfnc" }),
    );
    expect(rows).toEqual([
      { field: "fio2", before: "0.4", after: "0.45", changed: true },
      { field: "flow", before: "40", after: "40", changed: false },
      { field: "device", before: "hfnc", after: "hfnc", changed: false },
    ]);
  });

  it("flattens nested records and lists by dotted path, with added and removed fields", () => {
    const rows = ledgerDiff(
      JSON.stringify({ band: { lower: 92, upper: 96 }, steps: [{ peep: 5 }], note: "x" }),
      JSON.stringify({ band: { lower: 88, upper: 92 }, steps: [{ peep: 5 }, { peep: 8 }] }),
    );
    const byField = Object.fromEntries(rows.map((r) => [r.field, r]));
    expect(byField["band.lower"]).toMatchObject({ before: "92", after: "88", changed: true });
    expect(byField["steps.0.peep"]).toMatchObject({ changed: false });
    expect(byField["steps.1.peep"]).toMatchObject({ before: undefined, after: "8", changed: true });
    expect(byField.note).toMatchObject({ before: "x", after: undefined, changed: true });
  });

  it("shows a created record as all fields added, and text that is not JSON as it was stored", () => {
    expect(ledgerDiff(null, JSON.stringify({ id: 7, mrn: "KH1" }))).toEqual([
      { field: "id", before: undefined, after: "7", changed: true },
      { field: "mrn", before: undefined, after: "KH1", changed: true },
    ]);
    expect(ledgerDiff("not json", null)).toEqual([
      { field: "value", before: "not json", after: undefined, changed: true },
    ]);
  });

  it("shows a null value as a dash, not as missing", () => {
    expect(ledgerDiff(JSON.stringify({ peep: null }), JSON.stringify({ peep: 5 }))[0]).toEqual({
      field: "peep",
      before: "—",
      after: "5",
      changed: true,
    });
  });
});
