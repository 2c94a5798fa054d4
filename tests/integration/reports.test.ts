import { randomUUID } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Actor } from "@/lib/auth/actor";
import { loadActor } from "@/lib/auth/actor-queries";
import { hashPassword } from "@/lib/auth/password";
import { recordAdjustmentOperation } from "@/lib/adjustments/operations";
import { getBedsideContext } from "@/lib/chart/bedside";
import { closeDb } from "@/lib/db";
import { NotFoundError, ValidationError } from "@/lib/errors";
import { writeOrderOperation } from "@/lib/orders/operations";
import { chartReadingOperation } from "@/lib/readings/operations";
import {
  readAlertsReportOperation,
  readOrdersReportOperation,
  readOxygenExposureReportOperation,
  readTimeInBandReportOperation,
} from "@/lib/reports/operations";
import { loadReport } from "@/lib/reports/queries";
import { rebuildRollups } from "@/lib/rollups/store";
import { createStepTableOperation } from "@/lib/step-tables/operations";
import { actorByEmail, admitTestPatient, appDb, SEEDED, uniqueEmail } from "../helpers/db";
import { hfncOrder } from "../helpers/orders";

// A scratch unit (UTC, 12-hour shifts from 07:00) and a neighbour, with raw
// rows for one day, 2 Nov 2026 07:00 → 3 Nov 07:00, and the rollups rebuilt
// from them. Every expected number is worked out by hand in the comments.
//
// Patient A: on the unit from 05:00, bed A1 until 13:00, then bed A2 (same
// unit), discharged 21:00 → 840 min in the period.
//   Order A1 (written 05:00, superseded 10:00): band 92–96, PaO2 ≤ 100,
//   Venturi FiO2 0.41, reassess 240 min (a manual reading holds 4 h).
//   Order A2 (verbal 10:00, co-signed 10:30, discontinued 21:00): band 88–92,
//   no PaO2 band, Venturi 0.41, reassess 120 (a reading holds 2 h).
//   Manual readings: 90 at 07:00 → below 07–10 (180 min, area 2 × 180),
//   in band 10–11 (60); 95 on 0.41 at 11:00 → above 11–13 (120); 86 at 15:00
//   → below 15–17 (120, under 88, area 2 × 120). Unknown: 840 − 480 = 360.
//   Adjustments: 12:00 → 0.60 (followed the proposal), 18:00 → 0.30 (did not).
// Patient B: on the unit 09:00–15:00 (bed B1), then moved to the neighbour.
//   Order B1 (telephone 09:00, co-signed 09:10, active): band 92–96,
//   PaO2 ≤ 90, Venturi 0.60, reassess 60 (a reading holds 1 h).
//   Manual readings: 84 on 0.6 at 09:30 → below 09:30–10:30 (60, under 85,
//   area 8 × 60); 97 on 0.6 at 14:00 → above 14–15 (60); 80 at 16:00 (neighbour's).
//   Adjustment 10:15 → 0.50 (no proposal recorded). Unknown: 360 − 120 = 240.

const DAY = "2026-11-02";
const t = (hhmm: string, day = DAY) => new Date(`${day}T${hhmm}:00Z`);
const FROM = t("07:00");
const TO = t("07:00", "2026-11-03");
const NOW = new Date("2026-11-10T00:00:00Z");

let unitId: number;
let otherUnitId: number;
let member: Actor;
let outsider: Actor;
const beds: Record<string, number> = {};
const patients: Record<string, number> = {};
const admissions: Record<string, number> = {};

async function freshUser(role: "physician" | "reviewer", unitIds: number[]): Promise<Actor> {
  const [id] = await appDb()("users").insert({
    email: uniqueEmail(`reports-${role}`),
    name: `Reports ${role}`,
    role,
    password_hash: await hashPassword("tidemark-demo"),
  });
  await appDb()("user_units").insert(unitIds.map((u) => ({ user_id: Number(id), unit_id: u })));
  return loadActor(appDb(), Number(id));
}

