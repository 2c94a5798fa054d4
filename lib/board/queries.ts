import type { Knex } from "knex";
import { openAlertsByAdmission, type AdmissionAlerts } from "../alerts/queries";
import { belowOximeterAccuracy } from "../oxygen/oximetry";
import { DEVICE_PROFILES, type Device } from "../devices";
import { ageInYears, initialsOf } from "../admissions/display";
import { timeInBandFromRollups } from "../rollups/time-in-band";
import { classifySpo2, type TimeInBand } from "../time-in-band";
import { unreadByNurse } from "../order-notices/queries";

export type BoardRow = {
  bedId: number;
  bedLabel: string;
  unitId: number;
  unitCode: string;
  patientId: number;
  patientInitials: string;
  patientAge: number;
  sex: "female" | "male";
  admittedAt: string;
  nurse: string | null;
  therapist: string | null;
  /** What is applied at the bedside now (bedside settings, else the order's device). */
  device: Device | null;
  deviceLabel: string | null;
  fio2: number | null;
  fio2Estimated: boolean;
  /** PEEP for devices that use it, flow for those that use flow; null otherwise. */
  peepCmH2o: number | null;
  flowLMin: number | null;
  /** The order in effect (active or awaiting co-sign), if any. */
  order: {
    id: number;
    status: "active" | "awaiting_cosign";
    lower: number;
    upper: number;
    reassessMinutes: number;
  } | null;
  /** The newest SpO2; `belowOximeterAccuracy` marks a value under the oximeter's stated accuracy (< 70 %). */
  latestSpo2: {
    pct: number;
    fio2: number;
    takenAt: string;
    source: "manual" | "monitor";
    belowOximeterAccuracy: boolean;
  } | null;
  /** The latest SpO2 against the band in effect; null without a reading or an order. */
  spo2Status: "in-band" | "below" | "above" | null;
  /** Share of the last 24 h (to the end of the minute in progress) below / in / above the band, and unknown, from the rollups. */
  timeInBand24h: { below: number; inBand: number; above: number; unknown: number };
  latestPf: { ratio: number; fio2Estimated: boolean; sampledAt: string } | null;
  lastReassessedAt: string | null;
  minutesSinceReassessment: number | null;
  overdue: boolean;
  /** Unresolved alerts of the admission, null when there are none. */
  alerts: AdmissionAlerts | null;
  /** The assigned nurse has not yet read the change that made the current order (lib/order-notices). */
  orderUnread: boolean;
};

export type BoardUnit = {
  unitId: number;
  unitCode: string;
  unitName: string;
  totalBeds: number;
  occupiedBeds: number;
};

/** What GET /api/v1/board answers and the Board page renders first. */
export type BoardData = { units: BoardUnit[]; beds: BoardRow[]; now: string };

/** The Board for the given units (the caller's, already checked), at `now`. */
export async function loadBoard(
  knex: Knex,
  unitIds: readonly number[],
  now: Date = new Date(),
): Promise<BoardData> {
  const [units, beds] = await Promise.all([
    summariseUnits(knex, unitIds),
    listOccupiedBeds(knex, unitIds, now),
  ]);
  return { units, beds, now: now.toISOString() };
}

/**
 * The occupied beds of the given units with who is looking after each bed this
 * shift. Callers pass only units the actor is assigned to.
 */
