import type { Knex } from "knex";
import { ardsNetworkTable, ardsNetworkTableSource } from "../../lib/oxygen";

export async function up(knex: Knex): Promise<void> {
  // The step-table library: built-in published tables (unit_id NULL) and each
  // unit's own, which admins edit.
  await knex.schema.createTable("step_tables", (t) => {
    t.increments("id").primary();
    t.integer("unit_id").unsigned().nullable().references("units.id");
    t.string("code", 40).notNullable().unique("step_tables_code_unique");
    t.string("name", 120).notNullable();
    t.enum("kind", ["fio2_peep", "flow_fio2"]).notNullable();
    t.text("source").nullable();
    t.boolean("built_in").notNullable().defaultTo(false);
    t.boolean("active").notNullable().defaultTo(true);
    t.integer("version").unsigned().notNullable().defaultTo(1);
    t.datetime("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
  });
  await knex.schema.createTable("step_table_rows", (t) => {
    t.increments("id").primary();
    t.integer("step_table_id")
      .unsigned()
      .notNullable()
      .references("step_tables.id")
      .onDelete("CASCADE");
    t.integer("position").unsigned().notNullable();
    // A published range (e.g. PEEP 18–24) is stored as min and max; a single value has min = max.
    t.decimal("fio2_min", 3, 2).notNullable();
    t.decimal("fio2_max", 3, 2).notNullable();
    t.decimal("peep_min_cmh2o", 4, 1).nullable();
    t.decimal("peep_max_cmh2o", 4, 1).nullable();
    t.decimal("flow_l_min", 4, 1).nullable();
    t.unique(["step_table_id", "position"], { indexName: "step_table_rows_table_position_unique" });
  });

  const builtIns = [
    {
      code: "ardsnet-lower-peep",
      name: "ARDS Network lower PEEP / higher FiO2",
      table: "lower-peep" as const,
    },
    {
      code: "ardsnet-higher-peep",
      name: "ARDS Network higher PEEP / lower FiO2",
      table: "higher-peep" as const,
    },
  ];
  for (const b of builtIns) {
    const [id] = await knex("step_tables").insert({
      code: b.code,
      name: b.name,
      kind: "fio2_peep",
      source: ardsNetworkTableSource(b.table),
      built_in: true,
    });
    const range = (v: number | readonly [number, number]) => (typeof v === "number" ? [v, v] : v);
    await knex("step_table_rows").insert(
      ardsNetworkTable(b.table).map((row, position) => {
        const [fio2Min, fio2Max] = range(row.fio2);
        const [peepMin, peepMax] = range(row.peep);
        return {
          step_table_id: id,
          position,
          fio2_min: fio2Min,
          fio2_max: fio2Max,
          peep_min_cmh2o: peepMin,
          peep_max_cmh2o: peepMax,
        };
      }),
    );
  }
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("step_table_rows");
  await knex.schema.dropTableIfExists("step_tables");
}
