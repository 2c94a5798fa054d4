import { createHmac } from "node:crypto";
import fc from "fast-check";
import { afterEach, describe, expect, it, vi } from "vitest";
import { checkAnchor, signAnchor, type AnchorHead } from "@/lib/ledger/anchor-file";
import {
  canonicalLedgerEntry,
  deriveLedgerKeys,
  fastLedgerMac,
  GENESIS_HASH,
  keyedLedgerHash,
  unkeyedLedgerHash,
  type HashedLedgerFields,
} from "@/lib/ledger/hash";

const keys = deriveLedgerKeys("a-test-ledger-key-of-at-least-32-chars");

const base: HashedLedgerFields = {
  chainKey: "patient:7",
  chainSeq: 3,
  prevHash: GENESIS_HASH,
  actorUserId: 2,
  actorRole: "therapist",
  occurredAt: new Date("2026-12-01T10:00:00.123Z"),
  action: "reading.chart",
  entityType: "reading",
  entityId: "9",
  patientId: 7,
  unitId: 1,
  beforeJson: null,
  afterJson: '{"spo2":94}',
  rationale: "Sättigung 94 % — ok",
};

describe("ledger keys and entry MAC", () => {
  it("derives separate 64-hex-character keys for entries and anchors", () => {
    expect(keys.entry).toMatch(/^[0-9a-f]{64}$/);
    expect(keys.anchor).toMatch(/^[0-9a-f]{64}$/);
    expect(keys.entry).not.toBe(keys.anchor);
    expect(deriveLedgerKeys("another-test-ledger-key-32-chars-long").entry).not.toBe(keys.entry);
  });

  it("is HMAC-SHA256 under the entry key, and differs from the unkeyed hash and under another key", () => {
    const canonical = JSON.stringify([
      "patient:7",
      3,
      GENESIS_HASH,
      2,
      "therapist",
      "2026-12-01T10:00:00.123Z",
      "reading.chart",
      "reading",
      "9",
      7,
      1,
      null,
      '{"spo2":94}',
      "Sättigung 94 % — ok",
    ]);
    expect(keyedLedgerHash(keys, base)).toBe(
      createHmac("sha256", keys.entry).update(canonical).digest("hex"),
    );
    expect(keyedLedgerHash(keys, base)).not.toBe(unkeyedLedgerHash(base));
    const other = deriveLedgerKeys("another-test-ledger-key-32-chars-long");
    expect(keyedLedgerHash(other, base)).not.toBe(keyedLedgerHash(keys, base));
  });

  it("computes the same MAC on the verifier's fast path as createHmac, for any row", () => {
    const mac = fastLedgerMac(keys.entry);
    // Any code point, and graphemes (combining marks, emoji with joiners).
    const anyText = fc.oneof(
      fc.string({ unit: "binary", maxLength: 300 }),
      fc.string({ unit: "grapheme", maxLength: 200 }),
    );
    const text = fc.option(anyText, { nil: null });
    const id = fc.option(fc.integer({ min: 1, max: 2 ** 31 }), { nil: null });
    fc.assert(
      fc.property(
        fc.string({ maxLength: 64 }),
        fc.nat(),
        fc.stringMatching(/^[0-9a-f]{64}$/),
        id,
        fc.date({
          min: new Date("1000-01-01Z"),
          max: new Date("9999-12-31Z"),
          noInvalidDate: true,
        }),
        text,
        text,
        text,
        (key, seq, prevHash, actor, at, before, after, why) => {
          const f = {
            ...base,
            chainKey: key,
            chainSeq: seq,
            prevHash,
            actorUserId: actor,
            occurredAt: at,
            beforeJson: before,
            afterJson: after,
            rationale: why,
          };
          const canonical = canonicalLedgerEntry(
            f.chainKey,
            f.chainSeq,
            f.prevHash,
            f.actorUserId,
            f.actorRole,
            f.occurredAt.toISOString(),
            f.action,
            f.entityType,
            f.entityId,
            f.patientId,
            f.unitId,
            f.beforeJson,
            f.afterJson,
            f.rationale,
          );
          expect(mac(canonical)).toBe(keyedLedgerHash(keys, f));
        },
      ),
      { numRuns: 3000 },
    );
  });

  it("matches createHmac for messages of every size, short and past its reused buffer, in any order", () => {
    const mac = fastLedgerMac(keys.entry);
    const hmac = (s: string) => createHmac("sha256", keys.entry).update(s).digest("hex");
    // Around the buffer's limit (16 KiB less the 64-byte prefix, 3 bytes a unit).
    const edge = Math.floor((16 * 1024 - 64) / 3);
    for (const n of [0, 1, 55, 56, 64, 119, 120, edge - 1, edge, edge + 1, 20_000]) {
      for (const ch of ["a", "é", "€", "😀"]) {
        const s = ch.repeat(Math.ceil(n / ch.length)).slice(0, n);
        expect(mac(s)).toBe(hmac(s));
      }
    }
    // One instance, many messages: nothing of a longer message may stay behind in the buffer.
    fc.assert(
      fc.property(
        fc.array(
          fc.oneof(
            fc.string({ unit: "binary", maxLength: 100 }),
            fc.string({ unit: "binary", minLength: edge - 20, maxLength: edge + 20 }),
            fc.string({ unit: "grapheme", maxLength: 9_000 }),
          ),
          { minLength: 1, maxLength: 8 },
        ),
        (messages) => {
          for (const s of messages) expect(mac(s)).toBe(hmac(s));
        },
      ),
      { numRuns: 300 },
    );
  });

  it("refuses a fast-path key that is not 64 hex characters", () => {
    expect(() => fastLedgerMac("short")).toThrow(/64 hex/);
  });
});

