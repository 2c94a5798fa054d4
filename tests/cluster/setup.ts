/**
 * Patients, sessions and an API token for the cluster tests, made through the
 * load balancer like any client's. Patients are fresh (invented), on MICU.
 */
import { randomUUID } from "node:crypto";
import { createApiToken } from "../../lib/api-tokens/service";
import { actorByEmail, admitTestPatient, appDb, SEEDED } from "../helpers/db";
import { Session } from "../helpers/http";
import { hfncOrder } from "../helpers/orders";

export type TestPatient = { patientId: number; mrn: string; bed: string };

export async function freshPatient(): Promise<TestPatient> {
  const { patientId, bedId } = await admitTestPatient("MICU");
  const p = (await appDb()("patients").where({ id: patientId }).first("mrn")) as { mrn: string };
  const b = (await appDb()("beds").where({ id: bedId }).first("label")) as { label: string };
  return { patientId, mrn: p.mrn, bed: b.label };
}

/** A fresh patient on a signed high-flow order; its order id and settings version. */
export async function patientOnHfnc(
  physician: Session,
): Promise<TestPatient & { orderId: number; settingsVersion: number }> {
  const p = await freshPatient();
  const res = await physician.json("/api/v1/orders", "POST", {
    ...hfncOrder(p.patientId, { rationale: "Cluster test patient" }),
    idempotencyKey: randomUUID(),
  });
  if (res.status !== 201)
    throw new Error(`order for the test patient: ${res.status} ${await res.text()}`);
  const { order } = (await res.json()) as { order: { id: number } };
  const s = (await appDb()("bedside_settings")
    .where({ patient_id: p.patientId })
    .first("version")) as { version: number };
  return { ...p, orderId: order.id, settingsVersion: s.version };
}

export async function signIn(who: keyof typeof SEEDED): Promise<Session> {
  const s = await Session.signIn(SEEDED[who]);
  const me = await s.fetch("/api/v1/me");
  if (me.status !== 200) throw new Error(`sign-in as ${who} failed: ${me.status}`);
  return s;
}

export async function monitorToken(): Promise<string> {
  const admin = await actorByEmail(SEEDED.admin);
  const unitIds = (await appDb()("units").where({ code: "MICU" }).pluck("id")) as number[];
  const { token } = await createApiToken(appDb(), admin, {
    currentPassword: "tidemark-demo",
    name: `Cluster monitor ${randomUUID().slice(0, 6)}`,
    scope: "write",
    unitIds,
    validDays: 1,
  });
  return token;
}
