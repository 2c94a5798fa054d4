import { readFileSync } from "node:fs";
import { join } from "node:path";
import { can, mayAdjustDevice } from "@/lib/auth/permissions";
import type { Role } from "@/lib/auth/roles";
import { DEVICE_PROFILES } from "@/lib/devices";
import {
  OWN,
  freshPatient,
  newUser,
  openAlert,
  orderFields,
  previewedImport,
  settingsVersion,
  uploadForm,
  verbal,
  verbalOrder,
  written,
  writtenOrder,
  type UnitCode,
  type World,
} from "./access-fixtures";
import type { Cell, RouteEntry } from "./access-matrix";
import { ACCOUNT_ROUTES } from "./access-routes-accounts";
import { ADT_ROUTES } from "./access-routes-adt";
import { HANDOFF_ROUTES } from "./access-routes-handoff";
import { REHEARSAL_ROUTES } from "./access-routes-rehearsals";
import { LOOP_ROUTES } from "./access-routes-loops";
import { REPORT_ROUTES } from "./access-routes-reports";
import { UNIT_ROUTES } from "./access-routes-units";
import { ASSIGNMENT_ROUTES } from "./access-routes-assignments";
import { VENTILATION_ROUTES } from "./access-routes-ventilation";
import { appDb, uniqueEmail } from "./db";
import { DEMO_PASSWORD } from "./browser";

// Reads of one's units are `record.read` (everyone); the routes that need any
// signed-in user (`requireRole()` alone) answer to that row too.

const json = (body: string) => JSON.parse(body) as Record<string, unknown>;
const fixture = (name: string) =>
  readFileSync(join(process.cwd(), "tests/fixtures/imports", name), "utf8");

export function newUserBody(email: string, unitId: number) {
  return {
    email,
    name: "Matrix Created",
    role: "nurse",
    unitIds: [unitId],
    pressureUnit: "mmHg",
    password: "long-enough-password",
    rationale: "access matrix",
    currentPassword: DEMO_PASSWORD,
  };
}

/** The order a role writes: physicians sign it; the others take it verbally, with read-back. */
export async function orderBody(w: World, cell: Cell) {
  const { patientId } = await freshPatient(cell.unit);
  const mode = cell.role && can({ role: cell.role }, "order.sign") ? written : verbal(w, cell.unit);
  return { ...orderFields(patientId), ...mode };
}

/** A settings change within a fresh nasal-cannula order: low flow, so nurses may record it too. */
export async function adjustmentBody(w: World, unit: UnitCode) {
  const { patientId } = await verbalOrder(w, unit, "nasal_cannula");
  return {
    patientId,
    settingsVersion: await settingsVersion(patientId),
    toFio2: 0.33,
    toFlow: 3,
    reason: "other",
    rationale: "Access matrix change",
    appliedAt: new Date().toISOString(),
  };
}
/** The table's rule with the device's: nurses record changes on low-flow devices only. */
export const adjustmentAllows = (role: Role) =>
  mayAdjustDevice({ role }, DEVICE_PROFILES.nasal_cannula);

export const readingBody = (w: World, unit: UnitCode) => ({
  patientId: w.shared[unit].patientId,
  takenAt: new Date().toISOString(),
  spo2: 94,
  device: "venturi_mask",
  fio2: 0.35,
});

export const gasBody = (w: World, unit: UnitCode) => ({
  patientId: w.shared[unit].patientId,
  sampledAt: new Date(Date.now() - 60_000).toISOString(),
  sampleType: "arterial",
  pao2: 80,
  paco2: 40,
  hemoglobin: 12,
  device: "venturi_mask",
  fio2: 0.35,
});

const patient = (w: World, cell: Cell, tail: string) =>
  `/api/v1/patients/${w.shared[cell.unit].patientId}/${tail}`;