async function insertUnit(code: string): Promise<number> {
  const [id] = await appDb()("units").insert({
    code,
    name: `Reports ${code}`,
    kind: "icu",
    time_zone: "UTC",
    shift_start: "07:00",
    shift_hours: 12,
  });
  return Number(id);
}

beforeAll(async () => {
  const knex = appDb();
  const tag = randomUUID().slice(0, 6).toUpperCase();
  const physician = await actorByEmail(SEEDED.physician);
  unitId = await insertUnit(`R${tag}`);
  otherUnitId = await insertUnit(`S${tag}`);
  for (const [label, unit] of [
    ["A1", unitId],
    ["A2", unitId],
    ["B1", unitId],
    ["N1", otherUnitId],
  ] as const) {
    const [id] = await knex("beds").insert({ unit_id: unit, label });
    beds[label] = Number(id);
  }
  for (const [key, family] of [
    ["A", "Arden"],
    ["B", "Blythe"],
  ] as const) {
    const [id] = await knex("patients").insert({
      mrn: `RP${tag}${key}`,
      family_name: family,
      given_name: "Test",
      birth_date: "1960-01-01",
      sex: "female",
    });
    patients[key] = Number(id);
  }
  const [a] = await knex("admissions").insert({
    patient_id: patients.A,
    bed_id: beds.A2,
    admitted_at: t("05:00"),
    discharged_at: t("21:00"),
  });
  const [b] = await knex("admissions").insert({
    patient_id: patients.B,
    bed_id: beds.N1,
    admitted_at: t("09:00"),
  });
  admissions.A = Number(a);
  admissions.B = Number(b);
  await knex("admission_stays").insert([
    stay("A", "A1", unitId, "05:00", "13:00"),
    stay("A", "A2", unitId, "13:00", "21:00"),
    stay("B", "B1", unitId, "09:00", "15:00"),
    stay("B", "N1", otherUnitId, "15:00", null),
  ]);

  const order = (
    key: "A" | "B",
    o: {
      status: string;
      band: [number, number];
      pao2Upper: number | null;
      fio2: number;
      reassess: number;
      mode: "written" | "verbal" | "telephone";
      created: string;
      cosigned?: string;
      ended?: string;
    },
  ) => ({
    patient_id: patients[key],
    admission_id: admissions[key],
    unit_id: unitId,
    status: o.status,
    device: "venturi_mask",
    spo2_lower_pct: o.band[0],
    spo2_upper_pct: o.band[1],
    pao2_lower_mmhg: o.pao2Upper === null ? null : 60,
    pao2_upper_mmhg: o.pao2Upper,
    fio2_min: 0.24,
    fio2_max: 0.6,
    initial_fio2: o.fio2,
    reassess_minutes: o.reassess,
    rationale: "report fixture",
    entry_mode: o.mode,
    read_back_confirmed: o.mode !== "written",
    entered_by: physician.id,
    prescriber_id: physician.id,
    cosigned_by: o.cosigned ? physician.id : null,
    cosigned_at: o.cosigned ? t(o.cosigned) : null,
    discontinued_at: o.status === "discontinued" && o.ended ? t(o.ended) : null,
    created_at: t(o.created),
    updated_at: t(o.ended ?? o.created),
  });
  const [a1] = await knex("orders").insert(
    order("A", {
      status: "superseded",
      band: [92, 96],
      pao2Upper: 100,
      fio2: 0.41,
      reassess: 240,
      mode: "written",
      created: "05:00",
      ended: "10:00",
    }),
  );
  const [a2] = await knex("orders").insert(
    order("A", {
      status: "discontinued",
      band: [88, 92],
      pao2Upper: null,
      fio2: 0.41,
      reassess: 120,
      mode: "verbal",
      created: "10:00",
      cosigned: "10:30",
      ended: "21:00",
    }),
  );
  const [b1] = await knex("orders").insert(
    order("B", {
      status: "active",
      band: [92, 96],
      pao2Upper: 90,
      fio2: 0.6,
      reassess: 60,
      mode: "telephone",
      created: "09:00",
      cosigned: "09:10",
    }),
  );
  void a1;

  const reading = (key: "A" | "B", at: string, spo2: number, fio2: number) => ({
    patient_id: patients[key],
    admission_id: admissions[key],
    taken_at: t(at),
    spo2_pct: spo2,
    device: "venturi_mask",
    fio2,
    source: "manual",
    recorded_by: physician.id,
  });
  await knex("readings").insert([
    reading("A", "07:00", 90, 0.41),
    reading("A", "11:00", 95, 0.41),
    reading("A", "15:00", 86, 0.41),
    reading("B", "09:30", 84, 0.6),
    reading("B", "14:00", 97, 0.6),
    reading("B", "16:00", 80, 0.5),
  ]);

  const gas = (key: "A" | "B", at: string, pao2: number) => ({
    patient_id: patients[key],
    admission_id: admissions[key],
    sampled_at: t(at),
    sample_type: "arterial",
    pao2_mmhg: pao2,
    paco2_mmhg: 40,
    device: "venturi_mask",
    fio2: 0.41,
    barometric_pressure_mmhg: 760,
    indices_json: "{}",
    engine_version: "test",
    recorded_by: physician.id,
  });
  await knex("blood_gases").insert([
    gas("A", "08:00", 110), // order A1, PaO2 ≤ 100: above
    gas("A", "12:00", 150), // order A2: no PaO2 band
    gas("B", "10:00", 85), // order B1, PaO2 ≤ 90: not above
    gas("B", "16:00", 200), // on the neighbour
  ]);

  const adjustment = (
    key: "A" | "B",
    orderId: number,
    at: string,
    fromFio2: number,
    toFio2: number,
    followed: boolean | null,
  ) => ({
    patient_id: patients[key],
    admission_id: admissions[key],
    order_id: orderId,
    device: "venturi_mask",
    from_fio2: fromFio2,
    to_fio2: toFio2,
    reason: "other",
    rationale: "report fixture",
    applied_at: t(at),
    recorded_by: physician.id,
    engine_version: "test",
    followed_proposal: followed,
  });
  await knex("adjustments").insert([
    adjustment("A", Number(a2), "12:00", 0.41, 0.6, true),
    adjustment("A", Number(a2), "18:00", 0.6, 0.3, false),
    adjustment("B", Number(b1), "10:15", 0.6, 0.5, null),
  ]);

  const alert = (
    key: "A" | "B",
    bed: string,
    kind: string,
    a: { started: string; opened: string; ack?: string; resolved?: string; escalated?: string },
  ) => ({
    patient_id: patients[key],
    admission_id: admissions[key],
    unit_id: bed === "N1" ? otherUnitId : unitId,
    bed_id: beds[bed],
    kind,
    grade: "routine",
    state: a.resolved ? "resolved" : a.ack ? "acknowledged" : "opened",
    escalation_level: a.escalated ? 1 : 0,
    started_at: t(a.started),
    opened_at: t(a.opened),
    detail_json: "{}",
    acknowledged_at: a.ack ? t(a.ack) : null,
    resolved_at: a.resolved ? t(a.resolved) : null,
    escalated_at: a.escalated ? t(a.escalated) : null,
  });
  await knex("alerts").insert([
    alert("A", "A1", "below_band", {
      started: "07:00",
      opened: "07:05",
      ack: "07:15",
      resolved: "10:00",
      escalated: "07:20",
    }),
    alert("B", "B1", "below_band", {
      started: "09:30",
      opened: "09:32",
      ack: "09:40",
      resolved: "10:30",
    }),
    alert("A", "A1", "above_band", {
      started: "11:00",
      opened: "11:05",
      ack: "11:35",
      resolved: "12:10",
    }),
    alert("B", "N1", "above_band", { started: "16:00", opened: "16:05" }),
    alert("A", "A2", "reassessment_overdue", { started: "20:00", opened: "20:00" }),
  ]);

  await rebuildRollups(knex, {
    from: t("00:00"),
    to: t("12:00", "2026-11-03"),
    admissionIds: [admissions.A!, admissions.B!],
  });
  member = await freshUser("reviewer", [unitId]);
  outsider = await freshUser("physician", [otherUnitId]);
});

