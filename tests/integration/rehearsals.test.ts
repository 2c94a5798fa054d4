import { afterAll, describe, expect, it } from "vitest";
import { closeDb } from "@/lib/db";
import { ForbiddenError, NotFoundError, ValidationError } from "@/lib/errors";
import { alertConfig } from "@/lib/alerts/config";
import { rehearsalFormDefaults } from "@/lib/rehearsal/form-defaults";
import {
  listRehearsalsOperation,
  readRehearsalOperation,
  requestRehearsalOperation,
} from "@/lib/rehearsal/operations";
import { kickRehearsals, STALE_AFTER_MS } from "@/lib/rehearsal/runner";
import { runRehearsal } from "@/lib/rehearsal";
import type { RehearsalParameters } from "@/lib/rehearsal";
import type { RehearsalCreateInput } from "@/lib/rehearsal/schema";
import type { RehearsalView } from "@/lib/rehearsal/views";
import { actorByEmail, appDb, SEEDED } from "../helpers/db";

afterAll(async () => {
  await closeDb();
});

async function ids() {
  const knex = appDb();
  const unit = (await knex("units").where({ code: "MICU" }).first("id")) as { id: number };
  const table = (code: string) =>
    knex("step_tables").where({ code }).first("id") as Promise<{ id: number }>;
  const own = (await knex("step_tables")
    .where({ name: "MICU conservative PEEP ladder" })
    .first("id")) as { id: number };
  return {
    unitId: unit.id,
    lower: (await table("ardsnet-lower-peep")).id,
    higher: (await table("ardsnet-higher-peep")).id,
    own: own.id,
  };
}

async function form(over: Partial<RehearsalCreateInput> = {}): Promise<RehearsalCreateInput> {
  const { unitId, lower } = await ids();
  const cfg = alertConfig();
  return {
    ...rehearsalFormDefaults({
      unitId,
      ventilatedTableId: lower,
      detection: cfg,
      escalateAfterMinutes: cfg.escalateAfterMs / 60_000,
    }),
    label: "Lower PEEP, small cohort",
    patients: 3,
    hours: 4,
    seed: 77,
    ...over,
  };
}

async function finished(id: number): Promise<RehearsalView> {
  const physician = await actorByEmail(SEEDED.physician);
  await kickRehearsals(appDb());
  return readRehearsalOperation.invoke(appDb(), physician, { rehearsalId: id });
}

