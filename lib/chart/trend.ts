import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import { ValidationError } from "../errors";
import { findReadableAdmission } from "../admissions/access";
import { downsampleMinMax } from "./downsample";

/** At most this many SpO2 points reach the chart; a denser series is thinned (see downsampleMinMax). */
export const TREND_MAX_POINTS = 500;

export type TrendSpo2Point = { at: string; spo2Pct: number };
/** The order's target band over one period: from its start to the next order or its discontinuation. */
export type TrendBand = {
  orderId: number;
  from: string;
  to: string;
  lowerPct: number;
  upperPct: number;
};
/** The settings from `at` until the next step; null where the device does not use them. */
export type TrendSettingsStep = {
  at: string;
  fio2: number | null;
  peepCmH2O: number | null;
  flowLMin: number | null;
  cause: "order" | "adjustment" | "discontinued";
};
/** An arterial gas: PaO2 in mmHg (the UI converts) and its P/F ratio. */
export type TrendGasPoint = { at: string; pao2MmHg: number; pfRatio: number | null };

export type Trend = {
  from: string;
  to: string;
  admittedAt: string;
  timeZone: string;
  spo2: TrendSpo2Point[];
  /** How many SpO2 readings fell in the range, before thinning. */
  spo2Count: number;
  downsampled: boolean;
  bands: TrendBand[];
  settings: TrendSettingsStep[];
  gases: TrendGasPoint[];
};

type OrderRow = {
  id: number;
  created_at: Date;
  status: string;
  discontinued_at: Date | null;
  spo2_lower_pct: number;
  spo2_upper_pct: number;
  initial_fio2: number;
  initial_peep_cmh2o: number | null;
  initial_flow_l_min: number | null;
};

/**
 * What the Chart's trend draws between `from` and `to` (clamped to the current
 * admission): SpO2 readings, thinned to TREND_MAX_POINTS by min/max per time
 * bucket so dips stay visible; the target band of each order over the time it
 * was in effect; FiO2/PEEP/flow as steps from order starts and adjustments
 * (with the step in effect at `from` carried in); PaO2 and P/F from arterial gases.
 */
