import { afterAll, describe, expect, it } from "vitest";
import { closeDb } from "@/lib/db";
import { GENESIS_HASH, keyedLedgerHash, type HashedLedgerFields } from "@/lib/ledger/hash";
import { ledgerKeys } from "@/lib/ledger/keys";
import { appendLedger, chainKeyFor } from "@/lib/ledger/service";
import { verifyLedger } from "@/lib/ledger/verify";
import { listLedger } from "@/lib/ledger/queries";
import { transact } from "@/lib/transaction";
import { actorByEmail, admitTestPatient, appDb, ownerDb, SEEDED } from "../helpers/db";

afterAll(async () => {
  await closeDb();
});

async function appendOne(patientId: number | null, rationale: string) {
  const actor = await actorByEmail(SEEDED.admin);
  return appDb().transaction((trx) =>
    appendLedger(trx, actor, {
      action: "user.update",
      entityType: "user",
      entityId: actor.id,
      patientId,
      before: { n: 1 },
      after: { n: 2 },
      rationale,
    }),
  );
}

describe("ledger is append-only at the database level", () => {
  it("refuses UPDATE of a ledger row by the application's database user", async () => {
    const row = await appendOne(null, "append-only update probe");
    const refused = await appDb()
      .raw("UPDATE ledger_entries SET rationale = 'rewritten' WHERE id = ?", [row.id])
      .then(
        () => null,
        (e: { errno?: number; sqlMessage?: string }) => e,
      );
    expect(refused?.errno).toBe(1644);
    expect(refused?.sqlMessage).toMatch(/append-only/);
    const stored = (await appDb()("ledger_entries").where({ id: row.id }).first("rationale")) as {
      rationale: string;
    };
    expect(stored.rationale).toBe("append-only update probe");
  });

  it("refuses DELETE of a ledger row by the application's database user", async () => {
    const row = await appendOne(null, "append-only delete probe");
    await expect(
      appDb().raw("DELETE FROM ledger_entries WHERE id = ?", [row.id]),
    ).rejects.toMatchObject({
      errno: 1644,
    });
    expect(await appDb()("ledger_entries").where({ id: row.id }).first("id")).toBeDefined();
  });

  it("refuses TRUNCATE and DROP to the application's database user (no DDL rights)", async () => {
    const refused = await appDb()
      .raw("TRUNCATE TABLE ledger_entries")
      .then(
        () => null,
        (e: { code?: string }) => e,
      );
    expect(refused?.code).toMatch(/ACCESS_DENIED/);
    await expect(appDb().raw("DROP TRIGGER ledger_entries_no_update")).rejects.toBeDefined();
  });

  it("refuses UPDATE even to the owner account (the trigger, not just grants)", async () => {
    const row = await appendOne(null, "owner probe");
    const owner = ownerDb();
    try {
      await expect(
        owner.raw("UPDATE ledger_entries SET rationale = 'x' WHERE id = ?", [row.id]),
      ).rejects.toMatchObject({ errno: 1644 });
    } finally {
      await owner.destroy();
    }
  });
});

