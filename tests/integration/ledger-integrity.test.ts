import { randomInt } from "node:crypto";
import { mkdtemp, readFile, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import type { Knex } from "knex";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/lib/db";
import { anchorLedger } from "@/lib/ledger/anchor";
import { signAnchor } from "@/lib/ledger/anchor-file";
import {
  deriveLedgerKeys,
  GENESIS_HASH,
  keyedLedgerHash,
  unkeyedLedgerHash,
  type HashedLedgerFields,
} from "@/lib/ledger/hash";
import { ledgerKeys } from "@/lib/ledger/keys";
import { appendLedger, chainKeyFor, SYSTEM_ACTOR, type LedgerRow } from "@/lib/ledger/service";
import { verifyLedger, type LedgerVerification } from "@/lib/ledger/verify";
import { appDb } from "../helpers/db";
import { scratchDb, type ScratchDb } from "../helpers/scratch-db";

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(path.join(tmpdir(), "tidemark-anchor-"));
});
afterAll(async () => {
  await closeDb();
  await rm(dir, { recursive: true, force: true });
});

/** A patient id no other test uses, so each test owns its chain. */
const freshPatient = () => 900_000_000 + randomInt(90_000_000);
const anchorFile = () => path.join(dir, `anchor-${randomInt(1e9)}.json`);

async function append(knex: Knex, patientId: number, n: number): Promise<LedgerRow[]> {
  const rows: LedgerRow[] = [];
  for (let i = 0; i < n; i++) {
    rows.push(
      await knex.transaction((trx) =>
        appendLedger(trx, SYSTEM_ACTOR, {
          action: "reading.chart",
          entityType: "reading",
          entityId: i + 1,
          patientId,
          after: { spo2: 90 + i },
        }),
      ),
    );
  }
  return rows;
}

const problemsOf = (result: LedgerVerification, chainKey: string) =>
  (result.problems ?? []).filter((p) => p.chainKey === chainKey).map((p) => p.problem);

const refusal = (p: Promise<unknown>) =>
  p.then(
    () => null,
    (e: { errno?: number; sqlMessage?: string }) => e,
  );

describe("chain heads are guarded at the database level", () => {
  it("refuses to move a chain head backwards, for the application's account", async () => {
    const patientId = freshPatient();
    const [first, second] = await append(appDb(), patientId, 2);
    const refused = await refusal(
      appDb()("ledger_chains")
        .where({ chain_key: second!.chainKey })
        .update({ last_seq: first!.chainSeq, last_hash: first!.hash }),
    );
    expect(refused?.errno).toBe(1644);
    expect(refused?.sqlMessage).toMatch(/only advances by one row/);
    const head = (await appDb()("ledger_chains")
      .where({ chain_key: second!.chainKey })
      .first()) as {
      last_seq: number;
      last_hash: string;
    };
    expect(head).toMatchObject({ last_seq: second!.chainSeq, last_hash: second!.hash });
  });

  it("refuses to advance a head past its stored rows or onto a hash no row has", async () => {
    const patientId = freshPatient();
    const [row] = await append(appDb(), patientId, 1);
    const key = row!.chainKey;
    const skip = await refusal(
      appDb()("ledger_chains").where({ chain_key: key }).update({ last_seq: 5 }),
    );
    expect(skip?.errno).toBe(1644);
    const phantom = await refusal(
      appDb()("ledger_chains")
        .where({ chain_key: key })
        .update({ last_seq: row!.chainSeq + 1, last_hash: "f".repeat(64) }),
    );
    expect(phantom?.sqlMessage).toMatch(/must name its next stored row/);
  });

  it("refuses to DELETE a chain head, for the application's account", async () => {
    const patientId = freshPatient();
    const [row] = await append(appDb(), patientId, 1);
    const refused = await refusal(
      appDb().raw("DELETE FROM ledger_chains WHERE chain_key = ?", [row!.chainKey]),
    );
    expect(refused?.errno).toBe(1644);
    expect(refused?.sqlMessage).toMatch(/cannot be deleted/);
    expect(
      await appDb()("ledger_chains").where({ chain_key: row!.chainKey }).first(),
    ).toBeDefined();
  });

  it("moves the head with each stored row: refuses a row with no head, or not next to it", async () => {
    const [row] = await append(appDb(), freshPatient(), 1);
    const entry = (over: Record<string, unknown>) =>
      appDb()("ledger_entries").insert({
        chain_key: row!.chainKey,
        chain_seq: row!.chainSeq + 1,
        prev_hash: row!.hash,
        hash: "e".repeat(64),
        actor_role: "system",
        occurred_at: new Date(),
        action: "reading.chart",
        entity_type: "reading",
        entity_id: "1",
        ...over,
      });
    const headless = await refusal(
      entry({
        chain_key: chainKeyFor({ patientId: freshPatient() }),
        chain_seq: 1,
        prev_hash: GENESIS_HASH,
      }),
    );
    expect(headless?.sqlMessage).toMatch(/needs its chain head/);
    // Keys compare as bytes: another case is another (headless) chain.
    const otherCase = await refusal(entry({ chain_key: row!.chainKey.toUpperCase() }));
    expect(otherCase?.sqlMessage).toMatch(/needs its chain head/);
    const unlinked = await refusal(entry({ prev_hash: GENESIS_HASH }));
    expect(unlinked?.sqlMessage).toMatch(/linked to the old head/);
    const skipped = await refusal(entry({ chain_seq: row!.chainSeq + 2 }));
    expect(skipped?.sqlMessage).toMatch(/only advances by one row/);
    // Each refusal took its row with it; the head did not move.
    expect(await appDb()("ledger_entries").where("hash", "e".repeat(64)).first("id")).toBe(
      undefined,
    );
    expect(
      await appDb()("ledger_chains")
        .where({ chain_key: row!.chainKey })
        .first("last_seq", "last_hash"),
    ).toMatchObject({ last_seq: row!.chainSeq, last_hash: row!.hash });
  });

  it("refuses a new chain head that does not start at row 0", async () => {
    const refused = await refusal(
      appDb()("ledger_chains").insert({
        chain_key: chainKeyFor({ patientId: freshPatient() }),
        last_seq: 3,
        last_hash: GENESIS_HASH,
      }),
    );
    expect(refused?.errno).toBe(1644);
  });
});

