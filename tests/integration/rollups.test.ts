import { randomUUID } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { recordAdjustmentOperation } from "@/lib/adjustments/operations";
import { dischargeOperation, transferOperation } from "@/lib/admissions/operations";
import type { Actor } from "@/lib/auth/actor";
import { closeDb } from "@/lib/db";
import { confirmImportOperation, previewUpload } from "@/lib/imports/operations";
import type { UploadInput } from "@/lib/imports/service";
import { writeOrderOperation } from "@/lib/orders/operations";
import { chartReadingOperation } from "@/lib/readings/operations";
import { loadBands } from "@/lib/rollups/bands";
import { loadRollupPieces } from "@/lib/rollups/pieces";
import { rebuildRollups } from "@/lib/rollups/store";
import { loadStaySummary } from "@/lib/rollups/summary";
import { timeInBandFromRollups } from "@/lib/rollups/time-in-band";
import { timeInBand } from "@/lib/time-in-band";
import { SEEDED, actorByEmail, admitTestPatient, appDb } from "../helpers/db";
import { hfncOrder } from "../helpers/orders";

// The rollups are kept by the services in the transaction of each write; here
// a patient's whole stay is written through them (orders, charted readings, a
// monitor import, an adjustment, a move and a discharge) and the rows they
// left are compared with a rebuild from the raw rows and with the time-in-band
// rules run over the raw series.

let nurse: Actor;
let therapist: Actor;
let physician: Actor;
const MIN = 60_000;

beforeAll(async () => {
  [nurse, therapist, physician] = await Promise.all([
    actorByEmail(SEEDED.nurse),
    actorByEmail(SEEDED.therapist),
    actorByEmail(SEEDED.physician),
  ]);
});

afterAll(async () => {
  await closeDb();
});

type Stored = Record<string, unknown>;
async function storedRows(admissionId: number): Promise<{ minutes: Stored[]; hours: Stored[] }> {
  const knex = appDb();
  const clean = (rows: Stored[]) =>
    rows.map((r) => ({
      ...r,
      below_area_pct_s: Number(Number(r.below_area_pct_s).toFixed(6)),
      fio2_excess_s: Number(Number(r.fio2_excess_s).toFixed(6)),
    }));
  return {
    minutes: clean(
      (await knex("rollup_minutes")
        .where({ admission_id: admissionId })
        .orderBy("minute_at")) as Stored[],
    ),
    hours: clean(
      (await knex("rollup_slots")
        .where({ admission_id: admissionId })
        .orderBy(["slot_at", "bed_id"])) as Stored[],
    ),
  };
}

/** The rows a rebuild from the raw rows leaves, after deleting what the services kept. */
async function rebuiltFromRaw(
  admissionId: number,
  since: number,
  until = Date.now() + 5 * 3600_000,
) {
  const knex = appDb();
  await knex("rollup_minutes").where({ admission_id: admissionId }).delete();
  await knex("rollup_slots").where({ admission_id: admissionId }).delete();
  await rebuildRollups(knex, {
    from: new Date(since - 4 * 3600_000),
    to: new Date(until),
    admissionIds: [admissionId],
  });
  return storedRows(admissionId);
}

async function rawSeries(admissionId: number) {
  const rows = (await appDb()("readings")
    .where({ admission_id: admissionId })
    .select("taken_at", "spo2_pct", "fio2", "flow_l_min", "source")) as {
    taken_at: Date;
    spo2_pct: number;
    fio2: number;
    flow_l_min: number | null;
    source: "manual" | "monitor";
  }[];
  return rows.map((r) => ({
    at: r.taken_at,
    spo2: Number(r.spo2_pct),
    fio2: Number(r.fio2),
    flow: r.flow_l_min,
    source: r.source,
  }));
}

async function settingsVersion(admissionId: number): Promise<number> {
  const row = (await appDb()("bedside_settings")
    .where({ admission_id: admissionId })
    .first("version")) as { version: number };
  return row.version;
}

