import { recordAdjustmentOperation } from "@/lib/adjustments/operations";
import { recordBloodGasOperation } from "@/lib/blood-gases/operations";
import { discontinueOrderOperation, writeOrderOperation } from "@/lib/orders/operations";
import { chartReadingOperation } from "@/lib/readings/operations";
import { afterAll, describe, expect, it } from "vitest";
import { closeDb } from "@/lib/db";
import { NotFoundError, ValidationError } from "@/lib/errors";
import type { OrderInput } from "@/lib/orders/schema";
import { listTimeline, type TimelineItem } from "@/lib/chart/timeline";
import { getTrend, TREND_MAX_POINTS } from "@/lib/chart/trend";
import { actorByEmail, admitTestPatient, appDb, SEEDED } from "../helpers/db";

afterAll(async () => {
  await closeDb();
});

const minutesAgo = (m: number) => new Date(Date.now() - m * 60_000);

async function admissionOf(patientId: number): Promise<number> {
  const row = (await appDb()("admissions")
    .where({ patient_id: patientId })
    .whereNull("discharged_at")
    .first("id")) as {
    id: number;
  };
  return row.id;
}

/** Readings written straight into the table, many at the same millisecond, to test ties. */
async function insertReadings(
  patientId: number,
  times: Date[],
  spo2 = (i: number) => 94 - (i % 3),
) {
  const admissionId = await admissionOf(patientId);
  const rows = times.map((t, i) => ({
    patient_id: patientId,
    admission_id: admissionId,
    taken_at: t,
    spo2_pct: spo2(i),
    device: "hfnc",
    fio2: 0.4,
    flow_l_min: 40,
    source: "monitor",
  }));
  for (let i = 0; i < rows.length; i += 500)
    await appDb()("readings").insert(rows.slice(i, i + 500));
}

async function patientWithCare() {
  const { patientId } = await admitTestPatient("MICU");
  const physician = await actorByEmail(SEEDED.physician);
  const therapist = await actorByEmail(SEEDED.therapist);
  const nurse = await actorByEmail(SEEDED.nurse);
  const order = await writeOrderOperation.invoke(
    appDb(),
    physician,
    {
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
    } as OrderInput,
    minutesAgo(30),
  );
  await chartReadingOperation.invoke(appDb(), nurse, {
    patientId,
    takenAt: minutesAgo(20).toISOString(),
    spo2: 89,
    respiratoryRate: 24,
    device: "hfnc",
    flow: 40,
    fio2: 0.4,
  });
  await recordBloodGasOperation.invoke(appDb(), therapist, {
    patientId,
    sampledAt: minutesAgo(15).toISOString(),
    sampleType: "arterial",
    pao2: 58,
    paco2: 38,
    hemoglobin: 12,
    device: "hfnc",
    flow: 40,
    fio2: 0.4,
  });
  await recordAdjustmentOperation.invoke(appDb(), therapist, {
    patientId,
    settingsVersion: 1,
    toFio2: 0.5,
    toFlow: 50,
    reason: "below_band",
    rationale: "SpO2 89 % on 0.40",
    appliedAt: minutesAgo(10).toISOString(),
  });
  return { patientId, order, physician, therapist, nurse };
}

async function readAll(patientId: number, limit: number, kinds?: TimelineItem["kind"][]) {
  const reviewer = await actorByEmail(SEEDED.reviewer);
  const seen: TimelineItem[] = [];
  let before: string | undefined;
  for (let guard = 0; guard < 100; guard++) {
    const page = await listTimeline(appDb(), reviewer, patientId, {
      limit,
      ...(kinds ? { kinds } : {}),
      ...(before ? { before } : {}),
    });
    expect(page.items.length).toBeLessThanOrEqual(limit);
    seen.push(...page.items);
    if (!page.nextCursor) break;
    before = page.nextCursor;
  }
  return seen;
}

