import { randomUUID } from "node:crypto";
import type { Knex } from "knex";
import { createApiToken } from "@/lib/api-tokens/service";
import { hashPassword } from "@/lib/auth/password";
import { DEMO_PASSWORD } from "../browser";
import { actorByEmail, admitTestPatient, appDb } from "../db";
import { hfncOrder } from "../orders";
import { Session } from "../http";
import type { Who } from "./case";
import type { Own } from "./deep";
import type { ReadIds } from "./reads";
import type { Context } from "./routes";
import type { Clients } from "./runner";
import { bodySpecs, type Ids } from "./specs";

/**
 * The fuzz's own accounts: quotas (request_quotas) and password throttles
 * (sign_in_attempts) are per account and persist in the shared e2e database,
 * so nothing the fuzz does can use up what another test's seeded user needs.
 */
async function newUser(
  knex: Knex,
  role: string,
  hash: string,
  unitIds: number[],
): Promise<{ id: number; email: string }> {
  const email = `fuzz-${role}-${randomUUID().slice(0, 8)}@test.kestrel.example`;
  const [id] = await knex("users").insert({
    email,
    name: `Fuzz ${role}`,
    role,
    password_hash: hash,
  });
  await knex("user_units").insert(unitIds.map((unit_id) => ({ user_id: Number(id), unit_id })));
  return { id: Number(id), email };
}

const numbers = async (q: Knex.QueryBuilder): Promise<number[]> =>
  ((await q) as { id: number }[]).map((r) => Number(r.id));

/** Ids the generators point at: what the test database holds now. */
async function gatherIds(knex: Knex): Promise<Ids & ReadIds> {
  const orders = (await knex("orders")
    .orderBy("id", "desc")
    .limit(200)
    .select("id", "version")) as { id: number; version: number }[];
  return {
    patients: await numbers(knex("patients").select("id")),
    orders: orders.map((o) => o.id),
    orderVersion: [...new Set(orders.map((o) => o.version))],
    units: await numbers(knex("units").select("id")),
    physicians: await numbers(knex("users").where({ role: "physician" }).select("id")),
    alerts: await numbers(knex("alerts").orderBy("id", "desc").limit(200).select("id")),
    imports: await numbers(knex("imports").orderBy("id", "desc").limit(100).select("id")),
    users: await numbers(knex("users").orderBy("id").limit(100).select("id")),
  };
}

export type Accounts = Record<
  "physician" | "therapist" | "admin" | "victim",
  { id: number; email: string }
>;

export async function fuzzSetup(): Promise<{ clients: Clients; ctx: Context; accounts: Accounts }> {
  const knex = appDb();
  const units = await numbers(knex("units").select("id"));
  const hash = await hashPassword(DEMO_PASSWORD);
  const physician = await newUser(knex, "physician", hash, units);
  const therapist = await newUser(knex, "therapist", hash, units);
  const admin = await newUser(knex, "admin", hash, units);
  // Acknowledges handoffs (a nurse-only write), so its bodies reach the schema.
  const nurse = await newUser(knex, "nurse", hash, units);
  // The only account the account-write routes may name: a nurse no one signs in as.
  const victim = await newUser(knex, "nurse", hash, units);
  const { token } = await createApiToken(knex, await actorByEmail(admin.email), {
    name: `Fuzz engine ${randomUUID().slice(0, 8)}`,
    scope: "write",
    unitIds: units,
    validDays: 1,
    currentPassword: DEMO_PASSWORD,
  });
  const sessions: Partial<Record<Who, Session>> = {
    physician: await Session.signIn(physician.email),
    therapist: await Session.signIn(therapist.email),
    admin: await Session.signIn(admin.email),
    nurse: await Session.signIn(nurse.email),
  };
  const ids = await gatherIds(knex);
  return {
    clients: { sessions, token },
    ctx: { ids, specs: bodySpecs(ids), token, victimUserId: victim.id },
    accounts: { physician, therapist, admin, victim },
  };
}

/**
 * The sampled phase's own rows: a patient admitted twelve hours ago to a fresh
 * MICU bed, with a signed high-flow order in effect (so adjustments have
 * settings to start from).
 */
export async function ownRows(clients: Clients, accounts: Accounts): Promise<Own> {
  const knex = appDb();
  const { patientId, unitId, bedId } = await admitTestPatient("MICU");
  await knex("admissions")
    .where({ patient_id: patientId })
    .update({ admitted_at: new Date(Date.now() - 12 * 3600_000) });
  const { mrn } = (await knex("patients").where({ id: patientId }).first("mrn")) as { mrn: string };
  const { label } = (await knex("beds").where({ id: bedId }).first("label")) as { label: string };
  const { code } = (await knex("units").where({ id: unitId }).first("code")) as { code: string };
  const res = await clients.sessions.physician!.json(
    "/api/v1/orders",
    "POST",
    hfncOrder(patientId),
  );
  if (res.status !== 201)
    throw new Error(`the own patient's first order was refused: ${res.status} ${await res.text()}`);
  // The unit writes' own unit (the fuzz admin a member), so no other test's unit changes.
  const [fuzzUnitId] = await knex("units").insert({
    code: `FZ${randomUUID().slice(0, 8).toUpperCase()}`,
    name: "Fuzz Unit",
    kind: "ward",
    devices_json: JSON.stringify(["nasal_cannula", "venturi_mask"]),
  });
  await knex("user_units").insert({ user_id: accounts.admin.id, unit_id: fuzzUnitId });
  const [fuzzBedId] = await knex("beds").insert({ unit_id: fuzzUnitId, label: "FZ1" });
  return {
    fuzzUnitId: Number(fuzzUnitId),
    fuzzBedId: Number(fuzzBedId),
    patientId,
    mrn,
    bed: label,
    unitId,
    unitCode: code,
    victimUserId: accounts.victim.id,
    victimEmail: accounts.victim.email,
    therapistId: accounts.therapist.id,
  };
}