export async function listOccupiedBeds(
  knex: Knex,
  unitIds: readonly number[],
  now: Date = new Date(),
): Promise<BoardRow[]> {
  if (unitIds.length === 0) return [];
  const rows = (await knex("admissions as a")
    .join("beds as b", "b.id", "a.bed_id")
    .join("units as u", "u.id", "b.unit_id")
    .join("patients as p", "p.id", "a.patient_id")
    .whereNull("a.discharged_at")
    .whereIn("b.unit_id", unitIds)
    .orderBy([{ column: "u.code" }, { column: "b.sort_order" }])
    .select(
      "b.id as bed_id",
      "b.label as bed_label",
      "u.id as unit_id",
      "u.code as unit_code",
      "p.id as patient_id",
      "p.family_name",
      "p.given_name",
      "p.birth_date",
      "p.sex",
      "a.admitted_at",
      "a.id as admission_id",
    )) as {
    bed_id: number;
    bed_label: string;
    unit_id: number;
    unit_code: string;
    patient_id: number;
    family_name: string;
    given_name: string;
    birth_date: Date;
    sex: "female" | "male";
    admitted_at: Date;
    admission_id: number;
  }[];
  const bedIds = rows.map((r) => r.bed_id);
  const admissionIds = rows.map((r) => r.admission_id);
  const patientIds = rows.map((r) => r.patient_id);
  const [carers, clinical, alerts] = await Promise.all([
    bedIds.length
      ? (knex("care_assignments as c")
          .join("users as s", "s.id", "c.user_id")
          .whereIn("c.bed_id", bedIds)
          .where("c.starts_at", "<=", now)
          .where("c.ends_at", ">", now)
          .select("c.bed_id", "c.duty", "s.name", "s.id as user_id") as Promise<
          { bed_id: number; duty: string; name: string; user_id: number }[]
        >)
      : Promise.resolve([]),
    loadClinical(knex, admissionIds, patientIds, now),
    openAlertsByAdmission(knex, admissionIds),
  ]);
  const carer = (bedId: number, duty: string) =>
    carers.find((c) => c.bed_id === bedId && c.duty === duty)?.name ?? null;
  const clinicalOf = new Map(
    rows.map((r) => [r.admission_id, clinical(r.admission_id, r.patient_id)]),
  );
  const unread = await unreadByNurse(
    knex,
    rows.flatMap((r) => {
      const orderId = clinicalOf.get(r.admission_id)?.order?.id;
      const nurse = carers.find((c) => c.bed_id === r.bed_id && c.duty === "nurse");
      return orderId && nurse
        ? [{ admissionId: r.admission_id, orderId, nurseId: nurse.user_id }]
        : [];
    }),
  );
  return rows.map((r) => ({
    ...clinicalOf.get(r.admission_id)!,
    bedId: r.bed_id,
    bedLabel: r.bed_label,
    unitId: r.unit_id,
    unitCode: r.unit_code,
    patientId: r.patient_id,
    patientInitials: initialsOf(r.given_name, r.family_name),
    patientAge: ageInYears(r.birth_date, now),
    sex: r.sex,
    admittedAt: r.admitted_at.toISOString(),
    nurse: carer(r.bed_id, "nurse"),
    therapist: carer(r.bed_id, "therapist"),
    alerts: alerts.get(r.admission_id) ?? null,
    orderUnread: unread.has(r.admission_id),
  }));
}

const DAY_MS = 24 * 60 * 60 * 1000;

type Clinical = Omit<
  BoardRow,
  | "bedId"
  | "bedLabel"
  | "unitId"
  | "unitCode"
  | "patientId"
  | "patientInitials"
  | "patientAge"
  | "sex"
  | "admittedAt"
  | "nurse"
  | "therapist"
  | "alerts"
  | "orderUnread"
>;

/**
 * Everything clinical the Board shows for a set of admissions, in a fixed
 * number of queries (no per-bed round trips): bedside settings, the order in
 * effect, the 24 h time in band from the rollups (nothing held in this
 * process's memory), the latest reading and the latest arterial P/F.
 */