function stay(key: "A" | "B", bed: string, unit: number, from: string, to: string | null) {
  return {
    admission_id: admissions[key],
    patient_id: patients[key],
    bed_id: beds[bed],
    unit_id: unit,
    started_at: t(from),
    ended_at: to ? t(to) : null,
  };
}

afterAll(async () => {
  await closeDb();
});

const params = (groupBy: "patient" | "bed" | "shift" | "day") => ({
  unitId,
  from: FROM,
  to: TO,
  groupBy,
});

describe("the time-in-band report", () => {
  it("sums the unit's patient time from the rollups", async () => {
    const report = await loadReport(appDb(), "time-in-band", params("patient"), NOW);
    expect(report.summary).toEqual({
      patientMinutes: 1200,
      belowMinutes: 360,
      inBandMinutes: 60,
      aboveMinutes: 180,
      unknownMinutes: 600,
      below: 0.3,
      inBand: 0.05,
      above: 0.15,
      unknown: 0.5,
      below88Minutes: 180,
      below85Minutes: 60,
      belowAreaPctMin: 1080,
      minSpo2: 84,
      gasesAbovePao2Band: 1,
      gasesWithPao2Band: 2,
    });
    expect(report.period).toMatchObject({ unitId, timeZone: "UTC", groupBy: "patient" });
    expect(report.basis.map((b) => b.key)).toContain("inBand");
    expect(report.basis.find((b) => b.key === "inBand")!.source).toContain("e000843");
    expect(
      report.rows.map((r) => [r.label, r.bedLabel, r.patientMinutes, r.unknownMinutes]),
    ).toEqual([
      ["Arden, Test", "A2", 840, 360],
      ["Blythe, Test", "B1", 360, 240],
    ]);
  });

  it("groups by bed and by shift", async () => {
    const byBed = await loadReport(appDb(), "time-in-band", params("bed"), NOW);
    expect(
      byBed.rows.map((r) => [
        r.label,
        r.patientMinutes,
        r.belowMinutes,
        r.inBandMinutes,
        r.aboveMinutes,
      ]),
    ).toEqual([
      ["Bed A1", 360, 180, 60, 120],
      ["Bed A2", 480, 120, 0, 0],
      ["Bed B1", 360, 60, 0, 60],
    ]);
    const byShift = await loadReport(appDb(), "time-in-band", params("shift"), NOW);
    expect(
      byShift.rows.map((r) => [r.startsAt, r.patientMinutes, r.belowMinutes, r.unknownMinutes]),
    ).toEqual([
      ["2026-11-02T07:00:00.000Z", 1080, 360, 480],
      ["2026-11-02T19:00:00.000Z", 120, 0, 120],
    ]);
    const byDay = await loadReport(appDb(), "time-in-band", params("day"), NOW);
    expect(byDay.rows).toHaveLength(1);
    expect(byDay.rows[0]!.patientMinutes).toBe(1200);
  });
});

