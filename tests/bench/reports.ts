/**
 * Reports benchmark: one unit of 60 beds over 30 days — 60 admissions with
 * stays, orders, a manual reading an hour, six adjustments and four alerts a
 * day, and the rollups a fully monitored unit would have (an hour row per bed
 * and hour, a minute row per bed and minute: 2.6 M minute rows). Measures
 * `loadReport` in-process (the function the GET routes call, without HTTP)
 * for each report, grouped by shift, with the shift start on the hour and at
 * half past (where every shift boundary reads minute rows).
 * Run on demand: `DATABASE_NAME=tidemark_test_… npm run bench:reports` on a
 * migrated database; it adds its own unit and leaves it there.
 * Not included: the raw 1 Hz readings (no report reads them; the orders
 * report reads manual readings through readings_manual_index).
 */
import "../../lib/local-env";
import { randomUUID } from "node:crypto";
import { db, closeDb } from "../../lib/db";
import { loadReport } from "../../lib/reports/queries";
import { REPORT_KINDS } from "../../lib/reports/types";

const BEDS = 60;
const DAYS = 30;
const SAMPLES = 20;
const END = new Date("2026-11-01T00:00:00Z");
const START = new Date(END.getTime() - DAYS * 86_400_000);

async function build() {
  const knex = db();
  const tag = randomUUID().slice(0, 6).toUpperCase();
  const [unitId] = await knex("units").insert({
    code: `BR${tag}`,
    name: `Bench ${tag}`,
    kind: "icu",
    time_zone: "Europe/Amsterdam",
    shift_start: "07:00",
    shift_hours: 12,
  });
  const user = (await knex("users").first("id")) as { id: number };
  const start = START.toISOString().slice(0, 19).replace("T", " ");
  for (let b = 0; b < BEDS; b++) {
    const [bedId] = await knex("beds").insert({ unit_id: unitId, label: `B${b + 1}` });
    const [patientId] = await knex("patients").insert({
      mrn: `BR${tag}${b}`,
      family_name: `Bench${b}`,
      given_name: "Test",
      birth_date: "1960-01-01",
      sex: "female",
    });
    const [admissionId] = await knex("admissions").insert({
      patient_id: patientId,
      bed_id: bedId,
      admitted_at: START,
      discharged_at: END,
    });
    await knex("admission_stays").insert({
      admission_id: admissionId,
      patient_id: patientId,
      bed_id: bedId,
      unit_id: unitId,
      started_at: START,
      ended_at: END,
    });
    const [orderId] = await knex("orders").insert({
      patient_id: patientId,
      admission_id: admissionId,
      unit_id: unitId,
      status: "discontinued",
      device: "venturi_mask",
      spo2_lower_pct: 92,
      spo2_upper_pct: 96,
      fio2_min: 0.24,
      fio2_max: 0.6,
      initial_fio2: 0.4,
      reassess_minutes: 60,
      rationale: "bench",
      entry_mode: "verbal",
      read_back_confirmed: true,
      entered_by: user.id,
      prescriber_id: user.id,
      cosigned_by: user.id,
      cosigned_at: new Date(START.getTime() + 600_000),
      discontinued_at: END,
      created_at: START,
      updated_at: END,
    });
    const ids = [patientId, admissionId, bedId, unitId].map(Number);
    const seq = (n: number) => `seq_0_to_${n - 1}`;
    await knex.raw(
      `INSERT INTO readings (patient_id, admission_id, taken_at, spo2_pct, device, fio2, source, recorded_by)
       SELECT ?, ?, ? + INTERVAL seq HOUR, 90 + seq % 8, 'venturi_mask', 0.4, 'manual', ? FROM ${seq(DAYS * 24)}`,
      [ids[0]!, ids[1]!, start, user.id],
    );
    await knex.raw(
      `INSERT INTO adjustments (patient_id, admission_id, order_id, device, from_fio2, to_fio2, reason, rationale,
         applied_at, recorded_by, engine_version, followed_proposal)
       SELECT ?, ?, ?, 'venturi_mask', 0.4, 0.45, 'other', 'bench', ? + INTERVAL seq * 4 HOUR + INTERVAL 17 MINUTE,
         ?, 'bench', IF(seq % 3 = 0, NULL, seq % 2) FROM ${seq(DAYS * 6)}`,
      [ids[0]!, ids[1]!, Number(orderId), start, user.id],
    );
    await knex.raw(
      `INSERT INTO alerts (patient_id, admission_id, unit_id, bed_id, kind, grade, state, started_at, opened_at,
         detail_json, acknowledged_at, resolved_at, escalation_level)
       SELECT ?, ?, ?, ?, 'below_band', 'routine', 'resolved', ? + INTERVAL seq * 6 HOUR,
         ? + INTERVAL seq * 6 HOUR + INTERVAL 1 MINUTE, '{}', ? + INTERVAL seq * 6 HOUR + INTERVAL 5 MINUTE,
         ? + INTERVAL seq * 6 HOUR + INTERVAL 30 MINUTE, seq % 5 = 0 FROM ${seq(DAYS * 4)}`,
      [ids[0]!, ids[1]!, ids[3]!, ids[2]!, start, start, start, start],
    );
    const measures = `below_ms, in_band_ms, above_ms, below88_ms, below85_ms, below_area_pct_s, min_spo2_pct, o2_ms,
      fio2_excess_s, fio2_high_ms`;
    await knex.raw(
      `INSERT INTO rollup_minutes (patient_id, admission_id, bed_id, unit_id, minute_at, ${measures})
       SELECT ?, ?, ?, ?, ? + INTERVAL seq MINUTE, 6000, 48000, 6000, 1000, 0, 12, 90, 60000, 11.4, 0
         FROM ${seq(DAYS * 1440)}`,
      [...ids, start],
    );
    await knex.raw(
      `INSERT INTO rollup_hours (patient_id, admission_id, bed_id, unit_id, hour_at, ${measures})
       SELECT ?, ?, ?, ?, ? + INTERVAL seq HOUR, 360000, 2880000, 360000, 60000, 0, 720, 90, 3600000, 684, 0
         FROM ${seq(DAYS * 24)}`,
      [...ids, start],
    );
  }
  return Number(unitId);
}

async function main() {
  const unitId = await build();
  const knex = db();
  for (const shiftStart of ["07:00", "07:30"]) {
    await knex("units").where({ id: unitId }).update({ shift_start: shiftStart });
    for (const kind of REPORT_KINDS) {
      const params = { unitId, from: START, to: END, groupBy: "shift" as const };
      await loadReport(knex, kind, params, END);
      const times: number[] = [];
      for (let i = 0; i < SAMPLES; i++) {
        const t0 = performance.now();
        await loadReport(knex, kind, params, END);
        times.push(performance.now() - t0);
      }
      times.sort((a, b) => a - b);
      const q = (p: number) => times[Math.min(times.length - 1, Math.floor(p * times.length))]!;
      console.log(
        `shift start ${shiftStart} ${kind.padEnd(16)} p50 ${q(0.5).toFixed(1)} ms, p95 ${q(0.95).toFixed(1)} ms`,
      );
    }
  }
  await closeDb();
}

void main();
