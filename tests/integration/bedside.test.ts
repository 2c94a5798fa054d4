import { recordAdjustmentOperation } from "@/lib/adjustments/operations";
import { recordBloodGasOperation } from "@/lib/blood-gases/operations";
import { writeOrderOperation } from "@/lib/orders/operations";
import { chartReadingOperation } from "@/lib/readings/operations";
import { afterAll, describe, expect, it } from "vitest";
import { closeDb } from "@/lib/db";
import { ConflictError, ForbiddenError, NotFoundError, ValidationError } from "@/lib/errors";
import { ledgerCsv, listLedger } from "@/lib/ledger/queries";
import { verifyLedger } from "@/lib/ledger/verify";
import type { OrderInput } from "@/lib/orders/schema";
import { getBedsideContext } from "@/lib/chart/bedside";
import { actorByEmail, admitTestPatient, appDb, SEEDED } from "../helpers/db";

afterAll(async () => {
  await closeDb();
});

async function patientWithHfncOrder(unit: "MICU" | "RESP" = "MICU") {
  const { patientId } = await admitTestPatient(unit);
  const physician = await actorByEmail(SEEDED.physician);
  const order = await writeOrderOperation.invoke(appDb(), physician, {
    entryMode: "written",
    password: "tidemark-demo",
    patientId,
    device: "hfnc",
    spo2Lower: 92,
    spo2Upper: 96,
    fio2Min: 0.3,
    fio2Max: 0.6,
    flowMin: 30,
    flowMax: 60,
    initialFio2: 0.4,
    initialFlow: 40,
    reassessMinutes: 30,
    rationale: "Type 1 failure, pneumonia",
    supersedesOrderId: null,
  } as OrderInput);
  return { patientId, order };
}

const minutesAgo = (m: number) => new Date(Date.now() - m * 60_000).toISOString();