describe("ledger hash chain", () => {
  it("links each row to the previous row of its chain and verifies", async () => {
    const first = await appendOne(1, "chain a");
    const second = await appendOne(1, "chain b");
    expect(second.chainKey).toBe(chainKeyFor({ patientId: 1 }));
    expect(second.chainSeq).toBe(first.chainSeq + 1);
    const stored = (await appDb()("ledger_entries")
      .where({ id: second.id })
      .first("prev_hash")) as {
      prev_hash: string;
    };
    expect(stored.prev_hash).toBe(first.hash);
    const result = await verifyLedger(appDb());
    expect(result).toMatchObject({ ok: true, firstBroken: null });
    expect(result.checked).toBeGreaterThanOrEqual(2);
  });

  it("keeps every chain intact under concurrent writers on the same and different patients", async () => {
    await Promise.all(
      Array.from({ length: 24 }, (_, i) =>
        appendOne(i % 3 === 0 ? 2 : 3 + (i % 5), `concurrent ${i}`),
      ),
    );
    expect((await verifyLedger(appDb())).ok).toBe(true);
  });

  it("refuses to point a chain head anywhere but its next stored row", async () => {
    const row = await appendOne(4, "head tamper probe");
    // The head table must stay writable to advance; the trigger allows nothing else.
    await expect(
      appDb()("ledger_chains")
        .where({ chain_key: row.chainKey })
        .update({ last_hash: GENESIS_HASH }),
    ).rejects.toMatchObject({ errno: 1644 });
    const head = (await appDb()("ledger_chains").where({ chain_key: row.chainKey }).first()) as {
      last_seq: number;
      last_hash: string;
    };
    expect(head).toMatchObject({ last_seq: row.chainSeq, last_hash: row.hash });
    expect((await verifyLedger(appDb())).ok).toBe(true);
  });

  it("a stored row's hash covers its content (recomputing from the row reproduces it)", async () => {
    const row = await appendOne(5, "recompute probe");
    const r = (await appDb()("ledger_entries").where({ id: row.id }).first()) as Record<
      string,
      unknown
    >;
    const fields: HashedLedgerFields = {
      chainKey: r.chain_key as string,
      chainSeq: Number(r.chain_seq),
      prevHash: r.prev_hash as string,
      actorUserId: r.actor_user_id as number,
      actorRole: r.actor_role as string,
      occurredAt: r.occurred_at as Date,
      action: r.action as string,
      entityType: r.entity_type as string,
      entityId: r.entity_id as string,
      patientId: r.patient_id as number,
      unitId: r.unit_id as number | null,
      beforeJson: r.before_json as string,
      afterJson: r.after_json as string,
      rationale: r.rationale as string,
    };
    expect(keyedLedgerHash(ledgerKeys(), fields)).toBe(r.hash);
    expect(keyedLedgerHash(ledgerKeys(), { ...fields, rationale: "recompute probe!" })).not.toBe(
      r.hash,
    );
  });
});

describe("the ledger for people", () => {
  it("lists rows newest first by when they happened, pages without gaps, and finds a patient by MRN", async () => {
    const { patientId } = await admitTestPatient("MICU");
    const unit = (await appDb()("units").where({ code: "MICU" }).first("id")) as { id: number };
    const patient = (await appDb()("patients").where({ id: patientId }).first("mrn")) as {
      mrn: string;
    };
    const physician = await actorByEmail(SEEDED.physician);
    const base = Date.UTC(2026, 10, 30, 8, 0);
    // Written in this order, but the second happened earliest (a back-dated entry).
    for (const minutes of [30, 0, 60, 45]) {
      await transact(appDb(), (trx) =>
        appendLedger(
          trx,
          physician,
          {
            action: "reading.chart",
            entityType: "reading",
            entityId: minutes,
            patientId,
            unitId: unit.id,
          },
          new Date(base + minutes * 60_000),
        ),
      );
    }
    const seen: { entityId: string; occurredAt: string }[] = [];
    let before: number | undefined;
    for (let guard = 0; guard < 10; guard++) {
      const page = await listLedger(appDb(), physician, {
        mrn: patient.mrn,
        limit: 3,
        ...(before ? { before } : {}),
      });
      seen.push(...page.entries.map((e) => ({ entityId: e.entityId, occurredAt: e.occurredAt })));
      expect(page.entries.every((e) => e.patient?.mrn === patient.mrn)).toBe(true);
      if (!page.nextBefore) break;
      before = page.nextBefore;
    }
    expect(seen.map((e) => e.entityId)).toEqual(["60", "45", "30", "0"]);
    const [first] = (await listLedger(appDb(), physician, { patientId, limit: 1 })).entries;
    expect(first?.patient).toEqual({
      id: patientId,
      mrn: patient.mrn,
      name: "TESTCASE, Iris",
    });
  });
});