export async function getTrend(
  knex: Knex,
  actor: Actor,
  patientId: number,
  range: { from: Date; to: Date },
): Promise<Trend> {
  if (!(range.to.getTime() > range.from.getTime())) {
    throw new ValidationError("The end of the range must be after its start.", {
      to: ["The end of the range (to) must be after its start (from)."],
    });
  }
  const admission = await findReadableAdmission(knex, actor, patientId);
  const { admitted_at: admittedAt } = (await knex("admissions")
    .where({ id: admission.admissionId })
    .first("admitted_at")) as { admitted_at: Date };
  const from = new Date(Math.max(range.from.getTime(), admittedAt.getTime()));
  const to = range.to;
  const scope = { admission_id: admission.admissionId };

  const [readings, orders, adjustments, gases] = await Promise.all([
    knex("readings")
      .where(scope)
      .whereBetween("taken_at", [from, to])
      .orderBy([{ column: "taken_at" }, { column: "id" }])
      .select("taken_at", "spo2_pct") as Promise<{ taken_at: Date; spo2_pct: number }[]>,
    knex("orders")
      .where(scope)
      .whereNot("status", "draft")
      .where("created_at", "<=", to)
      .orderBy([{ column: "created_at" }, { column: "id" }])
      .select(
        "id",
        "created_at",
        "status",
        "discontinued_at",
        "spo2_lower_pct",
        "spo2_upper_pct",
        "initial_fio2",
        "initial_peep_cmh2o",
        "initial_flow_l_min",
      ) as Promise<OrderRow[]>,
    knex("adjustments")
      .where(scope)
      .where("applied_at", "<=", to)
      .orderBy([{ column: "applied_at" }, { column: "id" }])
      .select("applied_at", "to_fio2", "to_peep_cmh2o", "to_flow_l_min") as Promise<
      {
        applied_at: Date;
        to_fio2: number;
        to_peep_cmh2o: number | null;
        to_flow_l_min: number | null;
      }[]
    >,
    knex("blood_gases")
      .where(scope)
      .where("sample_type", "arterial")
      .whereBetween("sampled_at", [from, to])
      .orderBy([{ column: "sampled_at" }, { column: "id" }])
      .select("sampled_at", "pao2_mmhg", "pf_ratio") as Promise<
      { sampled_at: Date; pao2_mmhg: number; pf_ratio: number | null }[]
    >,
  ]);

  // Each order holds from its start until the next order starts or it is discontinued.
  const periods = orders.map((order, i) => {
    const next = orders[i + 1];
    const ends = [next?.created_at, order.discontinued_at ?? undefined, to]
      .filter((d): d is Date => d instanceof Date)
      .map((d) => d.getTime());
    return { order, start: order.created_at.getTime(), end: Math.min(...ends) };
  });
  const bands: TrendBand[] = periods
    .filter((p) => p.end > from.getTime() && p.start < to.getTime())
    .map((p) => ({
      orderId: p.order.id,
      from: new Date(Math.max(p.start, from.getTime())).toISOString(),
      to: new Date(p.end).toISOString(),
      lowerPct: Number(p.order.spo2_lower_pct),
      upperPct: Number(p.order.spo2_upper_pct),
    }));

  type Step = { t: number; step: TrendSettingsStep };
  const steps: Step[] = [];
  for (const p of periods) {
    steps.push({
      t: p.start,
      step: {
        at: p.order.created_at.toISOString(),
        fio2: Number(p.order.initial_fio2),
        peepCmH2O: p.order.initial_peep_cmh2o === null ? null : Number(p.order.initial_peep_cmh2o),
        flowLMin: p.order.initial_flow_l_min === null ? null : Number(p.order.initial_flow_l_min),
        cause: "order",
      },
    });
    if (p.order.discontinued_at && p.order.discontinued_at.getTime() <= to.getTime()) {
      const t = p.order.discontinued_at.getTime();
      steps.push({
        t,
        step: {
          at: new Date(t).toISOString(),
          fio2: null,
          peepCmH2O: null,
          flowLMin: null,
          cause: "discontinued",
        },
      });
    }
  }
  for (const a of adjustments) {
    steps.push({
      t: a.applied_at.getTime(),
      step: {
        at: a.applied_at.toISOString(),
        fio2: Number(a.to_fio2),
        peepCmH2O: a.to_peep_cmh2o === null ? null : Number(a.to_peep_cmh2o),
        flowLMin: a.to_flow_l_min === null ? null : Number(a.to_flow_l_min),
        cause: "adjustment",
      },
    });
  }
  steps.sort((a, b) => a.t - b.t);
  // The step in effect at `from` starts the series at `from`; later ones follow.
  const carried = steps.filter((s) => s.t <= from.getTime()).pop();
  const settings = [
    ...(carried ? [{ ...carried.step, at: from.toISOString() }] : []),
    ...steps.filter((s) => s.t > from.getTime()).map((s) => s.step),
  ];

  const points = readings.map((r) => ({ t: r.taken_at.getTime(), spo2Pct: Number(r.spo2_pct) }));
  const thinned = downsampleMinMax(points, (p) => p.spo2Pct, TREND_MAX_POINTS);

  return {
    from: from.toISOString(),
    to: to.toISOString(),
    admittedAt: admittedAt.toISOString(),
    timeZone: admission.timeZone,
    spo2: thinned.map((p) => ({ at: new Date(p.t).toISOString(), spo2Pct: p.spo2Pct })),
    spo2Count: points.length,
    downsampled: thinned.length < points.length,
    bands,
    settings,
    gases: gases.map((g) => ({
      at: g.sampled_at.toISOString(),
      pao2MmHg: Number(g.pao2_mmhg),
      pfRatio: g.pf_ratio === null ? null : Number(g.pf_ratio),
    })),
  };
}