describe("the full verify recomputes what the application wrote", () => {
  it("at any millisecond, in any script, short rows and long ones", async () => {
    const patientId = freshPatient();
    const times = [
      "2026-12-04T09:00:00.000Z",
      "2026-12-04T09:00:00.009Z",
      "2026-12-04T09:00:00.999Z",
    ];
    const notes = ["Sättigung 94 % — ok", '呼吸 😀 \u2028 "quoted" \\ \n', "x".repeat(6_000) + "é"];
    for (const [i, at] of times.entries()) {
      await appDb().transaction((trx) =>
        appendLedger(
          trx,
          SYSTEM_ACTOR,
          {
            action: "reading.chart",
            entityType: "reading",
            entityId: i + 1,
            patientId,
            after: { note: notes[i] },
            rationale: notes[i],
          },
          new Date(at),
        ),
      );
    }
    const result = await verifyLedger(appDb(), { anchorPath: null });
    expect(problemsOf(result, chainKeyFor({ patientId }))).toEqual([]);
    expect(result.ok).toBe(true);
  });
});

describe("anchors outside the database", () => {
  it("anchors a verified ledger; the incremental verify checks only rows after the anchor", async () => {
    const file = anchorFile();
    const patientId = freshPatient();
    await append(appDb(), patientId, 2);
    const first = await anchorLedger(appDb(), { path: file });
    expect(first).toMatchObject({ written: true, verification: { ok: true, mode: "full" } });
    const stored = JSON.parse(await readFile(file, "utf8")) as { heads: [string, number][] };
    expect(stored.heads).toContainEqual([chainKeyFor({ patientId }), 2, expect.any(String)]);

    await append(appDb(), patientId, 3);
    const incremental = await verifyLedger(appDb(), { anchorPath: file, mode: "incremental" });
    expect(incremental).toMatchObject({ ok: true, mode: "incremental", checked: 3 });
    expect(incremental.anchor?.createdAt).toBe(first.anchor?.createdAt);
    const full = await verifyLedger(appDb(), { anchorPath: file });
    expect(full).toMatchObject({ ok: true, mode: "full" });
    expect(full.checked).toBeGreaterThan(incremental.checked);

    // The next anchor extends the last one, after an incremental check.
    const second = await anchorLedger(appDb(), { path: file });
    expect(second).toMatchObject({
      written: true,
      verification: { mode: "incremental", checked: 3 },
    });
  });

  it("reports an anchor that was altered or signed with another key, and keeps it", async () => {
    const file = anchorFile();
    expect((await anchorLedger(appDb(), { path: file })).written).toBe(true);
    const anchor = JSON.parse(await readFile(file, "utf8")) as {
      heads: [string, number, string][];
    };
    const [first] = anchor.heads;
    // Rewinding a head in the file to hide a truncation breaks the signature.
    first![1] -= 1;
    await writeFile(file, JSON.stringify(anchor));
    const altered = await verifyLedger(appDb(), { anchorPath: file });
    expect(altered.ok).toBe(false);
    expect(altered.firstBroken).toMatchObject({ id: 0, chainKey: "(anchor)" });
    expect(altered.firstBroken?.problem).toMatch(/signature does not match/);
    // The worker leaves it in place as evidence.
    const evidence = await readFile(file, "utf8");
    expect(await anchorLedger(appDb(), { path: file })).toMatchObject({ written: false });
    expect(await readFile(file, "utf8")).toBe(evidence);

    const other = deriveLedgerKeys("another-ledger-key-of-at-least-32-chars");
    await writeFile(
      file,
      JSON.stringify(signAnchor(other, { database: "x", createdAt: new Date(), heads: [] })),
    );
    expect((await verifyLedger(appDb(), { anchorPath: file })).firstBroken?.problem).toMatch(
      /signed with another LEDGER_HMAC_KEY/,
    );
  });
});

