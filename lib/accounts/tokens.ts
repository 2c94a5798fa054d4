import { createHash, randomBytes } from "node:crypto";

/** The two kinds of e-mailed account link. */
export type AccountTokenKind = "invite" | "reset";

/** Where a link stands; only "valid" sets a password. */
export type AccountTokenState = "valid" | "used" | "voided" | "expired";

/**
 * A new link secret: 32 random bytes, base64url. Only its SHA-256 is stored
 * (like API tokens): the database never holds a working link, and a 256-bit
 * secret needs no slow hash.
 */
export function newAccountToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString("base64url");
  return { token, hash: hashAccountToken(token) };
}

export function hashAccountToken(token: string): string {
  return createHash("sha256").update(token, "utf8").digest("hex");
}

/** Used or voided wins over expired: it says what happened first. */
export function accountTokenState(
  row: { used_at: Date | null; voided_at: Date | null; expires_at: Date },
  now: Date,
): AccountTokenState {
  if (row.used_at) return "used";
  if (row.voided_at) return "voided";
  if (new Date(row.expires_at).getTime() <= now.getTime()) return "expired";
  return "valid";
}

/** The page a link opens. */
export function accountLink(baseUrl: string, token: string): string {
  return `${baseUrl.replace(/\/$/, "")}/set-password?token=${encodeURIComponent(token)}`;
}

/** Stable per link: a retried delivery sends the same Message-ID. */
export function accountMessageId(tokenId: number, kind: AccountTokenKind, domain: string): string {
  return `<account-${tokenId}.${kind}@${domain}>`;
}

/** What the set-password page and its refusals say about a link that no longer works. */
export const TOKEN_REFUSALS: Record<Exclude<AccountTokenState, "valid"> | "unknown", string> = {
  used: "This link was already used. Each link sets a password once; sign in, or ask for a new link.",
  voided:
    "A newer link was sent since this one, so this one no longer works. Use the most recent e-mail.",
  expired:
    "This link has expired. Ask for a new one: on the sign-in page, or from your administrator.",
  unknown:
    "This link is not valid. Check that the whole address was copied, or ask for a new link.",
};
