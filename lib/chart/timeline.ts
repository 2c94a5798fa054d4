import type { Knex } from "knex";
import { ADJUSTMENT_REASONS } from "../adjustments/schema";
import type { Actor } from "../auth/actor";
import { ValidationError } from "../errors";
import { DEVICE_PROFILES, type Device } from "../devices";
import { BELOW_OXIMETER_ACCURACY_LABEL, belowOximeterAccuracy } from "../oxygen/oximetry";
import { findReadableAdmission } from "../admissions/access";

// Alerts are a later issue: when they exist they join the timeline as a fifth kind.
export const TIMELINE_KINDS = ["order", "adjustment", "reading", "blood_gas"] as const;
export type TimelineKind = (typeof TIMELINE_KINDS)[number];

/** Ties at the same millisecond break by kind, then id: later in this list sorts newer. */
const KIND_RANK: Record<TimelineKind, number> = {
  order: 3,
  adjustment: 2,
  blood_gas: 1,
  reading: 0,
};

export type OrderStatus = "draft" | "awaiting_cosign" | "active" | "superseded" | "discontinued";

/** The numbers of a timeline row. Pressures are in mmHg; the UI shows them in the user's unit. */
export type TimelineValues = {
  device?: Device;
  spo2Pct?: number;
  spo2LowerPct?: number;
  spo2UpperPct?: number;
  respiratoryRatePerMin?: number | null;
  fio2?: number;
  fio2Estimated?: boolean;
  fio2Min?: number;
  fio2Max?: number;
  peepCmH2O?: number | null;
  flowLMin?: number | null;
  fromFio2?: number;
  fromPeepCmH2O?: number | null;
  fromFlowLMin?: number | null;
  pao2MmHg?: number;
  paco2MmHg?: number;
  pfRatio?: number | null;
  sampleType?: "arterial" | "venous";
  source?: "manual" | "monitor";
  status?: OrderStatus;
};

export type TimelineItem = {
  /** The item's position in the timeline, usable as `before` to read what is older. */
  cursor: string;
  kind: TimelineKind;
  id: number;
  at: string;
  /** Who entered it; null for a monitor import. */
  who: string | null;
  /** One line in words, without pressures (those are in `values`, in mmHg). */
  summary: string;
  /** The clinician's rationale, where the row has one. */
  rationale: string | null;
  /** An order that was discontinued: when, by whom and why. */
  discontinued?: { at: string; by: string | null; reason: string | null };
  values: TimelineValues;
};

export type TimelineCursor = { at: Date; kind: TimelineKind; id: number };

export type TimelinePage = { items: TimelineItem[]; nextCursor: string | null; timeZone: string };

export type TimelineQuery = { kinds?: readonly TimelineKind[]; before?: string; limit: number };

/** `<ISO time>|<kind>|<id>`: opaque to clients, stable across inserts. */
export function encodeCursor(cursor: TimelineCursor): string {
  return `${cursor.at.toISOString()}|${cursor.kind}|${cursor.id}`;
}

export function decodeCursor(text: string): TimelineCursor {
  const [at, kind, id] = text.split("|");
  const time = at ? new Date(at) : new Date(NaN);
  const number = Number(id);
  if (
    Number.isNaN(time.getTime()) ||
    !TIMELINE_KINDS.includes(kind as TimelineKind) ||
    !Number.isInteger(number) ||
    number <= 0
  ) {
    throw new ValidationError("The timeline position is not one this server gave.", {
      before: ["The timeline position (before) is not one this server gave; reload the timeline."],
    });
  }
  return { at: time, kind: kind as TimelineKind, id: number };
}

type Source = {
  kind: TimelineKind;
  table: string;
  time: string;
  select: string[];
  /** Selected as written (sub-queries over the row `t`). */
  raw?: string[];
  map: (row: Record<string, unknown>) => Omit<TimelineItem, "cursor" | "kind">;
};

const num = (v: unknown): number => Number(v);
const numOrNull = (v: unknown): number | null => (v === null || v === undefined ? null : Number(v));
const deviceLabel = (d: unknown): string => DEVICE_PROFILES[d as Device]?.label ?? String(d);
const fio2Text = (v: number): string => v.toFixed(2);

function settingsText(fio2: number, peep: number | null, flow: number | null): string {
  const parts = [`FiO2 ${fio2Text(fio2)}`];
  if (peep !== null) parts.push(`PEEP ${peep} cmH2O`);
  if (flow !== null) parts.push(`flow ${flow} L/min`);
  return parts.join(", ");
}

const STATUS_WORDS: Record<OrderStatus, string> = {
  draft: "draft",
  awaiting_cosign: "awaiting co-sign",
  active: "active",
  superseded: "superseded",
  discontinued: "discontinued",
};

