import "./lib/local-env";
import type { Knex } from "knex";
import { connectionConfig } from "./lib/db";

// Migrations and seeds run as the owner account (DDL rights); the app itself
// connects as the least-privilege user in lib/db.ts.
const config: Knex.Config = {
  client: "mysql2",
  connection: connectionConfig("owner"),
  pool: { min: 0, max: 4 },
  migrations: {
    directory: "./db/migrations",
    extension: "ts",
    loadExtensions: [".ts"],
    tableName: "knex_migrations",
  },
  seeds: { directory: "./db/seeds", extension: "ts", loadExtensions: [".ts"] },
};

export default config;