describe("the Chart's timeline", () => {
  it("merges orders, readings, gases and adjustments newest first with who entered each", async () => {
    const { patientId } = await patientWithCare();
    const nurse = await actorByEmail(SEEDED.nurse);
    const page = await listTimeline(appDb(), nurse, patientId, { limit: 50 });
    expect(page.items.map((i) => i.kind)).toEqual(["adjustment", "blood_gas", "reading", "order"]);
    expect(page.nextCursor).toBeNull();
    const [adjustment, gas, reading, order] = page.items;
    expect(adjustment).toMatchObject({
      who: "Jonah Pell",
      values: { fromFio2: 0.4, fio2: 0.5, flowLMin: 50 },
    });
    expect(adjustment!.summary).toContain("FiO2 0.40");
    expect(gas).toMatchObject({ values: { sampleType: "arterial", pao2MmHg: 58, paco2MmHg: 38 } });
    expect(gas!.summary).not.toMatch(/mmHg|kPa/);
    expect(reading).toMatchObject({ values: { spo2Pct: 89, respiratoryRatePerMin: 24 } });
    expect(order).toMatchObject({
      values: { status: "active", spo2LowerPct: 92, spo2UpperPct: 96 },
    });
    expect(order!.who).toBeTruthy();
  });

  it("pages through rows sharing one millisecond without gaps or repeats", async () => {
    const { patientId } = await patientWithCare();
    const same = minutesAgo(5);
    await insertReadings(patientId, [
      ...Array.from({ length: 13 }, () => same),
      ...Array.from({ length: 12 }, (_, i) => minutesAgo(30 + i)),
    ]);
    const all = await readAll(patientId, 200);
    const paged = await readAll(patientId, 4);
    expect(paged.map((i) => i.cursor)).toEqual(all.map((i) => i.cursor));
    expect(new Set(paged.map((i) => i.cursor)).size).toBe(all.length);
    expect(all).toHaveLength(29);
    for (let i = 1; i < all.length; i++) {
      expect(Date.parse(all[i - 1]!.at)).toBeGreaterThanOrEqual(Date.parse(all[i]!.at));
    }
  });

  it("says who discontinued an order, when and why", async () => {
    const { patientId, order, physician } = await patientWithCare();
    await discontinueOrderOperation.invoke(
      appDb(),
      physician,
      {
        orderId: order.id,
        version: order.version,
        reason: "Extubated to room air",
        password: "tidemark-demo",
      },
      minutesAgo(5),
    );
    const [item] = await readAll(patientId, 50, ["order"]);
    expect(item?.values.status).toBe("discontinued");
    expect(item?.discontinued).toMatchObject({
      by: physician.name,
      reason: "Extubated to room air",
    });
    expect(Date.parse(item!.discontinued!.at)).toBeGreaterThan(Date.parse(item!.at));
  });

  it("filters by kind", async () => {
    const { patientId } = await patientWithCare();
    await insertReadings(patientId, [minutesAgo(3), minutesAgo(4)]);
    const readings = await readAll(patientId, 2, ["reading"]);
    expect(readings.map((i) => i.kind)).toEqual(["reading", "reading", "reading"]);
    const mixed = await readAll(patientId, 50, ["order", "blood_gas"]);
    expect(mixed.map((i) => i.kind).sort()).toEqual(["blood_gas", "order"]);
  });

  it("answers another unit's patient as not found and refuses a forged cursor", async () => {
    const { patientId } = await patientWithCare();
    // A RESP-only nurse of the demo scenario.
    const outsider = await actorByEmail("greta.sorensen@kestrel.example");
    await expect(listTimeline(appDb(), outsider, patientId, { limit: 10 })).rejects.toBeInstanceOf(
      NotFoundError,
    );
    await expect(
      getTrend(appDb(), outsider, patientId, { from: minutesAgo(60), to: new Date() }),
    ).rejects.toBeInstanceOf(NotFoundError);
    const reviewer = await actorByEmail(SEEDED.reviewer);
    await expect(
      listTimeline(appDb(), reviewer, patientId, { limit: 10, before: "yesterday|reading|x" }),
    ).rejects.toBeInstanceOf(ValidationError);
  });
});

describe("the Chart's trend", () => {
  it("shades the order's band, steps the settings and marks arterial gases", async () => {
    const { patientId, nurse } = await patientWithCare();
    const trend = await getTrend(appDb(), nurse, patientId, {
      from: minutesAgo(6 * 60),
      to: new Date(),
    });
    expect(trend.bands).toHaveLength(1);
    expect(trend.bands[0]).toMatchObject({ lowerPct: 92, upperPct: 96 });
    expect(trend.settings.map((s) => [s.cause, s.fio2, s.flowLMin])).toEqual([
      ["order", 0.4, 40],
      ["adjustment", 0.5, 50],
    ]);
    expect(trend.gases).toEqual([expect.objectContaining({ pao2MmHg: 58, pfRatio: 145 })]);
    expect(trend.spo2.map((p) => p.spo2Pct)).toEqual([89]);
    expect(trend.downsampled).toBe(false);
    // The range starts no earlier than the admission.
    expect(Date.parse(trend.from)).toBeGreaterThanOrEqual(Date.parse(trend.admittedAt));
  });

  it("thins a dense SpO2 series to the bound and keeps a one-reading dip", async () => {
    const { patientId, nurse } = await patientWithCare();
    const start = Date.now() - 55 * 60_000;
    const times = Array.from({ length: 3000 }, (_, i) => new Date(start + i * 1000));
    await insertReadings(patientId, times, (i) => (i === 1777 ? 79 : 95));
    const trend = await getTrend(appDb(), nurse, patientId, {
      from: minutesAgo(60),
      to: new Date(),
    });
    expect(trend.spo2Count).toBe(3001);
    expect(trend.downsampled).toBe(true);
    expect(trend.spo2.length).toBeLessThanOrEqual(TREND_MAX_POINTS);
    expect(trend.spo2.map((p) => p.spo2Pct)).toContain(79);
  });
});
