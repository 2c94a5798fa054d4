import { randomUUID } from "node:crypto";
import { freshPatient, type UnitCode, type World } from "./access-fixtures";
import type { ActionEntry, RouteEntry } from "./access-matrix";
import { appDb } from "./db";

// Admit, transfer, discharge and the patient search. Each allowed cell gets a
// fresh empty bed or a fresh admission of the cell's unit, so whatever refuses
// a request is the access rule, not a taken bed.

const json = (body: string) => JSON.parse(body) as Record<string, unknown>;

/** A new, empty bed of the unit. */
export async function emptyBed(unit: UnitCode): Promise<number> {
  const row = (await appDb()("units").where({ code: unit }).first("id")) as { id: number };
  const [id] = await appDb()("beds").insert({
    unit_id: row.id,
    label: `M${randomUUID().slice(0, 8)}`,
    sort_order: 950,
  });
  return Number(id);
}

/** A patient admitted a moment ago on the unit, with the admission's id. */
async function freshAdmission(unit: UnitCode): Promise<{ admissionId: number; patientId: number }> {
  const { patientId } = await freshPatient(unit);
  const row = (await appDb()("admissions")
    .where({ patient_id: patientId })
    .whereNull("discharged_at")
    .first("id")) as { id: number };
  return { admissionId: row.id, patientId };
}

export async function admitBody(unit: UnitCode) {
  return {
    mrn: `MX${randomUUID().slice(0, 10).replace(/-/g, "")}`,
    familyName: "Matrixson",
    givenName: "Ola",
    birthDate: "1970-02-03",
    sex: "male",
    heightCm: 180,
    bedId: await emptyBed(unit),
    rationale: "Access matrix",
  };
}

export async function transferBody(unit: UnitCode) {
  const { admissionId } = await freshAdmission(unit);
  return { admissionId, bedId: await emptyBed(unit), rationale: "Access matrix move" };
}

export async function dischargeBody(unit: UnitCode) {
  const { admissionId } = await freshAdmission(unit);
  return { admissionId, disposition: "home", rationale: "Access matrix" };
}

export const ADT_ROUTES: Omit<RouteEntry, "via">[] = [
  {
    name: "POST /api/v1/admissions",
    permission: "admission.manage",
    scope: "unit",
    ok: 201,
    call: async (_w: World, c) => ({
      path: "/api/v1/admissions",
      method: "POST",
      json: await admitBody(c.unit),
    }),
  },
  {
    name: "POST /api/v1/admissions/[admissionId]/transfer",
    permission: "admission.manage",
    scope: "unit",
    ok: 200,
    call: async (_w, c) => {
      const { admissionId, ...body } = await transferBody(c.unit);
      return { path: `/api/v1/admissions/${admissionId}/transfer`, method: "POST", json: body };
    },
  },
  {
    name: "POST /api/v1/admissions/[admissionId]/discharge",
    permission: "admission.manage",
    scope: "unit",
    ok: 200,
    call: async (_w, c) => {
      const { admissionId, ...body } = await dischargeBody(c.unit);
      return { path: `/api/v1/admissions/${admissionId}/discharge`, method: "POST", json: body };
    },
  },
  {
    name: "GET /api/v1/patients",
    permission: "record.read",
    scope: "list",
    ok: 200,
    call: (w, c) => ({
      path: `/api/v1/patients?query=${encodeURIComponent(w.shared[c.unit].mrn)}`,
      marker: w.shared[c.unit].patientId,
    }),
    shows: (body, id) =>
      (json(body).patients as { patientId: number }[]).some((p) => p.patientId === id),
  },
];

export const ADT_ACTIONS: Omit<ActionEntry, "via">[] = [
  {
    name: "admitPatientAction",
    permission: "admission.manage",
    scope: "unit",
    ok: 200,
    arg: (_w, c) => admitBody(c.unit),
  },
  {
    name: "transferPatientAction",
    permission: "admission.manage",
    scope: "unit",
    ok: 200,
    arg: (_w, c) => transferBody(c.unit),
  },
  {
    name: "dischargePatientAction",
    permission: "admission.manage",
    scope: "unit",
    ok: 200,
    arg: (_w, c) => dischargeBody(c.unit),
  },
];
