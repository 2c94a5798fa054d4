import { createHmac, timingSafeEqual } from "node:crypto";
import { mkdir, readFile, rename, writeFile } from "node:fs/promises";
import path from "node:path";
import type { LedgerKeys } from "./hash";

export const ANCHOR_FORMAT = "tidemark-ledger-anchor/1";

/** One chain head as anchored: chain key, last sequence number, last row's hash. */
export type AnchorHead = [chainKey: string, seq: number, hash: string];

/**
 * The chain heads at one moment, signed with the anchor key. Kept outside the
 * database, so whoever rewinds, truncates or deletes a chain inside it cannot
 * also move the record of how far each chain had reached.
 */
export type LedgerAnchor = {
  format: typeof ANCHOR_FORMAT;
  database: string;
  createdAt: string;
  heads: AnchorHead[];
  mac: string;
};

export type AnchorRead =
  | { status: "none" }
  | { status: "invalid"; problem: string }
  | { status: "ok"; anchor: LedgerAnchor };

function anchorMac(keys: LedgerKeys, a: Omit<LedgerAnchor, "mac">): string {
  return createHmac("sha256", keys.anchor)
    .update(JSON.stringify([a.format, a.database, a.createdAt, a.heads]))
    .digest("hex");
}

export function signAnchor(
  keys: LedgerKeys,
  body: { database: string; createdAt: Date; heads: AnchorHead[] },
): LedgerAnchor {
  const unsigned = {
    format: ANCHOR_FORMAT,
    database: body.database,
    createdAt: body.createdAt.toISOString(),
    heads: body.heads,
  } as const;
  return { ...unsigned, mac: anchorMac(keys, unsigned) };
}

const isHead = (h: unknown): h is AnchorHead =>
  Array.isArray(h) &&
  h.length === 3 &&
  typeof h[0] === "string" &&
  Number.isSafeInteger(h[1]) &&
  typeof h[2] === "string";

/** Checks shape and signature; anything else is reported, never trusted. */
export function checkAnchor(keys: LedgerKeys, value: unknown): AnchorRead {
  const v = value as Partial<LedgerAnchor> | null;
  if (
    !v ||
    v.format !== ANCHOR_FORMAT ||
    typeof v.database !== "string" ||
    typeof v.createdAt !== "string" ||
    !Array.isArray(v.heads) ||
    !v.heads.every(isHead) ||
    typeof v.mac !== "string"
  ) {
    return { status: "invalid", problem: "the anchor file is not a ledger anchor" };
  }
  const anchor = v as LedgerAnchor;
  const expected = Buffer.from(anchorMac(keys, anchor), "hex");
  const given = Buffer.from(anchor.mac, "hex");
  if (given.length !== expected.length || !timingSafeEqual(given, expected)) {
    return {
      status: "invalid",
      problem:
        "the anchor's signature does not match: it was altered, or signed with another LEDGER_HMAC_KEY",
    };
  }
  return { status: "ok", anchor };
}

export async function readAnchorFile(file: string, keys: LedgerKeys): Promise<AnchorRead> {
  let text: string;
  try {
    text = await readFile(file, "utf8");
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === "ENOENT") return { status: "none" };
    throw error;
  }
  try {
    return checkAnchor(keys, JSON.parse(text));
  } catch {
    return { status: "invalid", problem: "the anchor file is not valid JSON" };
  }
}

/** Written beside the target and renamed over it, so a reader never sees half a file. */
export async function writeAnchorFile(file: string, anchor: LedgerAnchor): Promise<void> {
  await mkdir(path.dirname(file), { recursive: true });
  const tmp = `${file}.${process.pid}.tmp`;
  await writeFile(tmp, JSON.stringify(anchor) + "\n", "utf8");
  await rename(tmp, file);
}
