import { randomBytes, randomUUID } from "node:crypto";
import { hashApiToken } from "@/lib/api-tokens/service";
import { hashPassword } from "@/lib/auth/password";
import { ROLES, type Role } from "@/lib/auth/roles";
import { alertConfig } from "@/lib/alerts/config";
import { rehearsalFormDefaults } from "@/lib/rehearsal/form-defaults";
import { rehearsalCreateSchema } from "@/lib/rehearsal/schema";
import { requestRehearsal } from "@/lib/rehearsal/service";
import { createStepTable } from "@/lib/step-tables/service";
import { parseInput } from "@/lib/validation";
import { DEMO_PASSWORD } from "./browser";
import { actorByEmail, admitTestPatient, appDb, SEEDED, uniqueEmail } from "./db";
import { Session } from "./http";

/**
 * The records the access matrix asks for. Every actor of the matrix is a fresh
 * user on MICU only, so MICU is "their unit" and RESP is "another unit" for
 * every role alike (the seeded admins and reviewers sit on both). The records
 * are written through the API by fresh staff of both units, so no seeded
 * user's queues or lists change.
 */
export const OWN = "MICU";
export const OTHER = "RESP";
export type UnitCode = typeof OWN | typeof OTHER;

export type Shared = {
  patientId: number;
  mrn: string;
  orderId: number;
  alertId: number;
  importId: number;
  stepTableId: number;
  rehearsalId: number;
};

export type World = {
  unitId: Record<UnitCode, number>;
  actor: Record<Role, { id: number; session: Session }>;
  /** A therapist on both units: verbal orders, readings, uploads. */
  writer: Session;
  /** A physician on both units: written orders. */
  signer: Session;
  /** The physician a verbal order names: the matrix's own physician on MICU, the signer on RESP. */
  prescriber: Record<UnitCode, number>;
  adminId: number;
  /** A user the admin entries read. */
  userId: number;
  shared: Record<UnitCode, Shared>;
};

let passwordHash: Promise<string> | undefined;

/** A user of one role (on MICU only, unless told), with the demo password; id and version 1. */
export async function newUser(
  role: Role,
  prefix = "matrix",
  units: readonly UnitCode[] = [OWN],
): Promise<{ id: number; email: string; version: number }> {
  passwordHash ??= hashPassword(DEMO_PASSWORD);
  const email = uniqueEmail(`${prefix}-${role}`);
  const [id] = await appDb()("users").insert({
    email,
    name: `Matrix ${role}`,
    role,
    password_hash: await passwordHash,
  });
  const rows = (await appDb()("units").whereIn("code", units).select("id")) as { id: number }[];
  await appDb()("user_units").insert(rows.map((u) => ({ user_id: Number(id), unit_id: u.id })));
  return { id: Number(id), email, version: 1 };
}

async function expectCreated(res: Response, what: string): Promise<Record<string, unknown>> {
  const text = await res.text();
  if (res.status !== 201) throw new Error(`fixture ${what}: ${res.status} ${text.slice(0, 300)}`);
  return JSON.parse(text) as Record<string, unknown>;
}

export async function freshPatient(unit: UnitCode): Promise<{ patientId: number; mrn: string }> {
  const { patientId } = await admitTestPatient(unit);
  const { mrn } = (await appDb()("patients").where({ id: patientId }).first("mrn")) as {
    mrn: string;
  };
  return { patientId, mrn };
}

/** A Venturi-mask order's fields (SpO2 92–96 %); a nasal cannula (low-flow) one on request. */
export function orderFields(
  patientId: number,
  device: "venturi_mask" | "nasal_cannula" = "venturi_mask",
) {
  const common = {
    patientId,
    spo2Lower: 92,
    spo2Upper: 96,
    reassessMinutes: 60,
    rationale: "Access matrix fixture order",
    supersedesOrderId: null,
  };
  return device === "venturi_mask"
    ? { ...common, device, fio2Min: 0.24, fio2Max: 0.6, initialFio2: 0.35 }
    : {
        ...common,
        device,
        fio2Min: 0.24,
        fio2Max: 0.45,
        initialFio2: 0.29,
        flowMin: 1,
        flowMax: 6,
        initialFlow: 2,
      };
}

export const verbal = (w: World, unit: UnitCode) =>
  ({ entryMode: "verbal", prescriberId: w.prescriber[unit], readBackConfirmed: true }) as const;
export const written = { entryMode: "written", password: DEMO_PASSWORD } as const;

type OrderRef = { orderId: number; version: number; patientId: number; mrn: string };

