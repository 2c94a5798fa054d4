import type { Knex } from "knex";

export type StepRowView = {
  fio2Min: number;
  fio2Max: number;
  peepMin: number | null;
  peepMax: number | null;
  flow: number | null;
};

export type StepTableView = {
  id: number;
  unitId: number | null;
  unitCode: string | null;
  code: string;
  name: string;
  kind: "fio2_peep" | "flow_fio2";
  source: string | null;
  builtIn: boolean;
  active: boolean;
  version: number;
  rows: StepRowView[];
};

type TableRow = {
  id: number;
  unit_id: number | null;
  unit_code: string | null;
  code: string;
  name: string;
  kind: "fio2_peep" | "flow_fio2";
  source: string | null;
  built_in: number;
  active: number;
  version: number;
};

/**
 * The step-table library as one unit (or an admin) sees it: the built-in
 * published tables and the tables of the given units.
 */
export async function listStepTables(
  knex: Knex,
  unitIds: readonly number[],
  { includeInactive = false } = {},
): Promise<StepTableView[]> {
  const q = knex("step_tables as t")
    .leftJoin("units as u", "u.id", "t.unit_id")
    .where((w) => {
      void w.whereNull("t.unit_id").orWhereIn("t.unit_id", unitIds.length ? unitIds : [0]);
    })
    .orderBy([{ column: "t.built_in", order: "desc" }, { column: "u.code" }, { column: "t.name" }])
    .select("t.*", "u.code as unit_code");
  if (!includeInactive) q.where("t.active", true);
  const tables = (await q) as TableRow[];
  if (tables.length === 0) return [];
  const rows = (await knex("step_table_rows")
    .whereIn(
      "step_table_id",
      tables.map((t) => t.id),
    )
    .orderBy(["step_table_id", "position"])) as {
    step_table_id: number;
    fio2_min: number;
    fio2_max: number;
    peep_min_cmh2o: number | null;
    peep_max_cmh2o: number | null;
    flow_l_min: number | null;
  }[];
  return tables.map((t) => ({
    id: t.id,
    unitId: t.unit_id,
    unitCode: t.unit_code,
    code: t.code,
    name: t.name,
    kind: t.kind,
    source: t.source,
    builtIn: Boolean(t.built_in),
    active: Boolean(t.active),
    version: t.version,
    rows: rows
      .filter((r) => r.step_table_id === t.id)
      .map((r) => ({
        fio2Min: r.fio2_min,
        fio2Max: r.fio2_max,
        peepMin: r.peep_min_cmh2o,
        peepMax: r.peep_max_cmh2o,
        flow: r.flow_l_min,
      })),
  }));
}

/** One step table with its rows, active or not; undefined when there is none. */
export async function getStepTable(knex: Knex, id: number): Promise<StepTableView | undefined> {
  const row = (await knex("step_tables").where({ id }).first("unit_id")) as
    { unit_id: number | null } | undefined;
  if (!row) return undefined;
  const all = await listStepTables(knex, row.unit_id ? [row.unit_id] : [], {
    includeInactive: true,
  });
  return all.find((t) => t.id === id);
}

/** A step table's name, as an order shows it; null for no table or one that does not exist. */
export async function getStepTableName(knex: Knex, id: number | null): Promise<string | null> {
  if (id === null) return null;
  const row = (await knex("step_tables").where({ id }).first("name")) as
    { name: string } | undefined;
  return row?.name ?? null;
}
