import knex, { type Knex } from "knex";
import { getEnv } from "./env";

declare global {
  // One pool per process, also across Next's dev-mode module reloads.
  var tidemarkKnex: Knex | undefined;
}

/** Connection settings shared by the app pool and the migration runner. */
export function connectionConfig(
  role: "app" | "owner",
  database?: string,
): Knex.MySql2ConnectionConfig {
  const env = getEnv();
  return {
    host: env.DATABASE_HOST,
    port: env.DATABASE_PORT,
    database: database ?? env.DATABASE_NAME,
    user: role === "app" ? env.DATABASE_USER : env.DATABASE_OWNER_USER,
    password: role === "app" ? env.DATABASE_PASSWORD : env.DATABASE_OWNER_PASSWORD,
    timezone: "Z",
    charset: "utf8mb4",
    // DECIMAL columns come back as strings unless told otherwise; clinical values
    // are converted explicitly at the edges instead.
    decimalNumbers: true,
    supportBigNumbers: true,
  };
}

/** The application's single knex instance (least-privilege database user). */
export function db(): Knex {
  if (!globalThis.tidemarkKnex) {
    globalThis.tidemarkKnex = knex({
      client: "mysql2",
      connection: connectionConfig("app"),
      pool: { min: 0, max: getEnv().DATABASE_POOL_MAX },
    });
  }
  return globalThis.tidemarkKnex;
}

/** Closes the pool (tests and scripts). */
export async function closeDb(): Promise<void> {
  if (globalThis.tidemarkKnex) {
    await globalThis.tidemarkKnex.destroy();
    globalThis.tidemarkKnex = undefined;
  }
}