/**
 * Two first orders for two new patients written at the same moment can
 * deadlock in MariaDB (both take the gap lock at the top of the current-order
 * index, then both insert) and one answers 409; two first alerts (500) and two
 * new step tables likewise. The fixtures write those one at a time; the
 * entries whose cells write orders run serially too.
 */
let writeQueue: Promise<unknown> = Promise.resolve();
export function writeOneAtATime<T>(work: () => Promise<T>): Promise<T> {
  const run = writeQueue.then(work, work);
  writeQueue = run.catch(() => undefined);
  return run;
}

/** A verbal order, awaiting co-signature, on a fresh patient. */
export async function verbalOrder(
  w: World,
  unit: UnitCode,
  device: "venturi_mask" | "nasal_cannula" = "venturi_mask",
): Promise<OrderRef> {
  const { patientId, mrn } = await freshPatient(unit);
  const body = { ...orderFields(patientId, device), ...verbal(w, unit) };
  const res = await writeOneAtATime(() => w.writer.json("/api/v1/orders", "POST", body));
  const { order } = (await expectCreated(res, "verbal order")) as {
    order: { id: number; version: number };
  };
  return { orderId: order.id, version: order.version, patientId, mrn };
}

/** A physician's written, active order on a fresh patient. */
export async function writtenOrder(w: World, unit: UnitCode): Promise<OrderRef> {
  const { patientId, mrn } = await freshPatient(unit);
  const body = { ...orderFields(patientId), ...written };
  const res = await writeOneAtATime(() => w.signer.json("/api/v1/orders", "POST", body));
  const { order } = (await expectCreated(res, "written order")) as {
    order: { id: number; version: number };
  };
  return { orderId: order.id, version: order.version, patientId, mrn };
}

export async function settingsVersion(patientId: number): Promise<number> {
  const row = (await appDb()("bedside_settings")
    .where({ patient_id: patientId })
    .first("version")) as { version: number };
  return row.version;
}

/** An SpO2 of 87 % under a 92–96 % order: the open below-band alert it raises. */
export async function openAlert(w: World, unit: UnitCode, patientId?: number): Promise<number> {
  const id = patientId ?? (await verbalOrder(w, unit)).patientId;
  const reading = {
    patientId: id,
    takenAt: new Date().toISOString(),
    spo2: 87,
    device: "venturi_mask",
    fio2: 0.35,
  };
  await expectCreated(
    await writeOneAtATime(() => w.writer.json("/api/v1/readings", "POST", reading)),
    "low reading",
  );
  const alert = (await appDb()("alerts")
    .where({ patient_id: id })
    .whereNot({ state: "resolved" })
    .first("id")) as { id: number } | undefined;
  if (!alert) throw new Error(`fixture alert: none opened for patient ${id}`);
  return alert.id;
}

let uploads = 0;

/** A blood gas CSV with one good row for the patient, unique so it is never "the same file again". */
export function gasCsv(mrn: string): { csv: string; name: string } {
  uploads += 1;
  const sampled = new Date(Date.now() - 40 * 60_000 + uploads * 1000).toISOString();
  const csv = [
    "MRN,Sampled at,Sample type,pH,PaO2 (mmHg),PaCO2 (mmHg),SaO2 (%),Hb (g/dL),FiO2",
    `${mrn},${sampled},arterial,7.39,${70 + (uploads % 20)},41,93.5,12.1,0.35`,
  ].join("\n");
  return { csv, name: `matrix-${uploads}.csv` };
}

export function uploadForm(unitId: number, mrn: string): FormData {
  const { csv, name } = gasCsv(mrn);
  const form = new FormData();
  form.set("kind", "blood_gas_csv");
  form.set("unitId", String(unitId));
  form.set("file", new Blob([csv], { type: "text/csv" }), name);
  return form;
}

/** A previewed upload of the unit's shared patient: its id and good-row count. */
export async function previewedImport(
  w: World,
  unit: UnitCode,
): Promise<{ importId: number; accepted: number }> {
  const form = uploadForm(w.unitId[unit], w.shared[unit].mrn);
  const res = await w.writer.fetch("/api/v1/imports", { method: "POST", body: form });
  const { import: preview } = (await expectCreated(res, "upload")) as {
    import: { id: number; counts: { accepted: number } };
  };
  return { importId: preview.id, accepted: preview.counts.accepted };
}

