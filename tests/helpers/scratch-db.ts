import { readdirSync } from "node:fs";
import path from "node:path";
import knex, { type Knex } from "knex";
import { connectionConfig } from "@/lib/db";
import { ownerDb } from "./db";

// Tests run from the repository root.
const MIGRATIONS = path.resolve("db/migrations");

export type ScratchDb = {
  name: string;
  /** The database owner (DDL rights): one connection, so temporary tables and DDL stay together. */
  owner: Knex;
  /** The application's least-privilege account. */
  app: Knex;
  /** Runs the migrations whose timestamp is after `after` and up to `until` (inclusive). */
  migrate(opts?: { after?: string; until?: string }): Promise<void>;
  drop(): Promise<void>;
};

/**
 * A database of its own beside the run's test database, for tests that must
 * damage the ledger as the owner would: the shared database stays intact for
 * every other test. Named after DATABASE_NAME, so both accounts' grants cover it.
 */
export async function scratchDb(tag: string): Promise<ScratchDb> {
  const base = process.env.DATABASE_NAME;
  if (!base?.startsWith("tidemark_test_")) throw new Error("scratch databases are for tests only");
  const name = `${base}_${tag}`.slice(0, 64);
  const admin = ownerDb();
  try {
    await admin.raw(`DROP DATABASE IF EXISTS \`${name}\``);
    await admin.raw(`CREATE DATABASE \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  } finally {
    await admin.destroy();
  }
  const owner = knex({
    client: "mysql2",
    connection: connectionConfig("owner", name),
    pool: { min: 0, max: 1 },
  });
  const app = knex({
    client: "mysql2",
    connection: connectionConfig("app", name),
    pool: { min: 0, max: 4 },
  });
  return {
    name,
    owner,
    app,
    async migrate({ after, until } = {}) {
      const files = readdirSync(MIGRATIONS)
        .filter((f) => f.endsWith(".ts"))
        .sort()
        .filter((f) => (!after || f > `${after}~`) && (!until || f <= `${until}~`));
      for (const file of files) {
        const migration = (await import(/* @vite-ignore */ path.join(MIGRATIONS, file))) as {
          up(k: Knex): Promise<void>;
        };
        await migration.up(owner);
      }
    },
    async drop() {
      await app.destroy();
      await owner.raw(`DROP DATABASE IF EXISTS \`${name}\``);
      await owner.destroy();
    },
  };
}