describe("shifts that start at half past", () => {
  it("sum the minute rollups of the hours a shift boundary cuts", async () => {
    // Shifts 19:30–07:30 and 07:30–19:30: the period's rows are 07:00–07:30
    // (A below), 07:30–19:30 (A below 07:30–10:00 and 15–17, B below 60 min)
    // and 19:30–07:00 (A until 21:00, nothing known).
    await appDb()("units").where({ id: unitId }).update({ shift_start: "07:30" });
    try {
      const report = await loadReport(appDb(), "time-in-band", params("shift"), NOW);
      expect(
        report.rows.map((r) => [r.startsAt, r.patientMinutes, r.belowMinutes, r.unknownMinutes]),
      ).toEqual([
        ["2026-11-01T19:30:00.000Z", 30, 30, 0],
        ["2026-11-02T07:30:00.000Z", 1080, 330, 510],
        ["2026-11-02T19:30:00.000Z", 90, 0, 90],
      ]);
    } finally {
      await appDb()("units").where({ id: unitId }).update({ shift_start: "07:00" });
    }
  });
});

describe("the oxygen exposure report", () => {
  it("integrates the applied FiO2 while on the unit", async () => {
    // Oxygen counts while a reading holds (07–11, 11–13, 15–17 for A; 09:30–10:30, 14–15 for B).
    // A: 0.41 07–12, 0.60 12–13 and 15–17 → 8 h; 5 × 0.20 + 3 × 0.39 = 2.17; 3 h ≥ 0.6.
    // B: 0.60 09:30–10:15, 0.50 10:15–10:30 and 14–15 → 2 h; 0.75 × 0.39 + 1.25 × 0.29 = 0.655;
    // 0.75 h ≥ 0.6. Together: 10 h, 2.825 FiO2-hours, 3.75 h ≥ 0.6.
    const report = await loadReport(appDb(), "oxygen-exposure", params("patient"), NOW);
    expect(report.summary).toEqual({
      patientDays: 0.8333,
      oxygenHours: 10,
      fio2HoursAboveRoomAir: 2.825,
      hoursAtFio2AtLeast60: 3.75,
      aboveOnOxygenMinutes: 180,
    });
  });
});