describe("ledger anchor signature", () => {
  const heads: AnchorHead[] = [
    ["admin", 12, "a".repeat(64)],
    ["patient:7", 3, "b".repeat(64)],
  ];
  const anchor = signAnchor(keys, {
    database: "tidemark",
    createdAt: new Date("2026-12-04T08:00:00Z"),
    heads,
  });

  it("accepts an anchor it signed", () => {
    expect(checkAnchor(keys, JSON.parse(JSON.stringify(anchor)))).toEqual({
      status: "ok",
      anchor,
    });
  });

  it("refuses an anchor whose heads, time or database were changed", () => {
    const rewound = { ...anchor, heads: [["admin", 11, "a".repeat(64)], heads[1]] };
    expect(checkAnchor(keys, rewound)).toMatchObject({ status: "invalid" });
    expect(checkAnchor(keys, { ...anchor, createdAt: "2026-12-05T08:00:00.000Z" })).toMatchObject({
      status: "invalid",
    });
    expect(checkAnchor(keys, { ...anchor, database: "tidemark_other" })).toMatchObject({
      status: "invalid",
    });
  });

  it("refuses an anchor signed with another key, or with the entry key", () => {
    const other = deriveLedgerKeys("another-test-ledger-key-32-chars-long");
    expect(checkAnchor(other, anchor)).toMatchObject({
      status: "invalid",
      problem: expect.stringMatching(/signature/) as unknown,
    });
    const swapped = { entry: keys.anchor, anchor: keys.entry };
    expect(checkAnchor(swapped, anchor)).toMatchObject({ status: "invalid" });
  });

  it("refuses what is not an anchor at all", () => {
    expect(checkAnchor(keys, null)).toMatchObject({ status: "invalid" });
    expect(checkAnchor(keys, { ...anchor, heads: [["admin", "12", "x"]] })).toMatchObject({
      status: "invalid",
    });
  });
});

describe("LEDGER_HMAC_KEY", () => {
  afterEach(() => {
    vi.unstubAllEnvs();
    vi.resetModules();
  });

  async function freshEnv(vars: Record<string, string>) {
    for (const [k, v] of Object.entries(vars)) vi.stubEnv(k, v);
    vi.resetModules();
    return (await import("@/lib/env")).getEnv;
  }

  it("refuses the demo key in production unless TIDEMARK_DEMO=1", async () => {
    const real = { NEXTAUTH_SECRET: "n".repeat(40), NODE_ENV: "production", TIDEMARK_DEMO: "0" };
    const getEnv = await freshEnv({ ...real, LEDGER_HMAC_KEY: "" });
    // An empty value is a set value: too short, so refused as well.
    expect(() => getEnv()).toThrow(/LEDGER_HMAC_KEY/);
    vi.unstubAllEnvs();
    const { DEMO_LEDGER_KEY } = await import("@/lib/env");
    const demo = await freshEnv({ ...real, LEDGER_HMAC_KEY: DEMO_LEDGER_KEY });
    expect(() => demo()).toThrow(/real LEDGER_HMAC_KEY/);
    const allowed = await freshEnv({
      ...real,
      LEDGER_HMAC_KEY: DEMO_LEDGER_KEY,
      TIDEMARK_DEMO: "1",
    });
    expect(allowed().LEDGER_HMAC_KEY).toBe(DEMO_LEDGER_KEY);
  });

  it("refuses the session secret as the ledger key", async () => {
    const getEnv = await freshEnv({
      NEXTAUTH_SECRET: "s".repeat(40),
      LEDGER_HMAC_KEY: "s".repeat(40),
    });
    expect(() => getEnv()).toThrow(/must differ from NEXTAUTH_SECRET/);
  });
});