const SOURCES: Record<TimelineKind, Source> = {
  order: {
    kind: "order",
    table: "orders",
    time: "created_at",
    select: [
      "id",
      "created_at as at",
      "status",
      "device",
      "spo2_lower_pct",
      "spo2_upper_pct",
      "fio2_min",
      "fio2_max",
      "initial_fio2",
      "initial_peep_cmh2o",
      "initial_flow_l_min",
      "rationale",
      "discontinued_at",
      "discontinue_reason",
    ],
    raw: ["(SELECT d.name FROM users d WHERE d.id = t.discontinued_by) AS discontinued_by_name"],
    map: (r) => {
      const status = r.status as OrderStatus;
      const stopped = r.discontinued_at ? (r.discontinued_at as Date).toISOString() : null;
      return {
        id: num(r.id),
        at: (r.at as Date).toISOString(),
        who: (r.who as string | null) ?? null,
        summary: `Order (${STATUS_WORDS[status]}): ${deviceLabel(r.device)}, target band ${num(r.spo2_lower_pct)}–${num(r.spo2_upper_pct)} %, FiO2 ${fio2Text(num(r.fio2_min))}–${fio2Text(num(r.fio2_max))}`,
        rationale: (r.rationale as string | null) ?? null,
        ...(stopped
          ? {
              discontinued: {
                at: stopped,
                by: (r.discontinued_by_name as string | null) ?? null,
                reason: (r.discontinue_reason as string | null) ?? null,
              },
            }
          : {}),
        values: {
          status,
          device: r.device as Device,
          spo2LowerPct: num(r.spo2_lower_pct),
          spo2UpperPct: num(r.spo2_upper_pct),
          fio2Min: num(r.fio2_min),
          fio2Max: num(r.fio2_max),
          fio2: num(r.initial_fio2),
          peepCmH2O: numOrNull(r.initial_peep_cmh2o),
          flowLMin: numOrNull(r.initial_flow_l_min),
        },
      };
    },
  },
  adjustment: {
    kind: "adjustment",
    table: "adjustments",
    time: "applied_at",
    select: [
      "id",
      "applied_at as at",
      "device",
      "from_fio2",
      "to_fio2",
      "from_peep_cmh2o",
      "to_peep_cmh2o",
      "from_flow_l_min",
      "to_flow_l_min",
      "reason",
      "rationale",
    ],
    map: (r) => {
      const reason =
        ADJUSTMENT_REASONS.find((x) => x.value === r.reason)?.label ?? String(r.reason);
      const from = settingsText(
        num(r.from_fio2),
        numOrNull(r.from_peep_cmh2o),
        numOrNull(r.from_flow_l_min),
      );
      const to = settingsText(
        num(r.to_fio2),
        numOrNull(r.to_peep_cmh2o),
        numOrNull(r.to_flow_l_min),
      );
      return {
        id: num(r.id),
        at: (r.at as Date).toISOString(),
        who: (r.who as string | null) ?? null,
        summary: `Adjustment: ${from} → ${to} (${reason})`,
        rationale: (r.rationale as string | null) ?? null,
        values: {
          device: r.device as Device,
          fromFio2: num(r.from_fio2),
          fio2: num(r.to_fio2),
          fromPeepCmH2O: numOrNull(r.from_peep_cmh2o),
          peepCmH2O: numOrNull(r.to_peep_cmh2o),
          fromFlowLMin: numOrNull(r.from_flow_l_min),
          flowLMin: numOrNull(r.to_flow_l_min),
        },
      };
    },
  },
  reading: {
    kind: "reading",
    table: "readings",
    time: "taken_at",
    select: [
      "id",
      "taken_at as at",
      "spo2_pct",
      "respiratory_rate_per_min",
      "device",
      "fio2",
      "fio2_estimated",
      "flow_l_min",
      "source",
    ],
    map: (r) => {
      const rr = numOrNull(r.respiratory_rate_per_min);
      const estimated = Boolean(r.fio2_estimated);
      const flow = numOrNull(r.flow_l_min);
      return {
        id: num(r.id),
        at: (r.at as Date).toISOString(),
        who: (r.who as string | null) ?? null,
        summary: [
          `Reading: SpO2 ${num(r.spo2_pct)} %${belowOximeterAccuracy(num(r.spo2_pct)) ? ` (${BELOW_OXIMETER_ACCURACY_LABEL})` : ""}`,
          rr === null ? null : `RR ${rr} /min`,
          `${deviceLabel(r.device)}${flow === null ? "" : ` ${flow} L/min`}`,
          `FiO2 ${fio2Text(num(r.fio2))}${estimated ? " (estimated)" : ""}`,
          r.source === "monitor" ? "monitor" : null,
        ]
          .filter(Boolean)
          .join(", "),
        rationale: null,
        values: {
          spo2Pct: num(r.spo2_pct),
          respiratoryRatePerMin: rr,
          device: r.device as Device,
          fio2: num(r.fio2),
          fio2Estimated: estimated,
          flowLMin: flow,
          source: r.source as "manual" | "monitor",
        },
      };
    },
  },
  blood_gas: {
    kind: "blood_gas",
    table: "blood_gases",
    time: "sampled_at",
    select: [
      "id",
      "sampled_at as at",
      "sample_type",
      "pao2_mmhg",
      "paco2_mmhg",
      "pf_ratio",
      "fio2",
      "fio2_estimated",
      "peep_cmh2o",
      "device",
    ],
    map: (r) => {
      const type = r.sample_type as "arterial" | "venous";
      const peep = numOrNull(r.peep_cmh2o);
      return {
        id: num(r.id),
        at: (r.at as Date).toISOString(),
        who: (r.who as string | null) ?? null,
        summary: `${type === "arterial" ? "Arterial" : "Venous"} blood gas on FiO2 ${fio2Text(num(r.fio2))}${
          peep === null ? "" : `, PEEP ${peep} cmH2O`
        }`,
        rationale: null,
        values: {
          sampleType: type,
          pao2MmHg: num(r.pao2_mmhg),
          paco2MmHg: num(r.paco2_mmhg),
          pfRatio: numOrNull(r.pf_ratio),
          fio2: num(r.fio2),
          fio2Estimated: Boolean(r.fio2_estimated),
          peepCmH2O: peep,
          device: r.device as Device,
        },
      };
    },
  },
};