describe("the alerts report", () => {
  it("measures response over the unit's alerts", async () => {
    const report = await loadReport(appDb(), "alerts", params("shift"), NOW);
    expect(report.summary).toEqual({
      alerts: 4,
      patientDays: 0.8333,
      alertsPerPatientDay: 4.8,
      // 10, 8, 30
      toAcknowledge: { n: 3, median: 10, p90: 30 },
      // 175, 58, 65
      toResolve: { n: 3, median: 65, p90: 175 },
      escalationRate: 0.25,
      // B 09:30 → 10:15 (45); A 11:00 → 12:00 (60); A's 07:00 excursion resolved before any change.
      excursionToAdjustment: { n: 2, median: 52.5, p90: 60 },
    });
    expect(report.byKind.map((k) => [k.kind, k.alerts])).toEqual([
      ["above_band", 1],
      ["below_band", 2],
      ["reassessment_overdue", 1],
    ]);
    expect(report.rows.map((r) => [r.startsAt, r.alerts])).toEqual([
      ["2026-11-02T07:00:00.000Z", 3],
      ["2026-11-02T19:00:00.000Z", 1],
    ]);
  });
});

describe("the orders report", () => {
  it("measures co-signing, reassessments and adjustments", async () => {
    // Intervals: A1 05:00→07:00 on time; A2 11:00, 12:00 on time, 15:00, 18:00 late,
    // due at 20:00 late; B1 09:30, 10:15 on time, 14:00 late (16:00 and 17:00 are the neighbour's).
    const report = await loadReport(appDb(), "orders", params("patient"), NOW);
    expect(report.summary).toEqual({
      orders: 2,
      verbalOrders: 2,
      cosignDelay: { n: 2, median: 20, p90: 30 },
      reassessments: 9,
      reassessmentsOnTime: 0.5556,
      adjustments: 3,
      adjustmentsPerPatientDay: 3.6,
      followedProposal: 0.5,
      patientDays: 0.8333,
    });
  });
});

