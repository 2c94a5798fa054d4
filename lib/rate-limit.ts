import type { Knex } from "knex";
import { TooManyRequestsError } from "./errors";

/**
 * Per-user quotas for the reads that cost the server most, in fixed one-minute
 * windows counted in the database (one count for every app server). Over the
 * quota: 429 with Retry-After, the seconds until the window turns.
 */
export const QUOTAS = {
  ledger_verify: { perMinute: 6, what: "ledger verifications" },
  ledger_export: { perMinute: 10, what: "ledger exports" },
  fhir_export: { perMinute: 30, what: "FHIR exports" },
  forecast: { perMinute: 120, what: "forecasts" },
  rehearsal: { perMinute: 6, what: "rehearsals" },
} as const;
export type QuotaBucket = keyof typeof QUOTAS;

const WINDOW_MS = 60_000;

/** Counts one request of `subject` (a user, or a token) and refuses it past the quota. */
export async function consumeQuota(
  knex: Knex,
  subject: string,
  bucket: QuotaBucket,
  now: Date = new Date(),
): Promise<void> {
  const windowStart = new Date(Math.floor(now.getTime() / WINDOW_MS) * WINDOW_MS);
  await knex.raw(
    "INSERT INTO request_quotas (subject, bucket, window_start, used) VALUES (?, ?, ?, 1) ON DUPLICATE KEY UPDATE used = used + 1",
    [subject, bucket, windowStart],
  );
  const row = (await knex("request_quotas")
    .where({ subject, bucket, window_start: windowStart })
    .first("used")) as { used: number } | undefined;
  const { perMinute, what } = QUOTAS[bucket];
  if ((row?.used ?? 0) > perMinute) {
    const retry = Math.max(
      1,
      Math.ceil((windowStart.getTime() + WINDOW_MS - now.getTime()) / 1000),
    );
    throw new TooManyRequestsError(
      `Too many ${what}: at most ${perMinute} a minute. Try again in ${retry} seconds.`,
      retry,
    );
  }
  // Old windows are dropped now and then by whoever is counting.
  if (Math.random() < 0.01) {
    await knex("request_quotas")
      .where("window_start", "<", new Date(now.getTime() - 3600_000))
      .delete();
  }
}
