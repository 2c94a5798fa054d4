import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import type { RecipientBasis } from "../alerts/recipients";
import type { Device } from "../devices";
import type { OrderRequestFilter, OrderRequestSource } from "./schema";
import type { RequestSnapshot } from "./snapshot";

export type OrderRequestState = "open" | "escalated" | "closed";

export type OrderRequestView = {
  id: number;
  patientId: number;
  admissionId: number;
  unitId: number;
  unitCode: string;
  bedId: number;
  bedLabel: string;
  patientName: string;
  orderId: number | null;
  alertId: number | null;
  source: OrderRequestSource;
  requestedBy: { id: number; name: string; role: string };
  physician: { id: number; name: string } | null;
  recipientBasis: RecipientBasis | null;
  /** Who was told, per step (the request, then its escalation). */
  told: { name: string; basis: RecipientBasis }[][];
  need: string;
  reason: string;
  proposal: {
    device: Device | null;
    fio2Max: number | null;
    peepMax: number | null;
    flowMax: number | null;
  };
  snapshot: RequestSnapshot;
  state: OrderRequestState;
  escalationLevel: number;
  escalatedAt: string | null;
  createdAt: string;
  closedAt: string | null;
  closedBy: { id: number; name: string } | null;
  closedHow: "order" | "reply" | null;
  closedOrderId: number | null;
  reply: string | null;
  /** How it was closed, in words ("closed by order #12, signed by …"). */
  closedWords: string | null;
  version: number;
};

type Row = {
  id: number;
  patient_id: number;
  admission_id: number;
  unit_id: number;
  unit_code: string;
  bed_id: number;
  bed_label: string;
  family_name: string;
  given_name: string;
  order_id: number | null;
  alert_id: number | null;
  source: OrderRequestSource;
  requested_by: number;
  requester_name: string;
  requester_role: string;
  physician_id: number | null;
  physician_name: string | null;
  recipient_basis: RecipientBasis | null;
  told_json: string;
  need: string;
  reason: string;
  device: Device | null;
  fio2_max: number | null;
  peep_max_cmh2o: number | null;
  flow_max_l_min: number | null;
  snapshot_json: string;
  state: OrderRequestState;
  escalation_level: number;
  escalated_at: Date | null;
  created_at: Date;
  closed_at: Date | null;
  closed_by: number | null;
  closer_name: string | null;
  closed_how: "order" | "reply" | null;
  closed_order_id: number | null;
  reply: string | null;
  version: number;
};

function base(knex: Knex) {
  return knex("order_requests as r")
    .join("units as un", "un.id", "r.unit_id")
    .join("beds as b", "b.id", "r.bed_id")
    .join("patients as p", "p.id", "r.patient_id")
    .join("users as q", "q.id", "r.requested_by")
    .leftJoin("users as ph", "ph.id", "r.physician_id")
    .leftJoin("users as c", "c.id", "r.closed_by")
    .select(
      "r.*",
      "un.code as unit_code",
      "b.label as bed_label",
      "p.family_name",
      "p.given_name",
      "q.name as requester_name",
      "q.role as requester_role",
      "ph.name as physician_name",
      "c.name as closer_name",
    );
}

const iso = (d: Date | null) => (d ? new Date(d).toISOString() : null);

function toView(r: Row): OrderRequestView {
  const closedBy = r.closed_by !== null ? { id: r.closed_by, name: r.closer_name ?? "?" } : null;
  return {
    id: r.id,
    patientId: r.patient_id,
    admissionId: r.admission_id,
    unitId: r.unit_id,
    unitCode: r.unit_code,
    bedId: r.bed_id,
    bedLabel: r.bed_label,
    patientName: `${r.family_name}, ${r.given_name}`,
    orderId: r.order_id,
    alertId: r.alert_id,
    source: r.source,
    requestedBy: { id: r.requested_by, name: r.requester_name, role: r.requester_role },
    physician:
      r.physician_id !== null ? { id: r.physician_id, name: r.physician_name ?? "?" } : null,
    recipientBasis: r.recipient_basis,
    told: JSON.parse(r.told_json) as OrderRequestView["told"],
    need: r.need,
    reason: r.reason,
    proposal: {
      device: r.device,
      fio2Max: r.fio2_max,
      peepMax: r.peep_max_cmh2o,
      flowMax: r.flow_max_l_min,
    },
    snapshot: JSON.parse(r.snapshot_json) as RequestSnapshot,
    state: r.state,
    escalationLevel: r.escalation_level,
    escalatedAt: iso(r.escalated_at),
    createdAt: new Date(r.created_at).toISOString(),
    closedAt: iso(r.closed_at),
    closedBy,
    closedHow: r.closed_how,
    closedOrderId: r.closed_order_id,
    reply: r.reply,
    closedWords:
      r.closed_how === "order"
        ? `closed by order #${r.closed_order_id}, signed by ${closedBy?.name ?? "?"}`
        : r.closed_how === "reply"
          ? `answered by ${closedBy?.name ?? "?"}: ${r.reply}`
          : null,
    version: r.version,
  };
}

/** One request as it stands (no unit check: callers check). */
export async function getOrderRequest(
  knex: Knex | Knex.Transaction,
  id: number,
): Promise<OrderRequestView | null> {
  const row = (await base(knex).where("r.id", id).first()) as Row | undefined;
  return row ? toView(row) : null;
}

/**
 * Requests on the caller's units, newest first; those addressed to the
 * caller first when they are open (the physician's queue).
 */
export async function listOrderRequests(
  knex: Knex,
  actor: Actor,
  filter: OrderRequestFilter,
): Promise<(OrderRequestView & { forMe: boolean })[]> {
  if (!actor.unitIds.length) return [];
  const q = base(knex).whereIn("r.unit_id", actor.unitIds);
  if (filter.status === "open") void q.whereNot("r.state", "closed");
  if (filter.status === "closed") void q.where("r.state", "closed");
  if (filter.patientId !== undefined) void q.where("r.patient_id", filter.patientId);
  if (filter.requestId !== undefined) void q.where("r.id", filter.requestId);
  const rows = (await q.orderBy("r.created_at", "desc").limit(filter.limit)) as Row[];
  const views = rows.map((r) => ({ ...toView(r), forMe: r.physician_id === actor.id }));
  const rank = (v: { forMe: boolean; state: OrderRequestState }) =>
    v.state !== "closed" && v.forMe ? 0 : v.state !== "closed" ? 1 : 2;
  return views.sort((a, b) => rank(a) - rank(b));
}

/** Open requests addressed to the caller: the count the header and the Board show. */
export async function openRequestsForMe(knex: Knex, actor: Actor): Promise<number> {
  if (!actor.unitIds.length) return 0;
  const [row] = (await knex("order_requests")
    .whereIn("unit_id", actor.unitIds)
    .where({ physician_id: actor.id })
    .whereNot({ state: "closed" })
    .count({ n: "*" })) as { n: number | string }[];
  return Number(row?.n ?? 0);
}
