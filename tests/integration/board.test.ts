import { afterAll, describe, expect, it } from "vitest";
import { assertUnitAccess } from "@/lib/auth/actor-queries";
import { listOccupiedBeds, summariseUnits } from "@/lib/board/queries";
import { closeDb } from "@/lib/db";
import { NotFoundError } from "@/lib/errors";
import { actorByEmail, appDb, SEEDED } from "../helpers/db";

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
});
