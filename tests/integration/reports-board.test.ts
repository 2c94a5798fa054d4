import { afterAll, describe, expect, it } from "vitest";
import { listOccupiedBeds } from "@/lib/board/queries";
import { closeDb } from "@/lib/db";
import { loadReport } from "@/lib/reports/queries";
import { rebuildRollups } from "@/lib/rollups/store";
import { actorByEmail, admitTestPatient, appDb, SEEDED } from "../helpers/db";

afterAll(async () => {
  await closeDb();
});

// The Board's 24 h column and the time-in-band report read the same rollups:
// for the same 24 h they must give the same minutes, bed by bed.
describe("the Board and the time-in-band report", () => {
  it("agree on the last 24 h of every occupied bed of a unit", async () => {
    const knex = appDb();
    const physician = await actorByEmail(SEEDED.physician);
    const { patientId, unitId, bedId } = await admitTestPatient("RESP");
    const admission = (await knex("admissions").where({ patient_id: patientId }).first("id")) as {
      id: number;
    };
    const now = new Date(Math.floor(Date.now() / 60_000) * 60_000);
    const h = (hours: number) => new Date(now.getTime() - hours * 3600_000);
    await knex("admissions")
      .where({ id: admission.id })
      .update({ admitted_at: h(40) });
    // An order superseded 9 h ago, and a day of invented charted values around it.
    const order = (status: string, lower: number, created: Date, updated: Date) => ({
      patient_id: patientId,
      admission_id: admission.id,
      unit_id: unitId,
      status,
      device: "venturi_mask",
      spo2_lower_pct: lower,
      spo2_upper_pct: lower + 4,
      fio2_min: 0.24,
      fio2_max: 0.6,
      initial_fio2: 0.35,
      reassess_minutes: 120,
      rationale: "Board and report fixture",
      entry_mode: "written",
      entered_by: physician.id,
      prescriber_id: physician.id,
      created_at: created,
      updated_at: updated,
    });
    await knex("orders").insert(order("superseded", 92, h(36), h(9)));
    await knex("orders").insert(order("active", 88, h(9), h(9)));
    const values = [91, 94, 97, 89, 86, 93, 90, 95, 88, 92, 87, 96];
    await knex("readings").insert(
      values.map((spo2, i) => ({
        patient_id: patientId,
        admission_id: admission.id,
        taken_at: new Date(h(26).getTime() + i * 137 * 60_000),
        spo2_pct: spo2,
        fio2: i % 3 === 0 ? 0.21 : 0.35,
        device: "venturi_mask",
        source: "manual",
      })),
    );
    await rebuildRollups(knex, { from: h(40), to: h(-4), admissionIds: [admission.id] });

    const [board, report] = await Promise.all([
      listOccupiedBeds(knex, [unitId], now),
      loadReport(knex, "time-in-band", { unitId, from: h(24), to: now, groupBy: "patient" }, now),
    ]);
    const row = board.find((r) => r.bedId === bedId)!;
    const reported = report.rows.find((r) => r.patientId === patientId)!;
    expect(reported.patientMinutes).toBe(24 * 60);
    const minutes = (share: number) => share * 24 * 60;
    expect(reported.belowMinutes).toBeGreaterThan(0);
    expect(reported.aboveMinutes).toBeGreaterThan(0);
    expect(reported.belowMinutes).toBeCloseTo(minutes(row.timeInBand24h.below), 1);
    expect(reported.inBandMinutes).toBeCloseTo(minutes(row.timeInBand24h.inBand), 1);
    expect(reported.aboveMinutes).toBeCloseTo(minutes(row.timeInBand24h.above), 1);
    expect(reported.unknownMinutes).toBeCloseTo(minutes(row.timeInBand24h.unknown), 1);

    // Every other bed of the unit that lay there the whole 24 h agrees too.
    let compared = 0;
    for (const r of report.rows) {
      if (r.patientMinutes !== 24 * 60) continue;
      const b = board.find((x) => x.patientId === r.patientId);
      if (!b) continue;
      expect(r.inBandMinutes).toBeCloseTo(minutes(b.timeInBand24h.inBand), 1);
      expect(r.belowMinutes).toBeCloseTo(minutes(b.timeInBand24h.below), 1);
      compared++;
    }
    expect(compared).toBeGreaterThan(1);
  });
});