describe("tampering is detected", () => {
  let scratch: ScratchDb | undefined;
  // Each test damages a database of its own; the run's test database stays intact.
  const fresh = async (tag: string) => {
    await scratch?.drop();
    scratch = await scratchDb(tag);
    await scratch.migrate();
    return scratch;
  };
  afterAll(async () => {
    await scratch?.drop();
  });

  it("a row appended by the application's account without the key", async () => {
    const { app } = await fresh("forge");
    const file = anchorFile();
    const honest = freshPatient();
    const victim = freshPatient();
    await append(app, honest, 2);
    const [, last] = await append(app, victim, 2);
    expect((await anchorLedger(app, { path: file })).written).toBe(true);
    const anchorText = await readFile(file, "utf8");

    // The forger can INSERT and move the head onto its row (the trigger checks
    // the link, not the key), but can only hash without the key.
    const fields: HashedLedgerFields = {
      chainKey: last!.chainKey,
      chainSeq: last!.chainSeq + 1,
      prevHash: last!.hash,
      actorUserId: null,
      actorRole: "system",
      occurredAt: new Date("2026-12-04T09:00:00.000Z"),
      action: "order.discontinue",
      entityType: "order",
      entityId: "1",
      patientId: victim,
      unitId: null,
      beforeJson: null,
      afterJson: '{"status":"discontinued"}',
      rationale: null,
    };
    const hash = unkeyedLedgerHash(fields);
    const [forgedId] = await app("ledger_entries").insert({
      chain_key: fields.chainKey,
      chain_seq: fields.chainSeq,
      prev_hash: fields.prevHash,
      hash,
      actor_user_id: null,
      actor_role: fields.actorRole,
      occurred_at: fields.occurredAt,
      action: fields.action,
      entity_type: fields.entityType,
      entity_id: fields.entityId,
      patient_id: victim,
      unit_id: null,
      before_json: null,
      after_json: fields.afterJson,
      rationale: null,
    });
    await app("ledger_chains")
      .where({ chain_key: fields.chainKey })
      .update({ last_seq: fields.chainSeq, last_hash: hash });

    const full = await verifyLedger(app, { anchorPath: null });
    expect(full.ok).toBe(false);
    expect(full.firstBroken).toMatchObject({
      id: Number(forgedId),
      chainKey: last!.chainKey,
      chainSeq: fields.chainSeq,
    });
    expect(full.firstBroken?.problem).toMatch(/hashed without the ledger key/);
    expect(problemsOf(full, chainKeyFor({ patientId: honest }))).toEqual([]);

    const incremental = await verifyLedger(app, { anchorPath: file, mode: "incremental" });
    expect(incremental).toMatchObject({ ok: false, mode: "incremental", checked: 0 });
    expect(problemsOf(incremental, last!.chainKey)).toEqual([
      expect.stringMatching(/hashed without the ledger key/),
    ]);

    // The worker will not anchor the forged state: the last good anchor stays.
    expect(await anchorLedger(app, { path: file })).toMatchObject({ written: false });
    expect(await readFile(file, "utf8")).toBe(anchorText);
  });

  it("a row keyed with a guessed key is reported as not matching its keyed hash", async () => {
    const { app } = await fresh("guess");
    const [row] = await append(app, freshPatient(), 1);
    const fields: HashedLedgerFields = {
      chainKey: row!.chainKey,
      chainSeq: 2,
      prevHash: row!.hash,
      actorUserId: null,
      actorRole: "system",
      occurredAt: new Date("2026-12-04T09:00:00.000Z"),
      action: "reading.chart",
      entityType: "reading",
      entityId: "2",
      patientId: null,
      unitId: null,
      beforeJson: null,
      afterJson: null,
      rationale: null,
    };
    const guessed = keyedLedgerHash(deriveLedgerKeys("a-guessed-key-that-is-long-enough!"), fields);
    expect(guessed).not.toBe(keyedLedgerHash(ledgerKeys(), fields));
    await app("ledger_entries").insert({
      chain_key: fields.chainKey,
      chain_seq: 2,
      prev_hash: fields.prevHash,
      hash: guessed,
      actor_role: "system",
      occurred_at: fields.occurredAt,
      action: fields.action,
      entity_type: fields.entityType,
      entity_id: fields.entityId,
    });
    const result = await verifyLedger(app, { anchorPath: null });
    expect(result.firstBroken).toMatchObject({ chainKey: row!.chainKey, chainSeq: 2 });
    // The insert moved the head onto it (the triggers check the link, not the key):
    // only the row's hash gives it away.
    expect(result.firstBroken?.problem).toMatch(/does not match its keyed hash/);
  });

  it("the last rows of a chain truncated by the database owner, head rewound to match", async () => {
    const { app, owner } = await fresh("trunc");
    const file = anchorFile();
    const victim = freshPatient();
    const other = freshPatient();
    const rows = await append(app, victim, 5);
    await append(app, other, 2);
    expect((await anchorLedger(app, { path: file })).written).toBe(true);
    await append(app, other, 1);

    // What an owner covering their tracks does: lift the triggers, cut the
    // tail, rewind the head onto the new last row, put the triggers back.
    const key = rows[0]!.chainKey;
    await owner.raw("DROP TRIGGER ledger_entries_no_delete");
    await owner.raw("DROP TRIGGER ledger_chains_advance_only");
    await owner("ledger_entries").where({ chain_key: key }).where("chain_seq", ">", 3).delete();
    await owner("ledger_chains")
      .where({ chain_key: key })
      .update({ last_seq: 3, last_hash: rows[2]!.hash });

    // The database alone is self-consistent again…
    expect(await verifyLedger(app, { anchorPath: null })).toMatchObject({ ok: true });
    // …the anchor is not.
    for (const mode of ["full", "incremental"] as const) {
      const result = await verifyLedger(app, { anchorPath: file, mode });
      expect(result).toMatchObject({ ok: false, mode });
      expect(problemsOf(result, key)).toEqual([
        expect.stringMatching(/head was rewound to row 3 \(the anchor of .* recorded row 5\)/),
        expect.stringMatching(/chain ends at row 3 .* recorded row 5: rows were removed/),
      ]);
      expect(problemsOf(result, chainKeyFor({ patientId: other }))).toEqual([]);
    }
  });

  it("a chain head deleted by the database owner, with or without its rows", async () => {
    const { app, owner } = await fresh("delhead");
    const file = anchorFile();
    const [kept] = await append(app, freshPatient(), 2);
    const [gone] = await append(app, freshPatient(), 3);
    expect((await anchorLedger(app, { path: file })).written).toBe(true);

    await owner.raw("DROP TRIGGER ledger_chains_no_delete");
    await owner("ledger_chains").where({ chain_key: kept!.chainKey }).delete();
    // Rows left behind give the deleted head away even without an anchor.
    const alone = await verifyLedger(app, { anchorPath: null });
    expect(problemsOf(alone, kept!.chainKey)).toEqual([
      expect.stringMatching(/chain head is missing \(deleted\); its rows run to 2/),
    ]);

    // A whole chain removed leaves nothing inside the database to notice.
    await owner.raw("DROP TRIGGER ledger_entries_no_delete");
    await owner("ledger_entries").where({ chain_key: gone!.chainKey }).delete();
    await owner("ledger_chains").where({ chain_key: gone!.chainKey }).delete();
    expect(problemsOf(await verifyLedger(app, { anchorPath: null }), gone!.chainKey)).toEqual([]);
    for (const mode of ["full", "incremental"] as const) {
      const result = await verifyLedger(app, { anchorPath: file, mode });
      expect(result.ok).toBe(false);
      expect(problemsOf(result, gone!.chainKey)).toEqual([
        expect.stringMatching(/chain head was deleted \(the anchor of .* recorded row 3\)/),
        expect.stringMatching(/chain ends at row 0/),
      ]);
      expect(problemsOf(result, kept!.chainKey)[0]).toMatch(/chain head was deleted/);
    }
  });
});

