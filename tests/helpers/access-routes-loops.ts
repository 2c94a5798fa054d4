import { freshPatient, type UnitCode, type World } from "./access-fixtures";
import type { ActionEntry, RouteEntry } from "./access-matrix";

// The bedside loops: therapists and nurses ask for a new order, physicians
// answer; the clinical roles record that they read an order change; everyone
// reads the requests of their units and their own due-soon list. Another
// unit's record answers 404 (the list answers without it).

const requestBody = (patientId: number) => ({
  patientId,
  source: "chart",
  need: "Matrix: FiO2 up to 0.70",
  reason: "Matrix: SpO2 below band at the order's maximum",
});

/** A fresh patient with an open request, written by the matrix's therapist of both units. */
async function openRequest(w: World, unit: UnitCode): Promise<{ id: number; patientId: number }> {
  const { patientId } = await freshPatient(unit);
  const res = await w.writer.json("/api/v1/order-requests", "POST", requestBody(patientId));
  const text = await res.text();
  if (res.status !== 201) throw new Error(`fixture request: ${res.status} ${text.slice(0, 300)}`);
  return { id: (JSON.parse(text) as { request: { id: number } }).request.id, patientId };
}

const listed: Partial<Record<UnitCode, Promise<{ id: number; patientId: number }>>> = {};
const listedRequest = (w: World, unit: UnitCode) => (listed[unit] ??= openRequest(w, unit));

export const LOOP_ROUTES: Omit<RouteEntry, "via">[] = [
  {
    name: "POST /api/v1/order-requests",
    permission: "order_request.send",
    shareWhenDenied: true,
    scope: "unit",
    ok: 201,
    call: async (_w, c) => ({
      path: "/api/v1/order-requests",
      method: "POST",
      json: requestBody((await freshPatient(c.unit)).patientId),
    }),
  },
  {
    name: "GET /api/v1/order-requests",
    permission: "record.read",
    scope: "list",
    ok: 200,
    call: async (w, c) => {
      const r = await listedRequest(w, c.unit);
      return { path: `/api/v1/order-requests?status=all&patientId=${r.patientId}`, marker: r.id };
    },
    shows: (body, id) =>
      (JSON.parse(body) as { requests: { id: number }[] }).requests.some((r) => r.id === id),
  },
  {
    name: "POST /api/v1/order-requests/[requestId]/reply",
    permission: "order_request.answer",
    shareWhenDenied: true,
    scope: "unit",
    ok: 200,
    call: async (w, c) => ({
      path: `/api/v1/order-requests/${(await openRequest(w, c.unit)).id}/reply`,
      method: "POST",
      json: { reply: "Matrix: keep the current order until the next gas" },
    }),
  },
  {
    name: "POST /api/v1/orders/[orderId]/read",
    permission: "order.acknowledge_change",
    scope: "unit",
    ok: 200,
    call: (w, c) => ({
      path: `/api/v1/orders/${w.shared[c.unit].orderId}/read`,
      method: "POST",
      json: {},
    }),
  },
  {
    name: "GET /api/v1/me/due",
    permission: "record.read",
    scope: "none",
    ok: 200,
    call: () => ({ path: "/api/v1/me/due" }),
  },
];

export const LOOP_ACTIONS: Omit<ActionEntry, "via">[] = [
  {
    name: "sendOrderRequestAction",
    permission: "order_request.send",
    shareWhenDenied: true,
    scope: "unit",
    ok: 200,
    arg: async (_w, c) => requestBody((await freshPatient(c.unit)).patientId),
  },
  {
    name: "replyOrderRequestAction",
    permission: "order_request.answer",
    shareWhenDenied: true,
    scope: "unit",
    ok: 200,
    arg: async (w, c) => ({
      requestId: (await openRequest(w, c.unit)).id,
      reply: "Matrix: keep the current order until the next gas",
    }),
  },
  {
    name: "readOrderChangeAction",
    permission: "order.acknowledge_change",
    scope: "unit",
    ok: 200,
    arg: (w, c) => ({ orderId: w.shared[c.unit].orderId }),
  },
];
