import {
  freshPatient,
  OWN,
  writeOneAtATime,
  written,
  type UnitCode,
  type World,
} from "./access-fixtures";
import type { ActionEntry, RouteEntry } from "./access-matrix";

// Ventilator checks (therapists and physicians), their reads (everyone of the
// unit) and a patient's height (the bedside roles). Ventilators are allowed on
// the medical ICU only, so another unit's cell names a patient without one:
// the unit check answers 404 before anything else is looked at.

/** A fresh patient of the unit; on MICU with a physician's written volume-control order. */
async function ventilatedPatient(w: World, unit: UnitCode): Promise<number> {
  const { patientId } = await freshPatient(unit);
  if (unit !== OWN) return patientId;
  const order = {
    patientId,
    device: "invasive",
    spo2Lower: 88,
    spo2Upper: 95,
    fio2Min: 0.3,
    fio2Max: 0.8,
    peepMin: 5,
    peepMax: 14,
    initialFio2: 0.4,
    initialPeep: 8,
    ventMode: "volume_control",
    vtTarget: 6,
    vtMin: 4,
    vtMax: 8,
    rateMin: 12,
    rateMax: 30,
    reassessMinutes: 60,
    rationale: "Access matrix ventilator order",
    supersedesOrderId: null,
    ...written,
  };
  const res = await writeOneAtATime(() => w.signer.json("/api/v1/orders", "POST", order));
  if (res.status !== 201)
    throw new Error(`fixture ventilator order: ${res.status} ${(await res.text()).slice(0, 300)}`);
  return patientId;
}

/** A check within the limits: no alert, so the cells stay independent. */
export async function ventilatorCheckBody(w: World, unit: UnitCode) {
  return {
    patientId: await ventilatedPatient(w, unit),
    checkedAt: new Date().toISOString(),
    measuredVt: 380,
    measuredRate: 20,
    plateau: 22,
    peak: 27,
    totalPeep: 8,
  };
}

export const VENTILATION_ROUTES: Omit<RouteEntry, "via">[] = [
  {
    name: "POST /api/v1/ventilator-checks",
    permission: "ventilator_check.record",
    scope: "unit",
    ok: 201,
    serial: true,
    call: async (w, c) => ({
      path: "/api/v1/ventilator-checks",
      method: "POST",
      json: await ventilatorCheckBody(w, c.unit),
    }),
  },
  {
    name: "GET /api/v1/ventilator-checks",
    permission: "record.read",
    scope: "unit",
    ok: 200,
    call: (w, c) => ({ path: `/api/v1/ventilator-checks?patientId=${w.shared[c.unit].patientId}` }),
  },
  {
    name: "POST /api/v1/patients/[patientId]/height",
    permission: "reading.chart",
    scope: "unit",
    ok: 200,
    call: async (_w, c) => ({
      path: `/api/v1/patients/${(await freshPatient(c.unit)).patientId}/height`,
      method: "POST",
      json: { heightCm: 172 },
    }),
  },
];

export const VENTILATION_ACTIONS: Omit<ActionEntry, "via">[] = [
  {
    name: "recordVentilatorCheckAction",
    permission: "ventilator_check.record",
    scope: "unit",
    ok: 200,
    serial: true,
    arg: (w, c) => ventilatorCheckBody(w, c.unit),
  },
  {
    name: "recordHeightAction",
    permission: "reading.chart",
    scope: "unit",
    ok: 200,
    arg: async (_w, c) => ({ patientId: (await freshPatient(c.unit)).patientId, heightCm: 168 }),
  },
];