/** An active read token of the admin's, straight into the table (its secret is never needed). */
export async function apiToken(w: World): Promise<number> {
  const secret = `tdm_${randomBytes(32).toString("base64url")}`;
  const [id] = await appDb()("api_tokens").insert({
    name: `matrix ${randomUUID().slice(0, 8)}`,
    token_hash: hashApiToken(secret),
    prefix: secret.slice(0, 12),
    scope: "read",
    created_by: w.adminId,
    expires_at: new Date(Date.now() + 30 * 86_400_000),
  });
  await appDb()("api_token_units").insert({ api_token_id: Number(id), unit_id: w.unitId[OWN] });
  return Number(id);
}

export function stepTableFields(unitId: number) {
  return {
    unitId,
    name: `Matrix table ${randomUUID().slice(0, 8)}`,
    kind: "flow_fio2" as const,
    source: "",
    rows: [
      { fio2Min: 0.3, fio2Max: 0.3, flow: 30 },
      { fio2Min: 0.4, fio2Max: 0.4, flow: 40 },
    ],
    rationale: "Access matrix fixture",
  };
}

/** A unit's own step table, made by a seeded admin through the service. */
export async function stepTable(unitId: number): Promise<{ id: number; version: number }> {
  const admin = await actorByEmail(SEEDED.admin);
  const table = await writeOneAtATime(() =>
    createStepTable(appDb(), admin, stepTableFields(unitId)),
  );
  return { id: table.id, version: table.version };
}

/** A small rehearsal body for the unit (1 patient × 1 h on the published lower-PEEP table). */
export async function rehearsalBody(unitId: number, label = "Matrix rehearsal") {
  const lower = (await appDb()("step_tables")
    .where({ code: "ardsnet-lower-peep" })
    .first("id")) as { id: number };
  const cfg = alertConfig();
  return {
    ...rehearsalFormDefaults({
      unitId,
      ventilatedTableId: lower.id,
      detection: cfg,
      escalateAfterMinutes: cfg.escalateAfterMs / 60_000,
    }),
    label,
    patients: 1,
    hours: 1,
    seed: 1,
  };
}

/** A unit's rehearsal, asked for by a seeded physician on both units. */
async function rehearsal(unitId: number): Promise<number> {
  const physician = await actorByEmail(SEEDED.physician);
  const input = parseInput(rehearsalCreateSchema, await rehearsalBody(unitId));
  return (await requestRehearsal(appDb(), physician, input)).id;
}

/** One patient of the unit with an order, an open alert and a previewed upload; a unit step table and a rehearsal. */
async function sharedRecords(w: World, unit: UnitCode): Promise<void> {
  const { patientId, mrn, orderId } = await verbalOrder(w, unit);
  const alertId = await openAlert(w, unit, patientId);
  const stepTableId = (await stepTable(w.unitId[unit])).id;
  const rehearsalId = await rehearsal(w.unitId[unit]);
  w.shared[unit] = { patientId, mrn, orderId, alertId, stepTableId, rehearsalId, importId: 0 };
  // The upload names the shared patient, so it comes once the rest is in place.
  w.shared[unit].importId = (await previewedImport(w, unit)).importId;
}

/** Signs in one fresh user per role (once: the cells reuse the cookies) and writes the shared records. */
export async function setUpWorld(): Promise<World> {
  const units = (await appDb()("units").whereIn("code", [OWN, OTHER]).select("id", "code")) as {
    id: number;
    code: UnitCode;
  }[];
  const unitId = Object.fromEntries(units.map((u) => [u.code, u.id])) as Record<UnitCode, number>;
  const users = await Promise.all(ROLES.map((role) => newUser(role)));
  const [writerUser, signerUser] = await Promise.all([
    newUser("therapist", "matrix-writer", [OWN, OTHER]),
    newUser("physician", "matrix-signer", [OWN, OTHER]),
  ]);
  const [sessions, writer, signer, admin, target] = await Promise.all([
    Promise.all(users.map((u) => Session.signIn(u.email))),
    Session.signIn(writerUser.email),
    Session.signIn(signerUser.email),
    actorByEmail(SEEDED.admin),
    newUser("nurse", "matrix-target"),
  ]);
  const actor = Object.fromEntries(
    ROLES.map((role, i) => [role, { id: users[i]!.id, session: sessions[i]! }]),
  ) as World["actor"];
  const w: World = {
    unitId,
    actor,
    writer,
    signer,
    prescriber: { [OWN]: actor.physician.id, [OTHER]: signerUser.id } as Record<UnitCode, number>,
    adminId: admin.id,
    userId: target.id,
    shared: {} as Record<UnitCode, Shared>,
  };
  await Promise.all([sharedRecords(w, OWN), sharedRecords(w, OTHER)]);
  return w;
}