const WHO_COLUMN: Record<TimelineKind, string> = {
  order: "entered_by",
  adjustment: "recorded_by",
  reading: "recorded_by",
  blood_gas: "recorded_by",
};

/**
 * The patient's timeline for the current admission, newest first: orders,
 * adjustments, readings and blood gases merged into one list and read page by
 * page. Order is (time, kind, id) descending, so a page boundary inside rows
 * of the same millisecond neither skips nor repeats a row. Another unit's
 * patient is a NotFoundError.
 */
export async function listTimeline(
  knex: Knex,
  actor: Actor,
  patientId: number,
  query: TimelineQuery,
): Promise<TimelinePage> {
  const admission = await findReadableAdmission(knex, actor, patientId);
  const kinds =
    query.kinds && query.kinds.length > 0 ? [...new Set(query.kinds)] : [...TIMELINE_KINDS];
  const before = query.before ? decodeCursor(query.before) : null;
  const limit = Math.max(1, Math.min(200, Math.floor(query.limit)));

  const pages = await Promise.all(
    kinds.map(async (kind) => {
      const source = SOURCES[kind];
      const time = `t.${source.time}`;
      const q = knex(`${source.table} as t`)
        .leftJoin("users as u", "u.id", `t.${WHO_COLUMN[kind]}`)
        .where("t.admission_id", admission.admissionId)
        .select([
          ...source.select.map((c) => `t.${c}`),
          "u.name as who",
          ...(source.raw ?? []).map((r) => knex.raw(r)),
        ])
        .orderBy([
          { column: time, order: "desc" },
          { column: "t.id", order: "desc" },
        ])
        .limit(limit + 1);
      if (before) {
        const rankHere = KIND_RANK[kind];
        const rankCursor = KIND_RANK[before.kind];
        q.where((w) => {
          w.where(time, "<", before.at);
          // Same millisecond: lower-ranked kinds come after the cursor, and within the cursor's kind, lower ids.
          if (rankHere < rankCursor) w.orWhere(time, "=", before.at);
          else if (rankHere === rankCursor) {
            w.orWhere((s) => {
              void s.where(time, "=", before.at).andWhere("t.id", "<", before.id);
            });
          }
        });
      }
      const rows = (await q) as Record<string, unknown>[];
      return rows.map((row): TimelineItem => {
        const item = source.map(row);
        return {
          ...item,
          kind,
          cursor: encodeCursor({ at: new Date(item.at), kind, id: item.id }),
        };
      });
    }),
  );

  const merged = pages.flat().sort(compareNewestFirst);
  const items = merged.slice(0, limit);
  const last = items[items.length - 1];
  return {
    items,
    nextCursor: merged.length > limit && last ? last.cursor : null,
    timeZone: admission.timeZone,
  };
}

function compareNewestFirst(a: TimelineItem, b: TimelineItem): number {
  const byTime = Date.parse(b.at) - Date.parse(a.at);
  if (byTime !== 0) return byTime;
  const byKind = KIND_RANK[b.kind] - KIND_RANK[a.kind];
  return byKind !== 0 ? byKind : b.id - a.id;
}