describe("the report reads", () => {
  const query = { unitId: 0, from: FROM.toISOString(), to: TO.toISOString(), groupBy: "bed" };

  it("answer the unit's members and 404 to others", async () => {
    const report = await readOrdersReportOperation.invoke(
      appDb(),
      member,
      { ...query, unitId },
      NOW,
    );
    expect(report.rows).toHaveLength(3);
    for (const op of [
      readTimeInBandReportOperation,
      readAlertsReportOperation,
      readOxygenExposureReportOperation,
      readOrdersReportOperation,
    ]) {
      await expect(op.invoke(appDb(), outsider, { ...query, unitId }, NOW)).rejects.toBeInstanceOf(
        NotFoundError,
      );
    }
  });

  it("name the field that is wrong", async () => {
    const fail = (raw: Record<string, unknown>) =>
      readTimeInBandReportOperation.invoke(appDb(), member, { ...query, unitId, ...raw }, NOW).then(
        () => new ValidationError("accepted"),
        (e: unknown) => e as ValidationError,
      );
    const backwards = await fail({ from: TO.toISOString(), to: FROM.toISOString() });
    expect(backwards).toBeInstanceOf(ValidationError);
    expect(backwards.fieldErrors?.to).toEqual(["to must be after from."]);
    const long = await fail({ to: "2027-03-01T00:00:00Z" });
    expect(long.fieldErrors?.to).toEqual(["The period may span at most 93 days."]);
    const group = await fail({ groupBy: "ward" });
    expect(group.fieldErrors?.groupBy?.[0]).toBe(
      "groupBy must be one of patient, bed, shift, day.",
    );
    const unit = await fail({ unitId: "x" });
    expect(unit.fieldErrors?.unitId?.[0]).toBe("unitId must be a positive whole number.");
    const time = await fail({ from: "yesterday" });
    expect(time.fieldErrors?.from?.[0]).toMatch(/^from must be an ISO 8601 time/);
  });
});

describe("an adjustment records whether it followed the proposal", () => {
  it("true for the proposed step, false for another", async () => {
    const admin = await actorByEmail(SEEDED.admin);
    const physician = await actorByEmail(SEEDED.physician);
    const therapist = await actorByEmail(SEEDED.therapist);
    const { patientId, unitId: micu } = await admitTestPatient("MICU");
    const ladder = await createStepTableOperation.invoke(appDb(), admin, {
      unitId: micu,
      name: `Report ladder ${patientId}`,
      kind: "flow_fio2",
      source: "Unit protocol (invented for tests)",
      rows: [
        { fio2Min: 0.3, fio2Max: 0.3, flow: 30 },
        { fio2Min: 0.4, fio2Max: 0.4, flow: 40 },
        { fio2Min: 0.5, fio2Max: 0.5, flow: 50 },
        { fio2Min: 0.6, fio2Max: 0.6, flow: 60 },
      ],
      rationale: "unit ladder for a test",
    });
    await writeOrderOperation.invoke(
      appDb(),
      physician,
      hfncOrder(patientId, { stepTableId: ladder.id }),
    );
    const chart = async (minutesAgo: number, fio2: number, flow: number) => {
      const takenAt = new Date(Date.now() - minutesAgo * 60_000);
      await chartReadingOperation.invoke(appDb(), therapist, {
        patientId,
        takenAt: takenAt.toISOString(),
        spo2: 89,
        device: "hfnc",
        fio2,
        flow,
      });
    };
    await chart(10, 0.4, 40);
    const before = await getBedsideContext(appDb(), therapist, patientId);
    expect(before.proposal?.step).toMatchObject({ fio2: 0.5, flow: 50 });
    const followed = await recordAdjustmentOperation.invoke(appDb(), therapist, {
      patientId,
      settingsVersion: 1,
      toFio2: 0.5,
      toFlow: 50,
      reason: "below_band",
      rationale: "SpO2 89 % on 0.40",
      appliedAt: new Date(Date.now() - 8 * 60_000).toISOString(),
    });
    await chart(5, 0.5, 50);
    const other = await recordAdjustmentOperation.invoke(appDb(), therapist, {
      patientId,
      settingsVersion: 2,
      toFio2: 0.55,
      toFlow: 50,
      reason: "below_band",
      rationale: "SpO2 89 % on 0.50",
      appliedAt: new Date(Date.now() - 60_000).toISOString(),
    });
    const rows = (await appDb()("adjustments")
      .whereIn("id", [followed.id, other.id])
      .orderBy("id")
      .select("followed_proposal")) as { followed_proposal: number | null }[];
    expect(rows.map((r) => r.followed_proposal)).toEqual([1, 0]);
  });
});
