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
    for (const r of rows) {
      expect(r.patientInitials).toMatch(/^[A-Z]\.[A-Z]\.$/);
      expect(r.nurse).not.toBeNull();
    }
  });

  it("counts occupied and total beds per unit from the seeded hospital", async () => {
    const physician = await actorByEmail(SEEDED.physician); // both units
    const units = await summariseUnits(appDb(), physician.unitIds);
    const byCode = Object.fromEntries(units.map((u) => [u.unitCode, u]));
    expect(byCode.MICU?.totalBeds).toBe(12);
    expect(byCode.RESP?.totalBeds).toBe(20);
    const occupied = await listOccupiedBeds(appDb(), physician.unitIds);
    expect(byCode.MICU!.occupiedBeds + byCode.RESP!.occupiedBeds).toBe(occupied.length);
  });

  it("answers another unit as not found", async () => {
    const nurse = await actorByEmail(SEEDED.nurse);
    const resp = (await appDb()("units").where({ code: "RESP" }).first("id")) as { id: number };
    expect(() => assertUnitAccess(nurse, resp.id)).toThrow(NotFoundError);
  });

  it("refuses a second open admission to an occupied bed (database constraint)", async () => {
    const open = (await appDb()("admissions").whereNull("discharged_at").first("bed_id")) as { bed_id: number };
    const [patientId] = await appDb()("patients").insert({
      mrn: `T${Date.now()}`.slice(0, 20),
      family_name: "Probe",
      given_name: "Bed",
      birth_date: "1970-01-01",
      sex: "female",
    });
    await expect(
      appDb()("admissions").insert({ patient_id: patientId, bed_id: open.bed_id, admitted_at: new Date() }),
    ).rejects.toMatchObject({ code: "ER_DUP_ENTRY" });
  });
});
