import { afterAll, describe, expect, it } from "vitest";
import { recordAdjustmentOperation } from "@/lib/adjustments/operations";
import { recordBloodGasOperation } from "@/lib/blood-gases/operations";
import { closeDb } from "@/lib/db";
import { NotFoundError } from "@/lib/errors";
import {
  readForecastAccuracyReportOperation,
  readPatientForecastAccuracyOperation,
} from "@/lib/forecast-accuracy/operations";
import { loadAdmissionForecastPairs } from "@/lib/forecast-accuracy/queries";
import { writeOrderOperation } from "@/lib/orders/operations";
import { actorByEmail, admitTestPatient, appDb, SEEDED } from "../helpers/db";
import { hfncOrder } from "../helpers/orders";

afterAll(async () => {
  await closeDb();
});

const T0 = Date.now();
const at = (minutesAgo: number) => new Date(T0 - minutesAgo * 60_000);

describe("forecast accountability", () => {
  it("pairs a change with the arterial gas 40 min later in both routes; an order change between them leaves the next one unchecked", async () => {
    const { patientId, unitId } = await admitTestPatient("MICU");
    // Admitted six hours ago, so the backdated care below lies within the stay.
    await appDb()("admissions")
      .where({ patient_id: patientId })
      .update({ admitted_at: at(360) });
    await appDb()("admission_stays")
      .where({ patient_id: patientId })
      .update({ started_at: at(360) });
    const physician = await actorByEmail(SEEDED.physician);
    const therapist = await actorByEmail(SEEDED.therapist);
    const order = await writeOrderOperation.invoke(
      appDb(),
      physician,
      hfncOrder(patientId),
      at(300),
    );
    const version = async () =>
      (
        (await appDb()("bedside_settings as s")
          .join("admissions as a", "a.id", "s.admission_id")
          .where("a.patient_id", patientId)
          .whereNull("a.discharged_at")
          .first("s.version")) as { version: number }
      ).version;
    const gas = (minutesAgo: number, pao2: number, fio2: number, sampleType = "arterial") =>
      recordBloodGasOperation.invoke(
        appDb(),
        therapist,
        {
          patientId,
          sampledAt: at(minutesAgo).toISOString(),
          sampleType,
          pao2,
          paco2: 40,
          hemoglobin: 12,
          device: "hfnc",
          flow: 40,
          fio2,
        },
        at(minutesAgo),
      );
    const change = async (minutesAgo: number, toFio2: number) =>
      recordAdjustmentOperation.invoke(
        appDb(),
        therapist,
        {
          patientId,
          settingsVersion: await version(),
          toFio2,
          toFlow: 40,
          reason: "below_band",
          rationale: "SpO2 below the band",
          appliedAt: at(minutesAgo).toISOString(),
        },
        at(minutesAgo),
      );

    await gas(280, 60, 0.4);
    const first = await change(240, 0.5);
    expect(first.forecast).not.toBeNull();
    await gas(200, 70, 0.5); // 40 min after the first change: its check
    // A new order (superseding the first) at 150 min ago, then a second change and its gas.
    await writeOrderOperation.invoke(
      appDb(),
      physician,
      hfncOrder(patientId, { supersedesOrderId: order.id, initialFio2: 0.5 }),
      at(150),
    );
    const second = await change(120, 0.55);
    await gas(80, 72, 0.55);
    // A third change, then the order is superseded again before its gas.
    const third = await change(60, 0.6);
    const current = (await appDb()("orders")
      .where({ patient_id: patientId, status: "active" })
      .first("id")) as { id: number };
    await writeOrderOperation.invoke(
      appDb(),
      physician,
      hfncOrder(patientId, { supersedesOrderId: current.id, initialFio2: 0.6 }),
      at(50),
    );
    await gas(30, 75, 0.6);

    const nurse = await actorByEmail(SEEDED.nurse);
    const mine = await readPatientForecastAccuracyOperation.invoke(appDb(), nurse, { patientId });
    expect(mine.pairs.map((p) => [p.adjustmentId, p.measured])).toEqual([
      [second.id, 72],
      [first.id, 70],
    ]);
    // One row per model, each error against the stored forecast.
    const pair = mine.pairs.find((p) => p.adjustmentId === first.id)!;
    for (const model of ["pf", "alveolarArterialRatio", "shunt"] as const) {
      const predicted = first.forecast!.models[model].pao2;
      expect(pair.models[model]).toEqual({
        predicted,
        measured: 70,
        error: predicted - 70,
        absoluteError: Math.abs(predicted - 70),
      });
    }
    // Constant P/F: 60 / 0.4 × 0.5 = 75 mmHg, so its error is +5.
    expect(pair.models.pf.predicted).toBeCloseTo(75, 6);
    expect(pair.minutesAfter).toBe(40);
    expect(mine.unchecked.map((u) => [u.adjustmentId, u.reason])).toEqual([
      [third.id, "order_changed"],
    ]);
    expect(mine.interval).toMatchObject({ pairs: 2, minPairs: 3, active: false });
    // What the adjustment form widens a new forecast with: the same pairs, oldest first.
    const forForm = await loadAdmissionForecastPairs(appDb(), mine.admissionId);
    expect(forForm.map((p) => p.adjustmentId)).toEqual([first.id, second.id]);
    expect(forForm[0]).toEqual(pair);

    const report = await readForecastAccuracyReportOperation.invoke(appDb(), nurse, {
      unitId: String(unitId),
      from: at(360).toISOString(),
      to: new Date(T0 + 60_000).toISOString(),
    });
    const ours = report.pairs.filter((p) => p.patientId === patientId);
    expect(ours.map((p) => p.adjustmentId)).toEqual([first.id, second.id]);
    expect(ours[0]!.models.pf).toEqual(pair.models.pf);
    expect(report.unchecked.filter((u) => u.patientId === patientId)).toHaveLength(1);
    expect(report.counts.checked).toBe(report.pairs.length);
  });

  it("answers 404 for another unit's patient and report", async () => {
    const { patientId, unitId } = await admitTestPatient("RESP");
    const micuOnly = await actorByEmail(SEEDED.nurse);
    await expect(
      readPatientForecastAccuracyOperation.invoke(appDb(), micuOnly, { patientId }),
    ).rejects.toBeInstanceOf(NotFoundError);
    await expect(
      readForecastAccuracyReportOperation.invoke(appDb(), micuOnly, {
        unitId: String(unitId),
        from: at(60).toISOString(),
        to: at(0).toISOString(),
      }),
    ).rejects.toBeInstanceOf(NotFoundError);
  });
});
