import type { Knex } from "knex";
import { hashPassword } from "../../lib/auth/password";
import { DEVICES } from "../../lib/devices";
import { DEMO_PASSWORD, DEMO_USERS, demoPatients } from "../demo/people";

const UNITS = [
  {
    code: "MICU",
    name: "Medical ICU",
    kind: "icu",
    beds: 12,
    devices: DEVICES,
    fallbackEmail: "micu-desk@kestrel.example",
    occupied: [1, 2, 3, 4, 5, 6, 7, 8, 10, 11],
  },
  {
    code: "RESP",
    name: "Respiratory Ward",
    kind: "ward",
    beds: 20,
    // The ward does not ventilate: a patient who needs NIV or a ventilator moves to the ICU.
    devices: DEVICES.filter((d) => d !== "niv" && d !== "invasive"),
    fallbackEmail: "resp-desk@kestrel.example",
    occupied: [1, 2, 3, 4, 5, 6, 7, 9, 10, 11, 12, 14, 15, 16, 17, 19],
  },
] as const;

/** Start of the 12-hour shift (07:00 or 19:00 UTC) that contains `now`. */
export function shiftStart(now: Date): Date {
  const start = new Date(now);
  start.setUTCMinutes(0, 0, 0);
  const h = now.getUTCHours();
  if (h >= 19) start.setUTCHours(19);
  else if (h >= 7) start.setUTCHours(7);
  else {
    start.setUTCDate(start.getUTCDate() - 1);
    start.setUTCHours(19);
  }
  return start;
}

/**
 * The demo scenario. Seeds only an empty database, so `npm run demo` can run
 * again without losing what was done in the app (`npm run demo:reset` starts over).
 */
export async function seed(knex: Knex): Promise<void> {
  const existing = (await knex("users").count({ n: "*" }).first()) as { n: number | string };
  if (Number(existing.n) > 0) {
    console.log("[seed] database already has users; leaving the demo data as it is");
    return;
  }
  const now = new Date();
  const passwordHash = await hashPassword(DEMO_PASSWORD);

  await knex.transaction(async (trx) => {
    const unitIds = new Map<string, number>();
    const bedIds = new Map<string, number>();
    for (const u of UNITS) {
      const [unitId] = await trx("units").insert({
        code: u.code,
        name: u.name,
        kind: u.kind,
        altitude_m: 40,
        time_zone: "UTC",
        shift_start: "07:00",
        shift_hours: 12,
        devices_json: JSON.stringify(u.devices),
        fallback_email: u.fallbackEmail,
      });
      unitIds.set(u.code, Number(unitId));
      for (let n = 1; n <= u.beds; n++) {
        const label = `${u.code === "MICU" ? "I" : "R"}${String(n).padStart(2, "0")}`;
        const [bedId] = await trx("beds").insert({ unit_id: unitId, label, sort_order: n });
        bedIds.set(`${u.code}:${n}`, Number(bedId));
      }
    }

    const userIds = new Map<string, number>();
    for (const user of DEMO_USERS) {
      const [id] = await trx("users").insert({
        email: user.email,
        name: user.name,
        role: user.role,
        password_hash: passwordHash,
        pressure_unit: user.email.startsWith("edith") ? "kPa" : "mmHg",
      });
      userIds.set(user.email, Number(id));
      await trx("user_units").insert(
        user.units.map((code) => ({ user_id: id, unit_id: unitIds.get(code)! })),
      );
    }

    // Each unit designates its attending physician to co-sign verbal orders naming another
    // prescriber; Dr Ines Varga, on both units, co-signs only the orders that name her.
    await trx("unit_cosigners").insert([
      { unit_id: unitIds.get("MICU")!, user_id: userIds.get("tobias.renwick@kestrel.example")! },
      { unit_id: unitIds.get("RESP")!, user_id: userIds.get("amara.obi-lund@kestrel.example")! },
    ]);

    const occupied = UNITS.flatMap((u) => u.occupied.map((n) => `${u.code}:${n}`));
    const patients = demoPatients(occupied.length);
    for (const [i, key] of occupied.entries()) {
      const [patientId] = await trx("patients").insert(patients[i]!);
      const admittedAt = new Date(now.getTime() - (20 + ((i * 13) % 100)) * 3600_000);
      await trx("admissions").insert({
        patient_id: patientId,
        bed_id: bedIds.get(key)!,
        admitted_at: admittedAt,
      });
    }

    // Care team for the previous, current and next shift.
    const current = shiftStart(now);
    const id = (email: string) => userIds.get(email)!;
    const teams = [
      {
        charge: { MICU: "hana.whitlock", RESP: "greta.sorensen" },
        nurses: {
          MICU: ["hana.whitlock", "felix.adeyemi"],
          RESP: ["greta.sorensen", "mateo.ruskin"],
        },
        therapist: { MICU: "jonah.pell", RESP: "saoirse.mendez" },
      },
      {
        charge: { MICU: "lior.brandt", RESP: "noor.halvorsen" },
        nurses: {
          MICU: ["lior.brandt", "lior.brandt"],
          RESP: ["noor.halvorsen", "noor.halvorsen"],
        },
        therapist: { MICU: "priya.castellan", RESP: "priya.castellan" },
      },
    ];
    const rows: Record<string, unknown>[] = [];
    const chargeRows: Record<string, unknown>[] = [];
    for (const offset of [-1, 0, 1]) {
      const startsAt = new Date(current.getTime() + offset * 12 * 3600_000);
      const endsAt = new Date(startsAt.getTime() + 12 * 3600_000);
      const team = teams[Math.abs(offset) % 2]!;
      for (const u of UNITS) {
        chargeRows.push({
          unit_id: unitIds.get(u.code)!,
          user_id: id(`${team.charge[u.code]}@kestrel.example`),
          starts_at: startsAt,
          ends_at: endsAt,
        });
        for (let n = 1; n <= u.beds; n++) {
          const bedId = bedIds.get(`${u.code}:${n}`)!;
          const nurse = team.nurses[u.code][n <= u.beds / 2 ? 0 : 1]!;
          rows.push({
            bed_id: bedId,
            user_id: id(`${nurse}@kestrel.example`),
            duty: "nurse",
            starts_at: startsAt,
            ends_at: endsAt,
          });
          rows.push({
            bed_id: bedId,
            user_id: id(`${team.therapist[u.code]}@kestrel.example`),
            duty: "therapist",
            starts_at: startsAt,
            ends_at: endsAt,
          });
          const physician = u.code === "MICU" ? "tobias.renwick" : "amara.obi-lund";
          rows.push({
            bed_id: bedId,
            user_id: id(`${physician}@kestrel.example`),
            duty: "physician",
            starts_at: startsAt,
            ends_at: endsAt,
          });
        }
      }
    }
    await trx.batchInsert("care_assignments", rows, 200);
    await trx("unit_charge_duties").insert(chargeRows);
  });
  console.log(`[seed] demo seeded: ${DEMO_USERS.length} users, ${occupied()} occupied beds`);
}

function occupied(): number {
  return UNITS.reduce((n, u) => n + u.occupied.length, 0);
}
