import type { Knex } from "knex";
import { TooManyRequestsError } from "./errors";

/**
 * Per-user quotas for the reads that cost the server most, in fixed windows
 * (one minute unless named) counted in the database (one count for every app
 * server). Over the quota: 429 with Retry-After, the seconds until the window
 * turns. Password-reset requests are counted per typed address and per client
 * address, known account or not, so the quota says nothing about who exists.
 */
type Quota = { perWindow: number; windowMinutes?: number; what: string };

export const QUOTAS = {
  ledger_verify: { perWindow: 6, what: "ledger verifications" },
  ledger_export: { perWindow: 10, what: "ledger exports" },
  fhir_export: { perWindow: 30, what: "FHIR exports" },
  forecast: { perWindow: 120, what: "forecasts" },
  reset_account: {
    perWindow: 3,
    windowMinutes: 60,
    what: "password-reset requests for this address",
  },
  reset_client: {
    perWindow: 20,
    windowMinutes: 60,
    what: "password-reset requests from your network address",
  },
  link_client: {
    perWindow: 30,
    windowMinutes: 60,
    what: "passwords set from e-mailed links from your network address",
  },
} as const satisfies Record<string, Quota>;
export type QuotaBucket = keyof typeof QUOTAS;

/** Counts one request of `subject` (a user, or a token) and refuses it past the quota. */
export async function consumeQuota(
  knex: Knex,
  subject: string,
  bucket: QuotaBucket,
  now: Date = new Date(),
): Promise<void> {
  const { perWindow, windowMinutes = 1, what }: Quota = QUOTAS[bucket];
  const windowMs = windowMinutes * 60_000;
  const windowStart = new Date(Math.floor(now.getTime() / windowMs) * windowMs);
  await knex.raw(
    "INSERT INTO request_quotas (subject, bucket, window_start, used) VALUES (?, ?, ?, 1) ON DUPLICATE KEY UPDATE used = used + 1",
    [subject, bucket, windowStart],
  );
  const row = (await knex("request_quotas")
    .where({ subject, bucket, window_start: windowStart })
    .first("used")) as { used: number } | undefined;
  if ((row?.used ?? 0) > perWindow) {
    const retry = Math.max(1, Math.ceil((windowStart.getTime() + windowMs - now.getTime()) / 1000));
    throw new TooManyRequestsError(
      `Too many ${what}: at most ${perWindow} ${windowMinutes === 1 ? "a minute" : `in ${windowMinutes} minutes`}. Try again in ${retry < 90 ? `${retry} seconds` : `${Math.ceil(retry / 60)} minutes`}.`,
      retry,
    );
  }
  // Old windows are dropped now and then by whoever is counting.
  if (Math.random() < 0.01) {
    await knex("request_quotas")
      .where("window_start", "<", new Date(now.getTime() - 2 * 3600_000))
      .delete();
  }
}