describe("bedside adjustments", () => {
  it("records a change within limits with the engine's forecast from the latest arterial gas", async () => {
    const { patientId, order } = await patientWithHfncOrder();
    const therapist = await actorByEmail(SEEDED.therapist);
    await recordBloodGasOperation.invoke(appDb(), therapist, {
      patientId,
      sampledAt: minutesAgo(10),
      sampleType: "arterial",
      pao2: 60,
      paco2: 38,
      hemoglobin: 12,
      device: "hfnc",
      flow: 40,
      fio2: 0.4,
    });
    const adjustment = await recordAdjustmentOperation.invoke(appDb(), therapist, {
      patientId,
      settingsVersion: 1,
      toFio2: 0.5,
      toFlow: 50,
      reason: "below_band",
      rationale: "SpO2 89 % on 0.40",
      appliedAt: minutesAgo(1),
    });
    expect(adjustment).toMatchObject({
      orderId: order.id,
      from: { fio2: 0.4, flow: 40 },
      to: { fio2: 0.5, flow: 50 },
      settingsVersion: 2,
    });
    // Constant P/F by definition: 60 / 0.4 × 0.5 = 75 mmHg (unless capped at PAO2, which it is not here).
    expect(adjustment.forecast?.models.pf.pao2).toBeCloseTo(75, 6);
    const stored = (await appDb()("adjustments")
      .where({ id: adjustment.id })
      .first("forecast_json", "engine_version")) as {
      forecast_json: string;
      engine_version: string;
    };
    const saved = JSON.parse(stored.forecast_json) as {
      range: { low: { pao2: number }; high: { pao2: number } };
    };
    expect(saved.range.low.pao2).toBeLessThanOrEqual(saved.range.high.pao2);
    expect(saved.range).toEqual({
      low: adjustment.forecast?.range.low,
      high: adjustment.forecast?.range.high,
    });
    expect(stored.engine_version).toMatch(/^\d+\.\d+\.\d+$/);
    const context = await getBedsideContext(appDb(), therapist, patientId);
    expect(context.settings).toMatchObject({ fio2: 0.5, flow: 50, version: 2 });
  });

  it("refuses a change outside the order's limits, naming the limit and the way to a new order", async () => {
    const { patientId } = await patientWithHfncOrder();
    const therapist = await actorByEmail(SEEDED.therapist);
    const error = (await recordAdjustmentOperation
      .invoke(appDb(), therapist, {
        patientId,
        settingsVersion: 1,
        toFio2: 0.7,
        toFlow: 40,
        reason: "below_band",
        rationale: "desaturating",
        appliedAt: minutesAgo(1),
      })
      .catch((e: unknown) => e)) as ValidationError;
    expect(error).toBeInstanceOf(ValidationError);
    expect(error.fieldErrors?.toFio2?.[0]).toBe(
      "FiO2 0.70 is above this order's maximum of 0.60. To go beyond it, ask the physician for a new order.",
    );
    expect(await appDb()("adjustments").where({ patient_id: patientId }).first()).toBeUndefined();
  });

  it("lets exactly one of two changes from the same settings version win; the other sees the fresh state", async () => {
    const { patientId } = await patientWithHfncOrder();
    const therapist = await actorByEmail(SEEDED.therapist);
    const physician = await actorByEmail(SEEDED.physician);
    const change = (fio2: number) => ({
      patientId,
      settingsVersion: 1,
      toFio2: fio2,
      toFlow: 40,
      reason: "below_band" as const,
      rationale: "racing change",
      appliedAt: minutesAgo(1),
    });
    const results = await Promise.allSettled([
      recordAdjustmentOperation.invoke(appDb(), therapist, change(0.45)),
      recordAdjustmentOperation.invoke(appDb(), physician, change(0.5)),
    ]);
    expect(results.filter((r) => r.status === "fulfilled")).toHaveLength(1);
    const loser = results.find((r) => r.status === "rejected") as PromiseRejectedResult;
    expect(loser.reason).toBeInstanceOf(ConflictError);
    expect((loser.reason as Error).message).toMatch(/now FiO2 0\.(45|50)/);
  });

  it("writes once when the same form is submitted twice with one idempotency key", async () => {
    const { patientId } = await patientWithHfncOrder();
    const therapist = await actorByEmail(SEEDED.therapist);
    const input = {
      patientId,
      settingsVersion: 1,
      toFio2: 0.35,
      toFlow: 40,
      reason: "wean" as const,
      rationale: "SpO2 98 %",
      appliedAt: minutesAgo(1),
      idempotencyKey: `adj-${patientId}-double-click`,
    };
    const [a, b] = await Promise.all([
      recordAdjustmentOperation.invoke(appDb(), therapist, input),
      recordAdjustmentOperation.invoke(appDb(), therapist, input),
    ]);
    expect(a.id).toBe(b.id);
    const count = (await appDb()("adjustments")
      .where({ patient_id: patientId })
      .count({ n: "*" })
      .first()) as { n: number };
    expect(Number(count.n)).toBe(1);
  });

  it("refuses (409) a key reused for another kind of write, and writes nothing with it", async () => {
    const { patientId } = await patientWithHfncOrder();
    const therapist = await actorByEmail(SEEDED.therapist);
    const idempotencyKey = `reuse-${patientId}`;
    await chartReadingOperation.invoke(appDb(), therapist, {
      patientId,
      takenAt: minutesAgo(2),
      spo2: 94,
      device: "hfnc",
      flow: 40,
      fio2: 0.4,
      idempotencyKey,
    });
    const change = {
      patientId,
      settingsVersion: 1,
      toFio2: 0.35,
      toFlow: 40,
      reason: "wean" as const,
      rationale: "SpO2 98 %",
      appliedAt: minutesAgo(1),
      idempotencyKey,
    };
    await expect(
      recordAdjustmentOperation.invoke(appDb(), therapist, change),
    ).rejects.toBeInstanceOf(ConflictError);
    const count = (await appDb()("adjustments")
      .where({ patient_id: patientId })
      .count({ n: "*" })
      .first()) as { n: number };
    expect(Number(count.n)).toBe(0);
  });

  it("refuses a nurse on a high-flow device and anyone on a patient without an order", async () => {
    const { patientId } = await patientWithHfncOrder();
    const nurse = await actorByEmail(SEEDED.nurse);
    const change = {
      patientId,
      settingsVersion: 1,
      toFio2: 0.45,
      toFlow: 40,
      reason: "below_band" as const,
      rationale: "x".repeat(5),
      appliedAt: minutesAgo(1),
    };
    await expect(recordAdjustmentOperation.invoke(appDb(), nurse, change)).rejects.toBeInstanceOf(
      ForbiddenError,
    );
    const { patientId: noOrder } = await admitTestPatient();
    const therapist = await actorByEmail(SEEDED.therapist);
    await expect(
      recordAdjustmentOperation.invoke(appDb(), therapist, { ...change, patientId: noOrder }),
    ).rejects.toThrow(/no oxygen order in effect/i);
  });
});