describe("rehearsals", () => {
  it("queues a run with its ledger row, runs it in a worker thread and stores what the engine gives for the same seed", async () => {
    const physician = await actorByEmail(SEEDED.physician);
    const queued = await requestRehearsalOperation.invoke(appDb(), physician, await form());
    expect(queued.status).toMatch(/queued|running/);
    expect(queued.settings.seed).toBe(77);
    expect(queued.tables.ventilated.name).toBe("ARDS Network lower PEEP / higher FiO2");
    expect(queued.tables.hfnc.id).toBeNull();

    const done = await finished(queued.id);
    expect(done.status).toBe("done");
    expect(done.progress).toBe(1);
    expect(done.outcome!.stays).toHaveLength(3 * 3);

    // The stored outcome is the engine's, run in-process on the stored parameters.
    const row = (await appDb()("rehearsals").where({ id: queued.id }).first("parameters_json")) as {
      parameters_json: string;
    };
    const direct = runRehearsal({
      seed: 77,
      patients: 3,
      hours: 4,
      parameters: JSON.parse(row.parameters_json) as RehearsalParameters,
    });
    expect(done.outcome!.models).toEqual(direct.models);

    const ledger = (await appDb()("ledger_entries")
      .where({ entity_type: "rehearsal", entity_id: String(queued.id) })
      .orderBy("id")
      .select("action", "actor_role")) as { action: string; actor_role: string }[];
    expect(ledger).toEqual([
      { action: "rehearsal.request", actor_role: "physician" },
      { action: "rehearsal.finish", actor_role: "system" },
    ]);

    // The unit's list holds it with its summaries; a nurse of the unit reads it.
    const nurse = await actorByEmail(SEEDED.nurse);
    const list = await listRehearsalsOperation.invoke(appDb(), nurse, { unitId: done.unitId });
    const item = list.find((r) => r.id === queued.id)!;
    expect(item.models).toEqual(done.outcome!.models);
    expect(item).not.toHaveProperty("outcome");
  });

  it("carries the form's protocol and alert settings into the stored parameters, and says so in the basis", async () => {
    const physician = await actorByEmail(SEEDED.physician);
    const { own } = await ids();
    const queued = await requestRehearsalOperation.invoke(
      appDb(),
      physician,
      await form({ ventilatedTableId: own, spo2Lower: 90, spo2Upper: 94, sustainSeconds: 120 }),
    );
    const row = (await appDb()("rehearsals").where({ id: queued.id }).first("parameters_json")) as {
      parameters_json: string;
    };
    const p = JSON.parse(row.parameters_json) as RehearsalParameters;
    expect(p.protocol!.ventilator!.spo2Target).toEqual({ lower: 90, upper: 94 });
    expect(p.protocol!.ventilator!.steps[0]).toEqual({ fio2: 0.3, peep: 5 });
    expect(p.protocol!.hfnc!.spo2Target).toEqual({ lower: 90, upper: 94 });
    expect(p.care.detection.sustainMs).toBe(120_000);
    const done = await finished(queued.id);
    const detection = done.outcome!.basis.find((b) => b.name === "Alert detection")!;
    expect(detection.value).toContain("sustain 120 s");
    expect(detection.source).toMatch(/^set for this run/);
  });

  it("refuses a table of the wrong kind, another unit's table and limits no step fits, naming the field", async () => {
    const physician = await actorByEmail(SEEDED.physician);
    const { lower } = await ids();
    const count = async () =>
      Number(((await appDb()("rehearsals").count({ n: "*" }).first()) as { n: number }).n);
    const before = await count();
    const refusal = async (over: Partial<RehearsalCreateInput>) => {
      const error = await requestRehearsalOperation
        .invoke(appDb(), physician, await form(over))
        .catch((e: unknown) => e);
      expect(error).toBeInstanceOf(ValidationError);
      return (error as ValidationError).fieldErrors as Record<string, string[]>;
    };
    expect((await refusal({ hfncTableId: lower })).hfncTableId).toEqual([
      "High-flow patients need a flow/FiO2 table.",
    ]);
    expect(
      (await refusal({ ventilatedFio2Min: 0.21, ventilatedFio2Max: 0.25 })).ventilatedTableId,
    ).toEqual([
      "No step of the ventilated patients' table lies within FiO2 0.21–0.25 and PEEP 5–18 cmH2O.",
    ]);
    expect((await refusal({ spo2Upper: 101 })).spo2Upper).toEqual([
      "SpO2 upper bound must be between 70 and 100 %.",
    ]);
    // A RESP table is not in MICU's library.
    const resp = (await appDb()("units").where({ code: "RESP" }).first("id")) as { id: number };
    const [respTable] = await appDb()("step_tables").insert({
      unit_id: resp.id,
      code: `resp-test-${Date.now()}`,
      name: "RESP test table",
      kind: "fio2_peep",
      built_in: false,
    });
    expect((await refusal({ ventilatedTableId: Number(respTable) })).ventilatedTableId).toEqual([
      "That step table is not in the unit's library.",
    ]);
    expect(await count()).toBe(before);
  });

  it("lets physicians and admins run, everyone on the unit read, and hides another unit's runs", async () => {
    const nurse = await actorByEmail(SEEDED.nurse);
    await expect(
      requestRehearsalOperation.invoke(appDb(), nurse, await form()),
    ).rejects.toBeInstanceOf(ForbiddenError);
    const admin = await actorByEmail(SEEDED.admin);
    const run = await requestRehearsalOperation.invoke(appDb(), admin, await form({ patients: 1 }));
    await kickRehearsals(appDb());
    const respPhysician = await actorByEmail("amara.obi-lund@kestrel.example");
    await expect(
      readRehearsalOperation.invoke(appDb(), respPhysician, { rehearsalId: run.id }),
    ).rejects.toBeInstanceOf(NotFoundError);
    await expect(
      listRehearsalsOperation.invoke(appDb(), respPhysician, { unitId: run.unitId }),
    ).rejects.toBeInstanceOf(NotFoundError);
  });

  it("claims a run again once its heartbeat stops, and finishes it once", async () => {
    const physician = await actorByEmail(SEEDED.physician);
    const run = await requestRehearsalOperation.invoke(
      appDb(),
      physician,
      await form({ patients: 1 }),
    );
    await kickRehearsals(appDb());
    // As if a server had died mid-run: running, claimed, silent for too long.
    await appDb()("rehearsals")
      .where({ id: run.id })
      .update({
        status: "running",
        claimed_by: "a-dead-process",
        outcome_json: null,
        heartbeat_at: new Date(Date.now() - STALE_AFTER_MS - 1000),
      });
    const done = await finished(run.id);
    expect(done.status).toBe("done");
    const row = (await appDb()("rehearsals").where({ id: run.id }).first("attempts")) as {
      attempts: number;
    };
    expect(row.attempts).toBe(2);
  });
});
