import { randomUUID } from "node:crypto";
import knex, { type Knex } from "knex";
import type { Actor } from "@/lib/auth/actor";
import { loadActor } from "@/lib/auth/actor-queries";
import { connectionConfig, db } from "@/lib/db";

/**
 * Integration tests run against the throw-away database `npm test` creates
 * (DATABASE_NAME), migrated and seeded with the demo scenario.
 */
export function appDb(): Knex {
  if (!process.env.DATABASE_NAME?.startsWith("tidemark_test_")) {
    throw new Error(
      "Integration tests need DATABASE_NAME=tidemark_test_…; run them through `npm test`.",
    );
  }
  return db();
}

/** A second pool as the owner account, for what the application user may not do. */
export function ownerDb(): Knex {
  return knex({
    client: "mysql2",
    connection: connectionConfig("owner"),
    pool: { min: 0, max: 2 },
  });
}

export async function actorByEmail(email: string): Promise<Actor> {
  const row = (await appDb()("users").where({ email }).first("id")) as { id: number } | undefined;
  if (!row) throw new Error(`No seeded user ${email}`);
  return loadActor(appDb(), row.id);
}

/** Unique per test, so tests never depend on each other's rows. */
export function uniqueEmail(prefix = "user"): string {
  return `${prefix}-${randomUUID().slice(0, 8)}@test.kestrel.example`;
}

export const SEEDED = {
  admin: "wren.achterberg@kestrel.example",
  physician: "ines.varga@kestrel.example",
  therapist: "jonah.pell@kestrel.example",
  nurse: "hana.whitlock@kestrel.example",
  reviewer: "edith.calloway@kestrel.example",
} as const;

/** A fresh patient admitted to a fresh bed on the given unit, so tests never share clinical state. */
export async function admitTestPatient(
  unitCode: "MICU" | "RESP" = "MICU",
): Promise<{ patientId: number; unitId: number; bedId: number }> {
  const knex = appDb();
  const unit = (await knex("units").where({ code: unitCode }).first("id")) as { id: number };
  const tag = randomUUID().slice(0, 8);
  const [bedId] = await knex("beds").insert({
    unit_id: unit.id,
    label: `T${tag}`,
    sort_order: 900,
  });
  const [patientId] = await knex("patients").insert({
    mrn: `TST${tag}`,
    family_name: "Testcase",
    given_name: "Iris",
    birth_date: "1961-05-20",
    sex: "female",
    height_cm: 165,
  });
  await knex("admissions").insert({
    patient_id: patientId,
    bed_id: bedId,
    admitted_at: new Date(Date.now() - 3600_000),
  });
  return { patientId: Number(patientId), unitId: unit.id, bedId: Number(bedId) };
}
