import { randomUUID } from "node:crypto";
import { afterAll, describe, expect, it } from "vitest";
import { GET as health } from "@/app/api/health/route";
import { transact } from "@/lib/transaction";
import { appDb, ownerDb } from "../helpers/db";

// What a multi-primary cluster (Galera) asks of the schema and the writes: every
// table has a primary key (rows are replicated by it), and a transaction that
// lost a conflict is run again as a whole.

const owner = ownerDb();
afterAll(() => owner.destroy());

describe("schema on a cluster", () => {
  it("gives every table a primary key", async () => {
    const rows = (await appDb().raw(
      `SELECT t.TABLE_NAME AS name FROM information_schema.TABLES t
        WHERE t.TABLE_SCHEMA = DATABASE() AND t.TABLE_TYPE IN ('BASE TABLE', 'SYSTEM VERSIONED')
          AND NOT EXISTS (SELECT 1 FROM information_schema.TABLE_CONSTRAINTS c
            WHERE c.TABLE_SCHEMA = t.TABLE_SCHEMA AND c.TABLE_NAME = t.TABLE_NAME
              AND c.CONSTRAINT_TYPE = 'PRIMARY KEY')`,
    )) as [{ name: string }[]];
    const tables = (await appDb().raw(
      "SELECT COUNT(*) AS n FROM information_schema.TABLES WHERE TABLE_SCHEMA = DATABASE()",
    )) as [{ n: number }[]];
    expect(tables[0][0]?.n).toBeGreaterThan(20);
    expect(rows[0].map((r) => r.name)).toEqual([]);
  });
});

describe("transact", () => {
  it("runs a deadlock victim again as a whole and logs the retry", async () => {
    const table = `probe_${randomUUID().slice(0, 8)}`;
    await owner.schema.createTable(table, (t) => {
      t.integer("id").primary();
      t.integer("v").notNullable();
    });
    try {
      await owner(table).insert([
        { id: 1, v: 0 },
        { id: 2, v: 0 },
      ]);
      // Both lock their first row before either asks for its second: a real
      // InnoDB deadlock, one victim. Later attempts do not wait at the barrier.
      let locked = 0;
      let release!: () => void;
      const bothLocked = new Promise<void>((resolve) => (release = resolve));
      const lines: string[] = [];
      const attempts = { a: 0, b: 0 };
      const write = (name: "a" | "b", first: number, second: number) =>
        transact(
          owner,
          async (trx) => {
            attempts[name] += 1;
            await trx(table).where({ id: first }).increment("v", 1);
            if (++locked === 2) release();
            await bothLocked;
            await trx(table).where({ id: second }).increment("v", 1);
          },
          { label: `probe ${name}`, log: (line) => lines.push(line) },
        );
      await Promise.all([write("a", 1, 2), write("b", 2, 1)]);
      const rows = (await owner(table).orderBy("id").select("v")) as { v: number }[];
      // Each committed exactly once: a retried attempt left nothing behind.
      expect(rows.map((r) => r.v)).toEqual([2, 2]);
      expect(attempts.a + attempts.b).toBe(3);
      expect(lines).toHaveLength(1);
      expect(lines[0]).toMatch(/^\[db\] probe [ab] committed after 1 retry$/);
    } finally {
      await owner.schema.dropTableIfExists(table);
    }
  });

  it("does not run again after an error that is not a lost conflict", async () => {
    let calls = 0;
    await expect(
      transact(appDb(), async (trx) => {
        calls += 1;
        await trx.raw("SELECT * FROM no_such_table_here");
      }),
    ).rejects.toThrow(/no_such_table_here/);
    expect(calls).toBe(1);
  });
});

describe("GET /api/health", () => {
  it("answers 200 while the database answers, for the load balancer's check", async () => {
    const res = await health();
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ status: "ok" });
  });
});
