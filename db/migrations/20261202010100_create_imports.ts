import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  // One uploaded file or message: kept as it arrived with its SHA-256, so the
  // preview and the import can always be derived again from the original.
  await knex.schema.createTable("imports", (t) => {
    t.increments("id").primary();
    t.enum("kind", ["blood_gas_csv", "hl7", "monitor_csv"]).notNullable();
    // previewed: stored and checked, waiting for a person to confirm; imported: rows written.
    t.enum("status", ["previewed", "imported"]).notNullable();
    t.integer("unit_id").unsigned().notNullable().references("units.id");
    t.string("file_name", 255).notNullable();
    t.specificType("content_sha256", "CHAR(64)").notNullable();
    // sha256 over kind, unit, patient/bed scope and the content hash: the same
    // file for the same place is one import, whatever its name.
    t.specificType("dedupe_key", "CHAR(64)")
      .notNullable()
      .unique({ indexName: "imports_dedupe_key_unique" });
    // HL7 v2: sending application and facility with MSH-10, unique per sender.
    t.string("source_message_id", 255)
      .nullable()
      .unique({ indexName: "imports_source_message_id_unique" });
    t.specificType("original_content", "LONGBLOB").notNullable();
    t.integer("byte_size").unsigned().notNullable();
    // Column mapping and units (blood gas CSV), MRN and bed (monitor CSV).
    t.text("options_json", "longtext").notNullable();
    t.integer("rows_total").unsigned().notNullable().defaultTo(0);
    t.integer("rows_accepted").unsigned().notNullable().defaultTo(0);
    t.integer("rows_rejected").unsigned().notNullable().defaultTo(0);
    // Every rejected row with its reasons, plus the first accepted rows.
    t.text("report_json", "longtext").notNullable();
    t.integer("created_by").unsigned().nullable().references("users.id");
    // The interface engine's token (FK added with api_tokens).
    t.integer("api_token_id").unsigned().nullable();
    t.integer("imported_by").unsigned().nullable().references("users.id");
    t.datetime("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.datetime("imported_at", { precision: 3 }).nullable();
    t.index(["unit_id", "created_at"], "imports_unit_id_created_at_index");
  });
  await knex.schema.alterTable("readings", (t) => {
    t.integer("import_id").unsigned().nullable().references("imports.id");
  });
  await knex.schema.alterTable("blood_gases", (t) => {
    t.integer("import_id").unsigned().nullable().references("imports.id");
  });
  // A blood gas from an interface engine has no person who recorded it; its
  // provenance is import_id → imports.api_token_id. Same as readings.recorded_by.
  await knex.raw("ALTER TABLE blood_gases MODIFY recorded_by INT UNSIGNED NULL");
}

// blood_gases.recorded_by stays nullable on the way down: interface-engine
// gases have no recorder, and refusing them would lose rows.
export async function down(knex: Knex): Promise<void> {
  const gases = await knex.schema.hasColumn("blood_gases", "import_id");
  if (gases) {
    await knex.schema.alterTable("blood_gases", (t) => {
      t.dropForeign(["import_id"]);
      t.dropColumn("import_id");
    });
  }
  const readings = await knex.schema.hasColumn("readings", "import_id");
  if (readings) {
    await knex.schema.alterTable("readings", (t) => {
      t.dropForeign(["import_id"]);
      t.dropColumn("import_id");
    });
  }
  await knex.schema.dropTableIfExists("imports");
}