describe("rollups kept on write", () => {
  it("equal a rebuild from the raw rows and the time-in-band rules over a whole stay", async () => {
    const knex = appDb();
    const { patientId, unitId, bedId } = await admitTestPatient("MICU");
    const admission = (await knex("admissions").where({ patient_id: patientId }).first("id")) as {
      id: number;
    };
    const start = Date.now();
    await knex("admissions")
      .where({ id: admission.id })
      .update({ admitted_at: new Date(start - 3 * 3600_000) });
    const { mrn } = (await knex("patients").where({ id: patientId }).first("mrn")) as {
      mrn: string;
    };
    const { label } = (await knex("beds").where({ id: bedId }).first("label")) as {
      label: string;
    };

    // An order (92–96 %), two charted values, an hour of 1 Hz monitor data.
    await writeOrderOperation.invoke(knex, physician, hfncOrder(patientId));
    const chart = (at: number, spo2: number) =>
      chartReadingOperation.invoke(
        knex,
        nurse,
        {
          patientId,
          takenAt: new Date(at).toISOString(),
          spo2,
          device: "hfnc",
          fio2: 0.4,
          flow: 40,
        },
        new Date(at),
      );
    await chart(start + 1000, 95);
    const monitorFrom = start + 20 * MIN + 500;
    const values = Array.from({ length: 1200 }, (_, i) =>
      i < 300 ? 94 : i < 600 ? 86 : i < 700 ? 83 : 99,
    );
    const csv = [
      "time,spo2",
      ...values
        .map((v, i) => [v, monitorFrom + i * 1000] as const)
        // A probe-off gap of two minutes.
        .filter(([, t]) => t < monitorFrom + 800_000 || t >= monitorFrom + 920_000)
        .map(([v, t]) => `${new Date(t).toISOString()},${v}`),
    ].join("\n");
    const importAt = new Date(monitorFrom + 1200_000);
    const preview = await previewUpload(
      knex,
      therapist,
      { kind: "monitor_csv", unitId, fileName: "stay.csv", mrn, bed: label } as UploadInput,
      Buffer.from(csv, "utf8"),
      importAt,
    );
    await confirmImportOperation.invoke(
      knex,
      therapist,
      { importId: preview.id, expectedAccepted: preview.counts.accepted },
      importAt,
    );
    // A charted value in the middle of the monitor series, charted late.
    await chart(monitorFrom + 450_500, 88);
    // The therapist turns FiO2 up, then a new order narrows the band.
    await recordAdjustmentOperation.invoke(knex, therapist, {
      patientId,
      settingsVersion: await settingsVersion(admission.id),
      toFio2: 0.6,
      toFlow: 50,
      reason: "below_band",
      rationale: "Desaturation on the monitor",
      appliedAt: new Date().toISOString(),
    });
    const current = (await knex("orders")
      .where({ patient_id: patientId, status: "active" })
      .first("id")) as { id: number };
    await writeOrderOperation.invoke(
      knex,
      physician,
      hfncOrder(patientId, {
        spo2Lower: 94,
        spo2Upper: 98,
        rationale: "Narrower band",
        supersedesOrderId: current.id,
      }),
    );
    // Moved to another bed, then discharged.
    const [toBed] = await knex("beds").insert({
      unit_id: unitId,
      label: `R${randomUUID().slice(0, 6)}`,
      sort_order: 901,
    });
    await transferOperation.invoke(knex, physician, {
      admissionId: admission.id,
      bedId: Number(toBed),
      rationale: "Closer to the station",
      idempotencyKey: randomUUID(),
    });
    await chart(Date.now(), 93);
    const kept = await storedRows(admission.id);
    expect(kept.minutes.length).toBeGreaterThan(20);
    expect(new Set(kept.minutes.map((m) => m.bed_id))).toEqual(new Set([bedId, Number(toBed)]));

    expect(await rebuiltFromRaw(admission.id, start)).toEqual(kept);

    // The rollups' time in band over the stay so far is the rules' answer on the raw rows.
    const from = new Date(Math.floor(start / MIN) * MIN);
    const to = new Date(Math.ceil((Date.now() + 2 * 3600_000) / MIN) * MIN);
    const rolled = (await timeInBandFromRollups(knex, [admission.id], from, to)).get(admission.id)!;
    const { bands } = await loadBands(knex, admission.id);
    const raw = timeInBand({ readings: await rawSeries(admission.id), bands, from, to });
    expect(rolled.ms.below).toBe(raw.ms.below);
    expect(rolled.ms.inBand).toBe(raw.ms.inBand);
    expect(rolled.ms.above).toBe(raw.ms.above);
    expect(raw.ms.below).toBeGreaterThan(0);
    expect(raw.ms.above).toBeGreaterThan(0);

    // Discharge ends the stay: nothing counts after it.
    const dischargedAt = new Date();
    await dischargeOperation.invoke(knex, physician, {
      admissionId: admission.id,
      disposition: "home",
      dischargedAt: dischargedAt.toISOString(),
      idempotencyKey: randomUUID(),
    });
    const after = await storedRows(admission.id);
    const lastMinute = Math.max(...after.minutes.map((m) => (m.minute_at as Date).getTime()));
    expect(lastMinute).toBeLessThanOrEqual(dischargedAt.getTime());
    expect(await rebuiltFromRaw(admission.id, start)).toEqual(after);

    // The Chart's summary of the stay reads the same rows, to discharge.
    const admitted = (await knex("admissions").where({ id: admission.id }).first()) as {
      admitted_at: Date;
      discharged_at: Date;
    };
    const windows = await loadStaySummary(knex, {
      id: admission.id,
      admittedAt: admitted.admitted_at,
      dischargedAt: admitted.discharged_at,
    });
    const stay = windows.find((w) => w.label === "This stay")!;
    expect(stay.to).toBe(new Date(Math.ceil(dischargedAt.getTime() / MIN) * MIN).toISOString());
    expect(
      stay.belowMinutes + stay.inBandMinutes + stay.aboveMinutes + stay.unknownMinutes,
    ).toBeCloseTo(stay.windowMinutes, 9);
    const sums = (await knex("rollup_minutes")
      .where({ admission_id: admission.id })
      .sum({ below: "below_ms", excess: "fio2_excess_s" })
      .first()) as { below: number | string; excess: number };
    expect(stay.belowMinutes).toBeCloseTo(Number(sums.below) / MIN, 9);
    expect(stay.fio2HoursAboveRoomAir).toBeCloseTo(Number(sums.excess) / 3600, 9);
    expect(stay.windowMinutes).toBeGreaterThan(3 * 60);
  });

  it("after a monitor file longer than a refresh window (13 h), equal a rebuild and the rules", async () => {
    const knex = appDb();
    const { patientId, unitId, bedId } = await admitTestPatient("MICU");
    const { mrn } = (await knex("patients").where({ id: patientId }).first("mrn")) as {
      mrn: string;
    };
    const { label } = (await knex("beds").where({ id: bedId }).first("label")) as {
      label: string;
    };
    const admission = (await knex("admissions").where({ patient_id: patientId }).first("id")) as {
      id: number;
    };
    await writeOrderOperation.invoke(knex, physician, hfncOrder(patientId));
    // A sample every 10 s for 13 h, in, below and above the 92–96 % band, in
    // several insert batches; the rollups are refreshed 6 h at a time from the
    // first sample's half hour, so a probe-off gap straddles the first window
    // edge and the series runs on unbroken across the second.
    const first = Date.now() + MIN + 250;
    const edge = Math.floor(first / (30 * MIN)) * 30 * MIN + 6 * 3600_000;
    const pattern = [94, 95, 90, 86, 97, 99, 93];
    const rows: string[] = [];
    for (let i = 0; i < 13 * 360; i++) {
      const t = first + i * 10_000;
      if (t > edge - 90_000 && t < edge + 75_000) continue;
      rows.push(`${new Date(t).toISOString()},${pattern[Math.floor(i / 37) % 7]}`);
    }
    const last = first + (13 * 360 - 1) * 10_000;
    const importAt = new Date(last + MIN);
    const preview = await previewUpload(
      knex,
      therapist,
      { kind: "monitor_csv", unitId, fileName: "long.csv", mrn, bed: label } as UploadInput,
      Buffer.from(["time,spo2", ...rows].join("\n"), "utf8"),
      importAt,
    );
    expect(preview.counts).toMatchObject({ accepted: rows.length, rejected: 0 });
    await confirmImportOperation.invoke(
      knex,
      therapist,
      { importId: preview.id, expectedAccepted: rows.length },
      importAt,
    );
    const kept = await storedRows(admission.id);
    const minuteAt = (m: Stored) => (m.minute_at as Date).getTime();
    expect(kept.minutes.some((m) => minuteAt(m) < edge - 5 * MIN)).toBe(true);
    expect(kept.minutes.some((m) => minuteAt(m) > edge + 6 * 3600_000)).toBe(true);
    expect(kept.minutes.length).toBeGreaterThan(13 * 60 - 10);

    const from = new Date(Math.floor(first / MIN) * MIN);
    const to = new Date(Math.ceil((last + 10 * MIN) / MIN) * MIN);
    const rolled = (await timeInBandFromRollups(knex, [admission.id], from, to)).get(admission.id)!;
    const { bands } = await loadBands(knex, admission.id);
    const raw = timeInBand({ readings: await rawSeries(admission.id), bands, from, to });
    expect(rolled.ms).toEqual(raw.ms);
    expect(raw.ms.below).toBeGreaterThan(0);
    expect(raw.ms.above).toBeGreaterThan(0);

    expect(await rebuiltFromRaw(admission.id, first, last + 3600_000)).toEqual(kept);
  });

  it("serves half-hour rows inside a window and minute rows at its edges and cuts, with the same sums", async () => {
    const knex = appDb();
    const { patientId } = await admitTestPatient("MICU");
    const admission = (await knex("admissions").where({ patient_id: patientId }).first("id")) as {
      id: number;
    };
    const t0 = Date.now() - 5 * 3600_000;
    await knex("admissions")
      .where({ id: admission.id })
      .update({ admitted_at: new Date(t0) });
    await writeOrderOperation.invoke(knex, physician, hfncOrder(patientId));
    for (let i = 0; i < 12; i++) {
      await chartReadingOperation.invoke(
        knex,
        nurse,
        {
          patientId,
          takenAt: new Date(Date.now() - 3 * 3600_000 + i * 15 * MIN).toISOString(),
          spo2: 88 + (i % 9),
          device: "hfnc",
          fio2: 0.4,
          flow: 40,
        },
        new Date(),
      );
    }
    const from = new Date(Math.floor((Date.now() - 4 * 3600_000) / MIN) * MIN + 7 * MIN);
    const to = new Date(Math.floor(Date.now() / MIN) * MIN + 60 * MIN);
    const cut = from.getTime() + 97 * MIN;
    const pieces = await loadRollupPieces(knex, {
      admissionIds: [admission.id],
      from,
      to,
      cuts: [cut],
    });
    expect(pieces.some((p) => p.ms === 1_800_000)).toBe(true);
    for (const p of pieces) {
      expect(p.at).toBeGreaterThanOrEqual(from.getTime());
      expect(p.at + p.ms).toBeLessThanOrEqual(to.getTime());
      // No piece straddles the cut.
      expect(p.at < cut && p.at + p.ms > cut).toBe(false);
    }
    const minutes = (await knex("rollup_minutes")
      .where({ admission_id: admission.id })
      .where("minute_at", ">=", from)
      .where("minute_at", "<", to)
      .select("below_ms", "in_band_ms", "above_ms")) as {
      below_ms: number;
      in_band_ms: number;
      above_ms: number;
    }[];
    const sum = (f: (x: { below: number; inBand: number; above: number }) => number) => ({
      pieces: pieces.reduce(
        (a, p) => a + f({ below: p.m.belowMs, inBand: p.m.inBandMs, above: p.m.aboveMs }),
        0,
      ),
      minutes: minutes.reduce(
        (a, m) => a + f({ below: m.below_ms, inBand: m.in_band_ms, above: m.above_ms }),
        0,
      ),
    });
    for (const f of [
      (x: { below: number }) => x.below,
      (x: { inBand: number }) => x.inBand,
      (x: { above: number }) => x.above,
    ]) {
      const s = sum(f as never);
      expect(s.pieces).toBe(s.minutes);
    }
  });
});
