import {
  createStepTableOperation,
  setStepTableActiveOperation,
  updateStepTableOperation,
} from "@/lib/step-tables/operations";
import { afterAll, describe, expect, it } from "vitest";
import { closeDb } from "@/lib/db";
import { ConflictError, ForbiddenError, ValidationError } from "@/lib/errors";
import { ardsNetworkTable } from "@/lib/oxygen";
import { listStepTables } from "@/lib/step-tables/queries";
import type { StepTableCreateInput } from "@/lib/step-tables/schema";
import { actorByEmail, appDb, SEEDED } from "../helpers/db";

afterAll(async () => {
  await closeDb();
});

async function micuId(): Promise<number> {
  return ((await appDb()("units").where({ code: "MICU" }).first("id")) as { id: number }).id;
}

async function hfncTable(over: Partial<StepTableCreateInput> = {}): Promise<StepTableCreateInput> {
  return {
    unitId: await micuId(),
    name: `HFNC ladder ${Date.now()}`,
    kind: "flow_fio2",
    source: "Unit protocol (invented for tests)",
    rows: [
      { fio2Min: 0.3, fio2Max: 0.3, flow: 30 },
      { fio2Min: 0.4, fio2Max: 0.4, flow: 40 },
      { fio2Min: 0.5, fio2Max: 0.5, flow: 50 },
    ],
    rationale: "unit ladder agreed",
    ...over,
  };
}

describe("step-table library", () => {
  it("holds the two ARDS Network tables as built-in rows, exactly as the engine publishes them", async () => {
    const nurse = await actorByEmail(SEEDED.nurse);
    const tables = await listStepTables(appDb(), nurse.unitIds);
    const lower = tables.find((t) => t.code === "ardsnet-lower-peep");
    expect(lower?.builtIn).toBe(true);
    const expected = ardsNetworkTable("lower-peep").map((r) => ({
      fio2: r.fio2,
      peep: r.peep,
    }));
    const stored = lower!.rows.map((r) => ({
      fio2: r.fio2Min === r.fio2Max ? r.fio2Min : [r.fio2Min, r.fio2Max],
      peep: r.peepMin === r.peepMax ? r.peepMin : [r.peepMin, r.peepMax],
    }));
    expect(stored).toEqual(expected);
  });

  it("lets an admin create, edit and retire a unit table, each with a ledger row; others are refused", async () => {
    const admin = await actorByEmail(SEEDED.admin);
    const physician = await actorByEmail(SEEDED.physician);
    await expect(
      createStepTableOperation.invoke(appDb(), physician, await hfncTable()),
    ).rejects.toBeInstanceOf(ForbiddenError);
    const created = await createStepTableOperation.invoke(appDb(), admin, await hfncTable());
    expect(created.rows).toHaveLength(3);
    const edited = await updateStepTableOperation.invoke(appDb(), admin, {
      ...(await hfncTable({ name: created.name })),
      id: created.id,
      version: created.version,
      rows: [...(await hfncTable()).rows, { fio2Min: 0.6, fio2Max: 0.6, flow: 60 }],
    });
    expect(edited.rows).toHaveLength(4);
    await expect(
      updateStepTableOperation.invoke(appDb(), admin, {
        ...(await hfncTable()),
        id: created.id,
        version: created.version,
      }),
    ).rejects.toBeInstanceOf(ConflictError);
    const retired = await setStepTableActiveOperation.invoke(appDb(), admin, {
      id: created.id,
      version: edited.version,
      active: false,
      rationale: "replaced",
    });
    expect(retired.active).toBe(false);
    const actions = (await appDb()("ledger_entries")
      .where({ entity_type: "step_table", entity_id: String(created.id) })
      .orderBy("id")
      .pluck("action")) as string[];
    expect(actions).toEqual(["step_table.create", "step_table.update", "step_table.deactivate"]);
  });

  it("refuses steps that lose support from one row to the next, naming the row", async () => {
    const admin = await actorByEmail(SEEDED.admin);
    const error = (await createStepTableOperation
      .invoke(
        appDb(),
        admin,
        await hfncTable({
          rows: [
            { fio2Min: 0.5, fio2Max: 0.5, flow: 50 },
            { fio2Min: 0.4, fio2Max: 0.4, flow: 40 },
          ],
        }),
      )
      .catch((e: unknown) => e)) as ValidationError;
    expect(error).toBeInstanceOf(ValidationError);
    expect(error.fieldErrors?.["rows.1.fio2Min"]).toEqual([
      "Step 2: FiO2 must not fall from one step to the next.",
    ]);
    expect(error.fieldErrors?.["rows.1.flow"]).toEqual([
      "Step 2: flow must not fall from one step to the next.",
    ]);
  });

  it("keeps the built-in tables read-only", async () => {
    const admin = await actorByEmail(SEEDED.admin);
    const builtIn = (await listStepTables(appDb(), admin.unitIds)).find((t) => t.builtIn)!;
    await expect(
      setStepTableActiveOperation.invoke(appDb(), admin, {
        id: builtIn.id,
        version: builtIn.version,
        active: false,
        rationale: "try",
      }),
    ).rejects.toThrow(/read-only|cannot be edited/);
  });
});