describe("readings and blood gases", () => {
  it("charts a low-flow reading with its FiO2 marked as an estimate", async () => {
    const { patientId } = await admitTestPatient();
    const nurse = await actorByEmail(SEEDED.nurse);
    const reading = await chartReadingOperation.invoke(appDb(), nurse, {
      patientId,
      takenAt: minutesAgo(2),
      spo2: 93,
      respiratoryRate: 22,
      device: "nasal_cannula",
      flow: 2,
    });
    // Common practice rule of thumb: about 0.21 + 0.04 per L/min on a nasal cannula.
    expect(reading).toMatchObject({ fio2: 0.29, fio2Estimated: true, source: "manual" });
  });

  it("refuses out-of-range and missing values naming each field, and another unit's patient as not found", async () => {
    const { patientId } = await admitTestPatient();
    const nurse = await actorByEmail(SEEDED.nurse);
    const error = (await chartReadingOperation
      .invoke(appDb(), nurse, {
        patientId,
        takenAt: minutesAgo(2),
        spo2: 140,
        device: "hfnc",
      })
      .catch((e: unknown) => e)) as ValidationError;
    expect(error.fieldErrors?.spo2).toEqual(["SpO2 must be between 0 and 100 %."]);
    const missing = (await chartReadingOperation
      .invoke(appDb(), nurse, {
        patientId,
        takenAt: minutesAgo(2),
        spo2: 90,
        device: "hfnc",
      })
      .catch((e: unknown) => e)) as ValidationError;
    expect(Object.keys(missing.fieldErrors ?? {}).sort()).toEqual(["fio2", "flow"]);
    const { patientId: other } = await admitTestPatient("RESP");
    await expect(
      chartReadingOperation.invoke(appDb(), nurse, {
        patientId: other,
        takenAt: minutesAgo(2),
        spo2: 90,
        device: "room_air",
      }),
    ).rejects.toBeInstanceOf(NotFoundError);
  });

  it("stores a blood gas with its computed indices; a venous sample gets none", async () => {
    const { patientId } = await admitTestPatient();
    const therapist = await actorByEmail(SEEDED.therapist);
    const gas = await recordBloodGasOperation.invoke(appDb(), therapist, {
      patientId,
      sampledAt: minutesAgo(5),
      sampleType: "arterial",
      pao2: 80,
      paco2: 40,
      hemoglobin: 14,
      sao2: 95,
      device: "invasive",
      fio2: 0.4,
      peep: 8,
    });
    // P/F = PaO2 / FiO2 (Berlin definition, 2012): 80 / 0.4 = 200.
    expect(gas.assessment?.indices.pfRatio.value).toBeCloseTo(200, 9);
    const row = (await appDb()("blood_gases").where({ id: gas.id }).first()) as {
      pf_ratio: number;
      cao2_ml_dl: number;
      indices_json: string;
    };
    expect(row.pf_ratio).toBe(200);
    // CaO2 = 1.34·Hb·SaO2 + 0.003·PaO2 = 1.34·14·0.95 + 0.24 = 18.06 mL/dL (content equation).
    expect(row.cao2_ml_dl).toBeCloseTo(18.1, 1);
    expect(JSON.parse(row.indices_json)).toHaveProperty("classification");

    const venous = await recordBloodGasOperation.invoke(appDb(), therapist, {
      patientId,
      sampledAt: minutesAgo(4),
      sampleType: "venous",
      pao2: 40,
      paco2: 46,
      device: "invasive",
      fio2: 0.4,
      peep: 8,
    });
    expect(venous.assessment).toBeNull();
  });
});

describe("ledger reads", () => {
  it("shows a nurse only her units' rows, and exports CSV with escaped text", async () => {
    const { patientId: micuPatient } = await admitTestPatient("MICU");
    const { patientId: respPatient } = await admitTestPatient("RESP");
    const physician = await actorByEmail(SEEDED.physician);
    await chartReadingOperation.invoke(appDb(), physician, {
      patientId: micuPatient,
      takenAt: minutesAgo(1),
      spo2: 95,
      device: "room_air",
    });
    await chartReadingOperation.invoke(appDb(), physician, {
      patientId: respPatient,
      takenAt: minutesAgo(1),
      spo2: 95,
      device: "room_air",
    });
    const nurse = await actorByEmail(SEEDED.nurse); // MICU only
    const micu = await listLedger(appDb(), nurse, { patientId: micuPatient, limit: 50 });
    const resp = await listLedger(appDb(), nurse, { patientId: respPatient, limit: 50 });
    expect(micu.entries).toHaveLength(1);
    expect(resp.entries).toHaveLength(0);
    const admin = await listLedger(appDb(), nurse, { action: "user.create", limit: 50 });
    expect(admin.entries).toHaveLength(0);

    let csv = "";
    for await (const chunk of ledgerCsv(appDb(), nurse, { patientId: micuPatient })) csv += chunk;
    const lines = csv.trim().split("\r\n");
    expect(lines[0]).toMatch(/^id,occurred_at_utc,actor,/);
    expect(lines).toHaveLength(2);
    expect(lines[1]).toContain('"{""id"":'); // JSON quoted per RFC 4180
    expect((await verifyLedger(appDb())).ok).toBe(true);
  });
});
