import type { Knex } from "knex";

export type UnitSummary = {
  id: number;
  code: string;
  name: string;
  kind: "icu" | "ward";
  altitudeM: number;
  timeZone: string;
};

export async function listUnits(knex: Knex, onlyIds?: readonly number[]): Promise<UnitSummary[]> {
  const q = knex("units").where({ active: true }).orderBy("code");
  if (onlyIds) q.whereIn("id", onlyIds);
  const rows = (await q.select("id", "code", "name", "kind", "altitude_m", "time_zone")) as {
    id: number;
    code: string;
    name: string;
    kind: "icu" | "ward";
    altitude_m: number;
    time_zone: string;
  }[];
  return rows.map((r) => ({
    id: r.id,
    code: r.code,
    name: r.name,
    kind: r.kind,
    altitudeM: r.altitude_m,
    timeZone: r.time_zone,
  }));
}