async function loadClinical(
  knex: Knex,
  admissionIds: readonly number[],
  patientIds: readonly number[],
  now: Date,
): Promise<(admissionId: number, patientId: number) => Clinical> {
  // The last 24 h to the end of the minute in progress: the rollups' grain.
  const to = new Date(Math.ceil(now.getTime() / 60_000) * 60_000);
  const from = new Date(to.getTime() - DAY_MS);
  const none = () => [] as never[];
  const [settings, orders, tibs, latest, gases] =
    admissionIds.length === 0
      ? [none(), none(), new Map<number, TimeInBand>(), none(), none()]
      : await Promise.all([
          knex("bedside_settings")
            .whereIn("admission_id", admissionIds)
            .select(
              "admission_id",
              "device",
              "fio2",
              "fio2_estimated",
              "peep_cmh2o",
              "flow_l_min",
              "last_reassessed_at",
            ) as Promise<
            {
              admission_id: number;
              device: Device;
              fio2: number;
              fio2_estimated: number;
              peep_cmh2o: number | null;
              flow_l_min: number | null;
              last_reassessed_at: Date;
            }[]
          >,
          knex("orders")
            .whereIn("admission_id", admissionIds)
            .whereIn("status", ["active", "awaiting_cosign"])
            .where("created_at", "<=", now)
            .select(
              "id",
              "admission_id",
              "status",
              "device",
              "spo2_lower_pct",
              "spo2_upper_pct",
              "reassess_minutes",
            ) as Promise<
            {
              id: number;
              admission_id: number;
              status: "active" | "awaiting_cosign";
              device: Device;
              spo2_lower_pct: number;
              spo2_upper_pct: number;
              reassess_minutes: number;
            }[]
          >,
          timeInBandFromRollups(knex, admissionIds, from, to),
          knex
            .raw(
              `SELECT r.admission_id, r.taken_at, r.spo2_pct, r.fio2, r.flow_l_min, r.source
                 FROM readings r
                 JOIN (SELECT patient_id, MAX(taken_at) AS m FROM readings
                        WHERE patient_id IN (${patientIds.map(() => "?").join(",")}) AND taken_at <= ?
                        GROUP BY patient_id) x ON x.patient_id = r.patient_id AND x.m = r.taken_at`,
              [...patientIds, now],
            )
            .then(
              ([r]: [
                {
                  admission_id: number;
                  taken_at: Date;
                  spo2_pct: number;
                  fio2: number;
                  flow_l_min: number | null;
                  source: "manual" | "monitor";
                }[],
              ]) => r,
            ),
          knex
            .raw(
              `SELECT g.admission_id, g.sampled_at, g.pf_ratio, g.fio2_estimated
                 FROM blood_gases g
                 JOIN (SELECT patient_id, MAX(sampled_at) AS m FROM blood_gases
                        WHERE patient_id IN (${patientIds.map(() => "?").join(",")})
                          AND sample_type = 'arterial' AND pf_ratio IS NOT NULL AND sampled_at <= ?
                        GROUP BY patient_id) x ON x.patient_id = g.patient_id AND x.m = g.sampled_at
                WHERE g.sample_type = 'arterial' AND g.pf_ratio IS NOT NULL`,
              [...patientIds, now],
            )
            .then(
              ([r]: [
                {
                  admission_id: number;
                  sampled_at: Date;
                  pf_ratio: number;
                  fio2_estimated: number;
                }[],
              ]) => r,
            ),
        ]);

  const settingsBy = new Map(settings.map((s) => [s.admission_id, s]));
  const currentBy = new Map(orders.map((o) => [o.admission_id, o]));
  const latestBy = new Map(latest.map((r) => [r.admission_id, r]));
  const gasBy = new Map(gases.map((g) => [g.admission_id, g]));

  return (admissionId) => {
    const s = settingsBy.get(admissionId);
    const current = currentBy.get(admissionId);
    const tib = tibs.get(admissionId)!;
    const last = latestBy.get(admissionId);
    const gas = gasBy.get(admissionId);
    const device = s?.device ?? current?.device ?? null;
    const uses = device ? DEVICE_PROFILES[device].uses : null;
    const minutes = s
      ? Math.max(0, Math.floor((now.getTime() - s.last_reassessed_at.getTime()) / 60_000))
      : null;
    const spo2Status =
      last && current
        ? ({ below: "below", inBand: "in-band", above: "above" } as const)[
            classifySpo2(
              last.spo2_pct,
              { fio2: last.fio2, flow: last.flow_l_min },
              {
                lower: current.spo2_lower_pct,
                upper: current.spo2_upper_pct,
              },
            )
          ]
        : null;
    return {
      device,
      deviceLabel: device ? DEVICE_PROFILES[device].label : null,
      fio2: s?.fio2 ?? null,
      fio2Estimated: Boolean(s?.fio2_estimated),
      peepCmH2o: uses?.peep ? (s?.peep_cmh2o ?? null) : null,
      flowLMin: uses?.flow ? (s?.flow_l_min ?? null) : null,
      order: current
        ? {
            id: current.id,
            status: current.status,
            lower: current.spo2_lower_pct,
            upper: current.spo2_upper_pct,
            reassessMinutes: current.reassess_minutes,
          }
        : null,
      latestSpo2: last
        ? {
            pct: last.spo2_pct,
            fio2: last.fio2,
            takenAt: last.taken_at.toISOString(),
            source: last.source,
            belowOximeterAccuracy: belowOximeterAccuracy(last.spo2_pct),
          }
        : null,
      spo2Status,
      timeInBand24h: {
        below: tib.below,
        inBand: tib.inBand,
        above: tib.above,
        unknown: tib.unknown,
      },
      latestPf: gas
        ? {
            ratio: gas.pf_ratio,
            fio2Estimated: Boolean(gas.fio2_estimated),
            sampledAt: gas.sampled_at.toISOString(),
          }
        : null,
      lastReassessedAt: s ? s.last_reassessed_at.toISOString() : null,
      minutesSinceReassessment: minutes,
      overdue: current !== undefined && minutes !== null && minutes > current.reassess_minutes,
    };
  };
}

/** Bed counts per unit, for the Board's header line and empty states. */
export async function summariseUnits(knex: Knex, unitIds: readonly number[]): Promise<BoardUnit[]> {
  if (unitIds.length === 0) return [];
  const rows = (await knex("units as u")
    .leftJoin("beds as b", function joinBeds() {
      this.on("b.unit_id", "=", "u.id").andOn("b.active", "=", knex.raw("1"));
    })
    .leftJoin("admissions as a", function joinOpen() {
      this.on("a.bed_id", "=", "b.id").andOnNull("a.discharged_at");
    })
    .whereIn("u.id", unitIds)
    .groupBy("u.id", "u.code", "u.name")
    .orderBy("u.code")
    .select("u.id", "u.code", "u.name")
    .countDistinct({ total: "b.id" })
    .countDistinct({ occupied: "a.id" })) as {
    id: number;
    code: string;
    name: string;
    total: number | string;
    occupied: number | string;
  }[];
  return rows.map((r) => ({
    unitId: r.id,
    unitCode: r.code,
    unitName: r.name,
    totalBeds: Number(r.total),
    occupiedBeds: Number(r.occupied),
  }));
}
