import type { Knex } from "knex";
import type { Role } from "../auth/roles";

export type UserSummary = {
  id: number;
  email: string;
  name: string;
  role: Role;
  active: boolean;
  pressureUnit: "mmHg" | "kPa";
  version: number;
  updatedAt: string;
  units: { id: number; code: string; name: string }[];
  /**
   * How the user signs in: a password of their own, one an administrator set
   * (to be changed at first sign-in), or none yet (invited, or never set).
   */
  password: "own" | "set_by_admin" | "none";
  /** The latest invitation, if any was sent. */
  invitation: Invitation | null;
};

export type Invitation = {
  state: "pending" | "used" | "expired" | "voided";
  sentAt: string;
  expiresAt: string;
};

type UserRow = {
  id: number;
  email: string;
  name: string;
  role: Role;
  active: number;
  pressure_unit: "mmHg" | "kPa";
  version: number;
  updated_at: Date;
  has_password: number;
  password_change_required: number;
};

const USER_COLUMNS = [
  "id",
  "email",
  "name",
  "role",
  "active",
  "pressure_unit",
  "version",
  "updated_at",
  "password_change_required",
] as const;

/** The latest invitation of each user asked about (one query). */
async function latestInvitations(
  knex: Knex,
  userIds: readonly number[] | null,
): Promise<Map<number, Invitation>> {
  const q = knex("account_tokens as t")
    .where("t.kind", "invite")
    .whereNotExists(function newer() {
      void this.from("account_tokens as n")
        .whereRaw("n.user_id = t.user_id")
        .where("n.kind", "invite")
        .whereRaw("n.id > t.id");
    })
    .select("t.user_id", "t.created_at", "t.expires_at", "t.used_at", "t.voided_at");
  if (userIds) void q.whereIn("t.user_id", userIds);
  const rows = (await q) as {
    user_id: number;
    created_at: Date;
    expires_at: Date;
    used_at: Date | null;
    voided_at: Date | null;
  }[];
  const now = Date.now();
  return new Map(
    rows.map((r) => [
      r.user_id,
      {
        state: r.used_at
          ? "used"
          : r.voided_at
            ? "voided"
            : new Date(r.expires_at).getTime() <= now
              ? "expired"
              : "pending",
        sentAt: new Date(r.created_at).toISOString(),
        expiresAt: new Date(r.expires_at).toISOString(),
      },
    ]),
  );
}

/** All users with their units, for the admin area (two queries, no N+1). */
export async function listUsers(knex: Knex): Promise<UserSummary[]> {
  const users = (await knex("users")
    .orderBy("name")
    .select(knex.raw("password_hash IS NOT NULL AS has_password"), ...USER_COLUMNS)) as UserRow[];
  const invitations = await latestInvitations(knex, null);
  const links = (await knex("user_units")
    .join("units", "units.id", "user_units.unit_id")
    .orderBy("units.code")
    .select("user_units.user_id", "units.id", "units.code", "units.name")) as {
    user_id: number;
    id: number;
    code: string;
    name: string;
  }[];
  const byUser = new Map<number, UserSummary["units"]>();
  for (const l of links) {
    const list = byUser.get(l.user_id) ?? [];
    list.push({ id: l.id, code: l.code, name: l.name });
    byUser.set(l.user_id, list);
  }
  return users.map((u) => toSummary(u, byUser.get(u.id) ?? [], invitations.get(u.id) ?? null));
}

export async function getUser(knex: Knex, id: number): Promise<UserSummary | undefined> {
  const u = (await knex("users")
    .where({ id })
    .first(knex.raw("password_hash IS NOT NULL AS has_password"), ...USER_COLUMNS)) as
    UserRow | undefined;
  if (!u) return undefined;
  const units = (await knex("user_units")
    .join("units", "units.id", "user_units.unit_id")
    .where({ user_id: id })
    .orderBy("units.code")
    .select("units.id", "units.code", "units.name")) as UserSummary["units"];
  const invitation = (await latestInvitations(knex, [id])).get(id) ?? null;
  return toSummary(u, units, invitation);
}

function toSummary(
  u: UserRow,
  units: UserSummary["units"],
  invitation: Invitation | null,
): UserSummary {
  return {
    id: u.id,
    email: u.email,
    name: u.name,
    role: u.role,
    active: Boolean(u.active),
    pressureUnit: u.pressure_unit,
    version: u.version,
    updatedAt: u.updated_at.toISOString(),
    units,
    password: !u.has_password ? "none" : u.password_change_required ? "set_by_admin" : "own",
    invitation,
  };
}

/** A physician who can give a verbal or telephone order for a bed. */
export type UnitPhysician = {
  id: number;
  name: string;
  /** On duty for the bed at the moment asked about. */
  onDuty: boolean;
};

/**
 * The unit's active physicians by name, the one on duty for the bed at `now`
 * first: the prescribers a nurse or therapist may enter a verbal order from.
 */
export async function listUnitPhysicians(
  knex: Knex,
  unitId: number,
  bedId: number,
  now: Date,
): Promise<UnitPhysician[]> {
  const [rows, duty] = await Promise.all([
    knex("users as u")
      .join("user_units as uu", "uu.user_id", "u.id")
      .where({ "u.role": "physician", "u.active": true, "uu.unit_id": unitId })
      .orderBy("u.name")
      .select("u.id", "u.name") as Promise<{ id: number; name: string }[]>,
    knex("care_assignments")
      .where({ bed_id: bedId, duty: "physician" })
      .andWhere("starts_at", "<=", now)
      .andWhere("ends_at", ">", now)
      .pluck("user_id") as Promise<number[]>,
  ]);
  // A stable sort keeps the names in order within each group.
  return rows
    .map((r) => ({ id: r.id, name: r.name, onDuty: duty.includes(r.id) }))
    .sort((a, b) => Number(b.onDuty) - Number(a.onDuty));
}