describe("the migration re-keys existing rows", () => {
  let scratch: ScratchDb | undefined;
  afterAll(async () => {
    await scratch?.drop();
  });

  it("re-keys rows written under the unkeyed scheme, and refuses a ledger that does not verify", async () => {
    scratch = await scratchDb("rekey");
    const { owner, app } = scratch;
    await scratch.migrate({ until: "20261203000100" });
    // Rows as the application wrote them before: plain SHA-256, no key.
    const legacy = async (chainKey: string, n: number, corruptAt?: number) => {
      let prevHash = GENESIS_HASH;
      await owner("ledger_chains").insert({
        chain_key: chainKey,
        last_seq: 0,
        last_hash: prevHash,
      });
      for (let seq = 1; seq <= n; seq++) {
        const f: HashedLedgerFields = {
          chainKey,
          chainSeq: seq,
          prevHash,
          actorUserId: null,
          actorRole: "system",
          occurredAt: new Date(Date.UTC(2026, 11, 1, 8, seq, 0, 123)),
          action: "reading.chart",
          entityType: "reading",
          entityId: String(seq),
          patientId: null,
          unitId: null,
          beforeJson: null,
          afterJson: `{"spo2":${90 + seq}}`,
          rationale: null,
        };
        const hash = unkeyedLedgerHash(f);
        await owner("ledger_entries").insert({
          chain_key: chainKey,
          chain_seq: seq,
          prev_hash: prevHash,
          hash,
          actor_role: "system",
          occurred_at: f.occurredAt,
          action: f.action,
          entity_type: f.entityType,
          entity_id: f.entityId,
          after_json: seq === corruptAt ? '{"spo2":99}' : f.afterJson,
        });
        prevHash = hash;
      }
      await owner("ledger_chains")
        .where({ chain_key: chainKey })
        .update({ last_seq: n, last_hash: prevHash });
    };
    await legacy("admin", 3);
    await legacy("patient:1", 2, 2);
    const rekey = (await import("@/db/migrations/20261204000100_ledger_entries_keyed")) as {
      up(k: Knex): Promise<void>;
    };
    await expect(rekey.up(owner)).rejects.toThrow(
      /row \d+ \(chain patient:1, row 2\) does not verify under the unkeyed SHA-256 scheme; nothing was changed/,
    );
    const untouched = (await owner("ledger_entries").orderBy("id").pluck("hash")) as string[];
    await owner.raw("DROP TRIGGER ledger_entries_no_delete");
    await owner("ledger_entries").where({ chain_key: "patient:1" }).delete();
    await owner("ledger_chains").where({ chain_key: "patient:1" }).delete();
    await owner.raw(
      `CREATE TRIGGER ledger_entries_no_delete BEFORE DELETE ON ledger_entries FOR EACH ROW SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'ledger_entries is append-only: DELETE refused'`,
    );

    await scratch.migrate({ after: "20261203000100" });
    const rekeyed = (await owner("ledger_entries").orderBy("id").pluck("hash")) as string[];
    expect(rekeyed).toHaveLength(3);
    rekeyed.forEach((h, i) => expect(h).not.toBe(untouched[i]));
    expect(await verifyLedger(app, { anchorPath: null })).toMatchObject({
      ok: true,
      checked: 3,
    });
    // The append-only trigger is back after the rewrite, and appends continue the chain.
    await expect(owner.raw("UPDATE ledger_entries SET rationale = 'x'")).rejects.toMatchObject({
      errno: 1644,
    });
    const next = await app.transaction((trx) =>
      appendLedger(trx, SYSTEM_ACTOR, { action: "user.update", entityType: "user", entityId: 1 }),
    );
    expect(next).toMatchObject({ chainKey: "admin", chainSeq: 4 });
    expect((await verifyLedger(app, { anchorPath: null })).ok).toBe(true);
  });
});
