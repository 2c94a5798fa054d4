import { afterAll, describe, expect, it } from "vitest";
import { assertUnitAccess } from "@/lib/auth/actor-queries";
import { randomUUID } from "node:crypto";
import { listOccupiedBeds, summariseUnits } from "@/lib/board/queries";
import { chartReading } from "@/lib/readings/service";
import { rebuildRollups } from "@/lib/rollups/store";
import { timeInBand } from "@/lib/time-in-band";
import { closeDb } from "@/lib/db";
import { NotFoundError } from "@/lib/errors";
import { actorByEmail, admitTestPatient, appDb, SEEDED } from "../helpers/db";

afterAll(async () => {
  await closeDb();
});

describe("Board", () => {
  it("lists only the occupied beds of the caller's units, with this shift's carers", async () => {
    const nurse = await actorByEmail(SEEDED.nurse); // MICU only
    const rows = await listOccupiedBeds(appDb(), nurse.unitIds);
    expect(rows.length).toBeGreaterThan(0);
    expect(new Set(rows.map((r) => r.unitCode))).toEqual(new Set(["MICU"]));
    for (const r of rows) expect(r.patientInitials).toMatch(/^[A-Z]\.[A-Z]\.$/);
    // The seeded beds (I01…I12) all have a nurse this shift; other tests add beds without one.
    const seeded = rows.filter((r) => /^I\d\d$/.test(r.bedLabel));
    expect(seeded.length).toBeGreaterThan(0);
    for (const r of seeded) expect(r.nurse).not.toBeNull();
  });

  it("counts occupied and total beds per unit, agreeing with plain SQL counts", async () => {
    const physician = await actorByEmail(SEEDED.physician); // both units
    const units = await summariseUnits(appDb(), physician.unitIds);
    for (const u of units) {
      const [beds] = (await appDb().raw(
        "SELECT COUNT(*) AS n FROM beds WHERE unit_id = ? AND active = 1",
        [u.unitId],
      )) as [[{ n: number }]];
      const [open] = (await appDb().raw(
        "SELECT COUNT(*) AS n FROM admissions a JOIN beds b ON b.id = a.bed_id WHERE b.unit_id = ? AND a.discharged_at IS NULL",
        [u.unitId],
      )) as [[{ n: number }]];
      expect(u.totalBeds).toBe(Number(beds[0].n));
      expect(u.occupiedBeds).toBe(Number(open[0].n));
    }
    // The seeded hospital: a 12-bed ICU and a 20-bed ward (tests may add beds).
    const byCode = Object.fromEntries(units.map((u) => [u.unitCode, u]));
    expect(byCode.MICU!.totalBeds).toBeGreaterThanOrEqual(12);
    expect(byCode.RESP!.totalBeds).toBeGreaterThanOrEqual(20);
    const occupied = await listOccupiedBeds(appDb(), physician.unitIds);
    expect(byCode.MICU!.occupiedBeds + byCode.RESP!.occupiedBeds).toBe(occupied.length);
  });

  it("answers another unit as not found", async () => {
    const nurse = await actorByEmail(SEEDED.nurse);
    const resp = (await appDb()("units").where({ code: "RESP" }).first("id")) as { id: number };
    expect(() => assertUnitAccess(nurse, resp.id)).toThrow(NotFoundError);
  });

  it("refuses a second open admission to an occupied bed (database constraint)", async () => {
    const open = (await appDb()("admissions").whereNull("discharged_at").first("bed_id")) as {
      bed_id: number;
    };
    const [patientId] = await appDb()("patients").insert({
      mrn: `T${Date.now()}`.slice(0, 20),
      family_name: "Probe",
      given_name: "Bed",
      birth_date: "1970-01-01",
      sex: "female",
    });
    await expect(
      appDb()("admissions").insert({
        patient_id: patientId,
        bed_id: open.bed_id,
        admitted_at: new Date(),
      }),
    ).rejects.toMatchObject({ code: "ER_DUP_ENTRY" });
  });

  it("shows the 24 h time in band from the order history, matching a hand-computed fixture", async () => {
    const knex = appDb();
    const physician = await actorByEmail(SEEDED.physician);
    const { patientId, unitId, bedId } = await admitTestPatient("MICU");
    const admission = (await knex("admissions").where({ patient_id: patientId }).first("id")) as {
      id: number;
    };
    const now = new Date(Math.floor(Date.now() / 60_000) * 60_000);
    const h = (hours: number) => new Date(now.getTime() - hours * 3600_000);
    const order = (status: string, lower: number, upper: number, created: Date, updated: Date) => ({
      patient_id: patientId,
      admission_id: admission.id,
      unit_id: unitId,
      status,
      device: "nasal_cannula",
      spo2_lower_pct: lower,
      spo2_upper_pct: upper,
      fio2_min: 0.21,
      fio2_max: 0.45,
      initial_fio2: 0.28,
      initial_flow_l_min: 2,
      reassess_minutes: 240,
      rationale: "Board fixture",
      entry_mode: "written",
      entered_by: physician.id,
      prescriber_id: physician.id,
      created_at: created,
      updated_at: updated,
    });
    // Order A 92–96 % from −30 h, superseded at −12 h by order B 88–92 %, still active.
    await knex("orders").insert(order("superseded", 92, 96, h(30), h(12)));
    await knex("orders").insert(order("active", 88, 92, h(12), h(12)));
    const reading = (hoursAgo: number, spo2: number, fio2: number) => ({
      patient_id: patientId,
      admission_id: admission.id,
      taken_at: h(hoursAgo),
      spo2_pct: spo2,
      fio2,
      device: "nasal_cannula",
      source: "manual",
    });
    await knex("readings").insert([
      reading(26, 90, 0.4), // holds to −22 h (4 h carry-forward): −24…−22 under A, below → below 2 h
      // −22…−20 nothing holds → unknown 2 h
      reading(20, 94, 0.4), // to −16 h (carry limit): in band 4 h; −16…−14 unknown 2 h
      reading(14, 98, 0.4), // to −10 h: −14…−12 above A, −12…−10 above B → above 4 h
      reading(10, 97, 0.21), // to −8 h: above B but on room air → in band 2 h
      reading(8, 87, 0.3), // to −4 h: below B → below 4 h
      reading(4, 90, 0.3), // to now: in band 4 h
    ]);
    // Totals over 24 h: below 2 + 4 = 6 h, in band 4 + 2 + 4 = 10 h, above 4 h, unknown 2 + 2 = 4 h.
    // Rows written straight to the tables: the patient lay in the bed from −31 h, and the
    // rollups are rebuilt from them as the services would have kept them.
    await knex("admissions")
      .where({ id: admission.id })
      .update({ admitted_at: h(31) });
    await rebuildRollups(knex, { from: h(31), to: h(-4), admissionIds: [admission.id] });
    await knex("bedside_settings").insert({
      admission_id: admission.id,
      patient_id: patientId,
      device: "nasal_cannula",
      fio2: 0.28,
      fio2_estimated: true,
      flow_l_min: 2,
      updated_at: h(5),
      last_reassessed_at: h(5), // 300 min ago, order says every 240 min → overdue
    });
    await knex("blood_gases").insert({
      patient_id: patientId,
      admission_id: admission.id,
      sampled_at: h(6),
      sample_type: "arterial",
      pao2_mmhg: 63,
      paco2_mmhg: 40,
      device: "nasal_cannula",
      fio2: 0.3,
      fio2_estimated: true,
      barometric_pressure_mmhg: 760,
      pf_ratio: 210,
      indices_json: "{}",
      engine_version: "test",
      recorded_by: physician.id,
    });

    const rows = await listOccupiedBeds(knex, [unitId], now);
    const row = rows.find((r) => r.bedId === bedId);
    expect(row).toBeDefined();
    expect(row!.timeInBand24h.below).toBeCloseTo(6 / 24, 9);
    expect(row!.timeInBand24h.inBand).toBeCloseTo(10 / 24, 9);
    expect(row!.timeInBand24h.above).toBeCloseTo(4 / 24, 9);
    expect(row!.timeInBand24h.unknown).toBeCloseTo(4 / 24, 9);
    expect(row!.order).toMatchObject({ status: "active", lower: 88, upper: 92 });
    expect(row!.latestSpo2).toMatchObject({ pct: 90 });
    expect(row!.spo2Status).toBe("in-band");
    expect(row!.latestPf).toMatchObject({ ratio: 210, fio2Estimated: true });
    expect(row!).toMatchObject({
      device: "nasal_cannula",
      fio2: 0.28,
      fio2Estimated: true,
      flowLMin: 2,
      peepCmH2o: null,
      minutesSinceReassessment: 300,
      overdue: true,
    });
  });

  it("shows a bed without an order or readings as unknown, not as in band", async () => {
    const { unitId, bedId } = await admitTestPatient("RESP");
    const rows = await listOccupiedBeds(appDb(), [unitId]);
    const row = rows.find((r) => r.bedId === bedId)!;
    expect(row.order).toBeNull();
    expect(row.spo2Status).toBeNull();
    expect(row.timeInBand24h).toEqual({ below: 0, inBand: 0, above: 0, unknown: 1 });
    expect(row.overdue).toBe(false);
  });

  it("shows a reading charted after the Board was first loaded on the next load, as a recomputation from the raw rows would", async () => {
    const knex = appDb();
    const physician = await actorByEmail(SEEDED.physician);
    const nurse = await actorByEmail(SEEDED.nurse);
    const { patientId, unitId, bedId } = await admitTestPatient("MICU");
    const admission = (await knex("admissions").where({ patient_id: patientId }).first("id")) as {
      id: number;
    };
    await knex("admissions")
      .where({ id: admission.id })
      .update({ admitted_at: new Date(Date.now() - 4 * 3600_000) });
    await knex("orders").insert({
      patient_id: patientId,
      admission_id: admission.id,
      unit_id: unitId,
      status: "active",
      device: "venturi_mask",
      spo2_lower_pct: 92,
      spo2_upper_pct: 96,
      fio2_min: 0.24,
      fio2_max: 0.6,
      initial_fio2: 0.35,
      reassess_minutes: 60,
      rationale: "Board refresh fixture",
      entry_mode: "written",
      entered_by: physician.id,
      prescriber_id: physician.id,
      created_at: new Date(Date.now() - 3 * 3600_000),
    });
    const chart = (minutesAgo: number, spo2: number) =>
      chartReading(knex, nurse, {
        patientId,
        takenAt: new Date(Date.now() - minutesAgo * 60_000),
        spo2,
        device: "venturi_mask",
        fio2: 0.35,
        idempotencyKey: randomUUID(),
      });
    await chart(120, 94);
    const first = (await listOccupiedBeds(knex, [unitId])).find((r) => r.bedId === bedId)!;
    expect(first.spo2Status).toBe("in-band");
    expect(first.timeInBand24h.below).toBe(0);

    await chart(30, 89);
    const next = (await listOccupiedBeds(knex, [unitId])).find((r) => r.bedId === bedId)!;
    expect(next.latestSpo2?.pct).toBe(89);
    expect(next.spo2Status).toBe("below");
    // 89 % charted 30 min ago holds until now (reassess every 60 min): about 30 min below.
    expect(next.timeInBand24h.below * 24 * 60).toBeGreaterThan(28);
    expect(next.timeInBand24h.below * 24 * 60).toBeLessThan(31);
    // The same 24 h straight from the raw rows.
    const to = new Date(Math.ceil(Date.now() / 60_000) * 60_000);
    const from = new Date(to.getTime() - 24 * 3600_000);
    const raw = timeInBand({
      from,
      to,
      bands: [
        {
          from: new Date(Date.now() - 3 * 3600_000),
          to: null,
          lower: 92,
          upper: 96,
          reassessMinutes: 60,
        },
      ],
      readings: (
        (await knex("readings")
          .where({ admission_id: admission.id })
          .select("taken_at", "spo2_pct", "fio2", "flow_l_min", "source")) as {
          taken_at: Date;
          spo2_pct: number;
          fio2: number;
          flow_l_min: number | null;
          source: "manual" | "monitor";
        }[]
      ).map((r) => ({
        at: r.taken_at,
        spo2: r.spo2_pct,
        fio2: r.fio2,
        flow: r.flow_l_min,
        source: r.source,
      })),
    });
    // Within a minute at each edge of the window (the rollups' grain).
    expect(Math.abs(next.timeInBand24h.below - raw.below) * 24 * 60).toBeLessThanOrEqual(2);
    expect(Math.abs(next.timeInBand24h.inBand - raw.inBand) * 24 * 60).toBeLessThanOrEqual(2);
  });
});