const ROUTES: Omit<RouteEntry, "via">[] = [
  {
    name: "GET /api/v1/me",
    permission: "account.self",
    scope: "none",
    ok: 200,
    call: () => ({ path: "/api/v1/me" }),
  },
  {
    name: "GET /api/v1/board",
    permission: "record.read",
    scope: "unit",
    ok: 200,
    call: (w, c) => ({ path: `/api/v1/board?unitId=${w.unitId[c.unit]}` }),
  },
  {
    name: "GET /api/v1/patients/[patientId]/bedside",
    permission: "record.read",
    scope: "unit",
    ok: 200,
    call: (w, c) => ({ path: patient(w, c, "bedside") }),
  },
  {
    name: "GET /api/v1/patients/[patientId]/forecast-accuracy",
    permission: "record.read",
    scope: "unit",
    ok: 200,
    call: (w, c) => ({ path: patient(w, c, "forecast-accuracy") }),
  },
  {
    name: "GET /api/v1/patients/[patientId]/trend",
    permission: "record.read",
    scope: "unit",
    ok: 200,
    call: (w, c) => {
      const to = new Date();
      const from = new Date(to.getTime() - 6 * 3600_000);
      return { path: patient(w, c, `trend?from=${from.toISOString()}&to=${to.toISOString()}`) };
    },
  },
  {
    name: "GET /api/v1/patients/[patientId]/timeline",
    permission: "record.read",
    scope: "unit",
    ok: 200,
    call: (w, c) => ({ path: patient(w, c, "timeline") }),
  },
  {
    name: "GET /api/v1/patients/[patientId]/fhir",
    permission: "record.read",
    scope: "unit",
    ok: 200,
    call: (w, c) => ({ path: patient(w, c, "fhir") }),
  },
  {
    name: "GET /api/v1/users",
    permission: "user.manage",
    scope: "none",
    ok: 200,
    call: () => ({ path: "/api/v1/users" }),
  },
  {
    name: "POST /api/v1/users",
    permission: "user.manage",
    scope: "none",
    ok: 201,
    call: (w) => ({
      path: "/api/v1/users",
      method: "POST",
      json: newUserBody(uniqueEmail("matrix-api"), w.unitId[OWN]),
    }),
  },
  {
    name: "GET /api/v1/users/[userId]",
    permission: "user.manage",
    scope: "none",
    ok: 200,
    call: (w) => ({ path: `/api/v1/users/${w.userId}` }),
  },
  {
    name: "PATCH /api/v1/users/[userId]",
    permission: "user.manage",
    scope: "none",
    ok: 200,
    call: async (w) => {
      const user = await newUser("nurse", "matrix-edit");
      const body = {
        ...newUserBody(user.email, w.unitId[OWN]),
        password: "",
        version: user.version,
        name: "Matrix Renamed",
      };
      return { path: `/api/v1/users/${user.id}`, method: "PATCH", json: body };
    },
  },
  {
    name: "POST /api/v1/users/[userId]/active",
    permission: "user.manage",
    scope: "none",
    ok: 200,
    call: async () => {
      const user = await newUser("nurse", "matrix-off");
      const body = {
        version: user.version,
        active: false,
        rationale: "Access matrix",
        currentPassword: DEMO_PASSWORD,
      };
      return { path: `/api/v1/users/${user.id}/active`, method: "POST", json: body };
    },
  },
  {
    name: "POST /api/v1/orders",
    permission: "order.write",
    serial: true,
    scope: "unit",
    ok: 201,
    call: async (w, c) => ({ path: "/api/v1/orders", method: "POST", json: await orderBody(w, c) }),
  },
  {
    name: "GET /api/v1/orders/[orderId]",
    permission: "record.read",
    scope: "unit",
    ok: 200,
    call: (w, c) => ({ path: `/api/v1/orders/${w.shared[c.unit].orderId}` }),
  },
  {
    name: "POST /api/v1/orders/[orderId]/cosign",
    permission: "order.cosign",
    shareWhenDenied: true,
    scope: "unit",
    ok: 200,
    call: async (w, c) => {
      // Names the matrix's physician as prescriber on their own unit.
      const { orderId, version } = await verbalOrder(w, c.unit);
      return {
        path: `/api/v1/orders/${orderId}/cosign`,
        method: "POST",
        json: { version, password: DEMO_PASSWORD },
      };
    },
  },
  {
    name: "POST /api/v1/orders/[orderId]/discontinue",
    permission: "order.discontinue",
    shareWhenDenied: true,
    scope: "unit",
    ok: 200,
    call: async (w, c) => {
      const { orderId, version } = await writtenOrder(w, c.unit);
      const body = { version, reason: "Access matrix: weaned off", password: DEMO_PASSWORD };
      return { path: `/api/v1/orders/${orderId}/discontinue`, method: "POST", json: body };
    },
  },
  {
    name: "GET /api/v1/ledger",
    permission: "record.read",
    scope: "list",
    ok: 200,
    call: (w, c) => ({
      path: `/api/v1/ledger?patientId=${w.shared[c.unit].patientId}`,
      marker: w.shared[c.unit].patientId,
    }),
    shows: (body, id) =>
      (json(body).entries as { patientId: number }[]).some((e) => e.patientId === id),
  },
  {
    name: "GET /api/v1/ledger/export",
    permission: "record.read",
    scope: "list",
    ok: 200,
    call: (w, c) => ({
      path: `/api/v1/ledger/export?patientId=${w.shared[c.unit].patientId}`,
      marker: w.shared[c.unit].patientId,
    }),
    // The header line alone when no row of the patient's is visible.
    shows: (body) => body.trim().split("\r\n").length > 1,
  },
  {
    name: "GET /api/v1/ledger/verify",
    permission: "record.read",
    scope: "none",
    ok: 200,
    call: () => ({ path: "/api/v1/ledger/verify" }),
  },
  {
    name: "GET /api/v1/step-tables",
    permission: "record.read",
    scope: "list",
    ok: 200,
    call: (w, c) => ({ path: "/api/v1/step-tables", marker: w.shared[c.unit].stepTableId }),
    shows: (body, id) => (json(body).stepTables as { id: number }[]).some((t) => t.id === id),
  },
  {
    name: "POST /api/v1/readings",
    permission: "reading.chart",
    scope: "unit",
    ok: 201,
    call: (w, c) => ({ path: "/api/v1/readings", method: "POST", json: readingBody(w, c.unit) }),
  },
  {
    name: "GET /api/v1/imports",
    permission: "import.upload",
    shareWhenDenied: true,
    scope: "list",
    ok: 200,
    // A fresh upload, so it is among the newest the list shows.
    call: async (w, c) => ({
      path: "/api/v1/imports",
      marker: (await previewedImport(w, c.unit)).importId,
    }),
    shows: (body, id) => (json(body).imports as { id: number }[]).some((i) => i.id === id),
  },
  {
    name: "POST /api/v1/imports",
    permission: "import.upload",
    scope: "unit",
    ok: 201,
    call: (w, c) => ({
      path: "/api/v1/imports",
      method: "POST",
      form: uploadForm(w.unitId[c.unit], w.shared[c.unit].mrn),
    }),
  },
  {
    name: "GET /api/v1/imports/[importId]",
    permission: "import.upload",
    scope: "unit",
    ok: 200,
    call: (w, c) => ({ path: `/api/v1/imports/${w.shared[c.unit].importId}` }),
  },
  {
    name: "PUT /api/v1/imports/[importId]",
    permission: "import.upload",
    scope: "unit",
    ok: 200,
    call: async (w, c) => {
      const id = w.shared[c.unit].importId;
      const row = (await appDb()("imports").where({ id }).first("options_json")) as {
        options_json: string;
      };
      const { mapping } = JSON.parse(row.options_json) as { mapping: unknown };
      return { path: `/api/v1/imports/${id}`, method: "PUT", json: mapping };
    },
  },
  {
    name: "GET /api/v1/imports/[importId]/report",
    permission: "import.upload",
    scope: "unit",
    ok: 200,
    call: (w, c) => ({ path: `/api/v1/imports/${w.shared[c.unit].importId}/report` }),
  },
  {
    name: "POST /api/v1/imports/[importId]/confirm",
    permission: "import.upload",
    shareWhenDenied: true,
    scope: "unit",
    ok: 201,
    call: async (w, c) => {
      const { importId, accepted } = await previewedImport(w, c.unit);
      return {
        path: `/api/v1/imports/${importId}/confirm`,
        method: "POST",
        json: { expectedAccepted: accepted },
      };
    },
  },
  {
    name: "POST /api/v1/imports/hl7",
    permission: "token",
    scope: "none",
    ok: 201,
    call: (w) => {
      const message = fixture("hl7-valid.hl7")
        .replaceAll("{{MRN}}", w.shared[OWN].mrn)
        .replaceAll("{{MSGID}}", `MX${Date.now()}`);
      return {
        path: "/api/v1/imports/hl7",
        method: "POST",
        raw: { body: message, type: "text/plain" },
      };
    },
  },
  {
    name: "POST /api/v1/imports/monitor",
    permission: "token",
    scope: "none",
    ok: 201,
    call: async (w) => {
      const { mrn, patientId } = w.shared[OWN];
      const { label } = (await appDb()("admissions as a")
        .join("beds as b", "b.id", "a.bed_id")
        .where("a.patient_id", patientId)
        .first("b.label")) as { label: string };
      const query = new URLSearchParams({ mrn, bed: label });
      return {
        path: `/api/v1/imports/monitor?${query}`,
        method: "POST",
        raw: { body: fixture("monitor-valid.csv"), type: "text/csv" },
      };
    },
  },
  {
    name: "POST /api/v1/adjustments",
    permission: "adjustment.record",
    allows: adjustmentAllows,
    shareWhenDenied: true,
    scope: "unit",
    ok: 201,
    call: async (w, c) => ({
      path: "/api/v1/adjustments",
      method: "POST",
      json: await adjustmentBody(w, c.unit),
    }),
  },
  {
    name: "GET /api/v1/alerts",
    permission: "record.read",
    scope: "list",
    ok: 200,
    call: (w, c) => ({
      path: `/api/v1/alerts?status=all&patientId=${w.shared[c.unit].patientId}`,
      marker: w.shared[c.unit].alertId,
    }),
    shows: (body, id) => (json(body).alerts as { id: number }[]).some((a) => a.id === id),
  },
  {
    name: "POST /api/v1/alerts/[alertId]/resolve",
    permission: "alert.act",
    shareWhenDenied: true,
    scope: "unit",
    ok: 200,
    call: async (w, c) => ({
      path: `/api/v1/alerts/${await openAlert(w, c.unit)}/resolve`,
      method: "POST",
      json: { reason: "Access matrix: probe repositioned" },
    }),
  },
  {
    name: "POST /api/v1/alerts/[alertId]/acknowledge",
    permission: "alert.act",
    shareWhenDenied: true,
    scope: "unit",
    ok: 200,
    call: async (w, c) => ({
      path: `/api/v1/alerts/${await openAlert(w, c.unit)}/acknowledge`,
      method: "POST",
      json: { note: "Access matrix" },
    }),
  },
  {
    name: "GET /api/v1/alerts/summary",
    permission: "record.read",
    scope: "none",
    ok: 200,
    call: () => ({ path: "/api/v1/alerts/summary" }),
  },
  {
    name: "POST /api/v1/blood-gases",
    permission: "blood_gas.record",
    scope: "unit",
    ok: 201,
    call: (w, c) => ({ path: "/api/v1/blood-gases", method: "POST", json: gasBody(w, c.unit) }),
  },
  {
    name: "POST /api/v1/oxygenation/forecast",
    permission: "record.read",
    scope: "unit",
    ok: 200,
    call: (w, c) => ({
      path: "/api/v1/oxygenation/forecast",
      method: "POST",
      json: {
        fio2: 0.4,
        pao2: 80,
        paco2: 40,
        hemoglobin: 12,
        nextFio2: 0.5,
        unitId: w.unitId[c.unit],
      },
    }),
  },
  {
    name: "POST /api/v1/oxygenation/assess",
    permission: "record.read",
    scope: "unit",
    ok: 200,
    call: (w, c) => ({
      path: "/api/v1/oxygenation/assess",
      method: "POST",
      json: { fio2: 0.4, pao2: 80, paco2: 40, unitId: w.unitId[c.unit] },
    }),
  },
  ...ASSIGNMENT_ROUTES,
];

export const ROUTE_ENTRIES: RouteEntry[] = [
  ...ROUTES,
  ...ADT_ROUTES,
  ...UNIT_ROUTES,
  ...HANDOFF_ROUTES,
  ...REPORT_ROUTES,
  ...REHEARSAL_ROUTES,
  ...ACCOUNT_ROUTES,
  ...LOOP_ROUTES,
  ...VENTILATION_ROUTES,
].map((e) => ({
  ...e,
  via: "route",
}));
