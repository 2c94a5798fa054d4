import { z } from "zod";

// Environment, parsed once with zod. Defaults suit this machine only (README
// "Configuration"); the scripts generate this install's secrets into .env.local
// and production sets every secret itself.

/** The documented demo secret; refused in production unless TIDEMARK_DEMO=1, and always off loopback. */
export const DEMO_SECRET = "tidemark-demo-secret-not-for-production-use";

/** The database passwords earlier versions documented; refused off loopback like DEMO_SECRET. */
export const DEMO_APP_PASSWORD = "tidemark-app-dev";
export const DEMO_OWNER_PASSWORD = "tidemark-owner-dev";

/** True when the URL points at this machine (localhost, 127.0.0.0/8, ::1). */
export function isLoopbackUrl(url: string): boolean {
  const host = new URL(url).hostname.toLowerCase();
  return host === "localhost" || host === "[::1]" || /^127(\.\d{1,3}){3}$/.test(host);
}

/** The documented demo ledger key; refused in production unless TIDEMARK_DEMO=1 (like DEMO_SECRET). */
export const DEMO_LEDGER_KEY = "tidemark-demo-ledger-key-not-for-production-use";

const envSchema = z
  .object({
    NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
    DATABASE_HOST: z.string().min(1).default("127.0.0.1"),
    DATABASE_PORT: z.coerce.number().int().min(1).max(65535).default(3399),
    DATABASE_NAME: z
      .string()
      .regex(/^[A-Za-z0-9_]+$/)
      .default("tidemark"),
    DATABASE_USER: z.string().min(1).default("tidemark_app"),
    DATABASE_PASSWORD: z.string().default(DEMO_APP_PASSWORD),
    DATABASE_OWNER_USER: z.string().min(1).default("tidemark_owner"),
    DATABASE_OWNER_PASSWORD: z.string().default(DEMO_OWNER_PASSWORD),
    DATABASE_POOL_MAX: z.coerce.number().int().min(1).max(100).default(10),
    NEXTAUTH_URL: z.url().default("http://localhost:3000"),
    NEXTAUTH_SECRET: z
      .string()
      .min(32, "NEXTAUTH_SECRET must be at least 32 characters")
      .default(DEMO_SECRET),
    /** Set by `npm run demo` and `npm test`: allows the documented demo secret in a production build. */
    TIDEMARK_DEMO: z.enum(["0", "1"]).default("0"),
    SIGNIN_MAX_FAILURES: z.coerce.number().int().min(1).max(100).default(5),
    SIGNIN_WINDOW_MINUTES: z.coerce.number().int().min(1).max(1440).default(15),
    /**
     * Proxies whose X-Forwarded-For entries are trusted, comma-separated IP
     * addresses (README "Security model"); empty: none.
     */
    TRUSTED_PROXIES: z
      .string()
      .default("")
      .refine(
        // Shape only: this module is also read by the edge middleware (no node:net).
        (v) => v.split(",").every((p) => /^[0-9A-Fa-f:.]*$/.test(p.trim())),
        "TRUSTED_PROXIES must be comma-separated IP addresses",
      ),
    /** Other origins (comma-separated) whose pages may write with a session; NEXTAUTH_URL's always may. */
    ALLOWED_ORIGINS: z.string().default(""),
    /** A session unused this long ends; the next request asks to sign in again. */
    SESSION_IDLE_MINUTES: z.coerce.number().int().min(1).max(720).default(30),
    /** Alerts: how long a monitor series must stay out of band / back in band, escalation delay, urgent grade. */
    ALERT_SUSTAIN_SECONDS: z.coerce.number().int().min(0).max(3600).default(60),
    ALERT_RESOLVE_SECONDS: z.coerce.number().int().min(0).max(86400).default(300),
    ALERT_ESCALATE_MINUTES: z.coerce.number().int().min(1).max(1440).default(10),
    /** An order request unanswered this long is escalated (lib/order-requests/sweep.ts). */
    ORDER_REQUEST_ESCALATE_MINUTES: z.coerce.number().int().min(1).max(1440).default(15),
    ALERT_URGENT_BELOW_PCT: z.coerce.number().int().min(50).max(100).default(85),
    ALERT_URGENT_MARGIN_PCT: z.coerce.number().int().min(1).max(30).default(5),
    /** Share of the sustain window's monitored time that must be out of band, in %. */
    ALERT_SUSTAIN_SHARE_PCT: z.coerce.number().int().min(50).max(100).default(80),
    /** At urgent depth a monitor series opens an urgent alert after this long. */
    ALERT_URGENT_SUSTAIN_SECONDS: z.coerce.number().int().min(0).max(600).default(15),
    /** A monitor series silent this long while an excursion is pending or open: signal loss. */
    ALERT_SIGNAL_LOSS_SECONDS: z.coerce.number().int().min(10).max(3600).default(120),
    /** "Order limits reached" waits for an SpO2 taken at least this long after the change to the limit. */
    ALERT_LIMITS_SETTLE_MINUTES: z.coerce.number().int().min(0).max(60).default(5),
    /** A blood gas older than this drives no forecast unless the clinician chooses it. */
    FORECAST_GAS_MAX_AGE_MINUTES: z.coerce
      .number()
      .int()
      .min(10)
      .max(7 * 24 * 60)
      .default(240),
    /** A forecast is checked by the first arterial gas this many minutes after its change… */
    FORECAST_CHECK_MIN_MINUTES: z.coerce.number().int().min(0).max(240).default(20),
    /** …and no later than this. */
    FORECAST_CHECK_MAX_MINUTES: z.coerce
      .number()
      .int()
      .min(10)
      .max(24 * 60)
      .default(240),
    SMTP_HOST: z.string().default("127.0.0.1"),
    SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(2525),
    SMTP_FROM: z.string().default("Tidemark <tidemark@kestrel.example>"),
    /** "1": TLS from the first byte (port 465); "0": plain, upgraded with STARTTLS off loopback. */
    SMTP_SECURE: z.enum(["0", "1"]).default("0"),
    /** Relay credentials; empty or unset means no authentication (the local fake takes none). */
    SMTP_USER: z.string().optional(),
    SMTP_PASS: z.string().optional(),
    /**
     * How long a worker holds an outbox row while it sends it. A worker that
     * dies mid-send leaves the row to the others once this has passed.
     */
    OUTBOX_CLAIM_SECONDS: z.coerce.number().int().min(5).max(3600).default(120),
    /** HTTP port of the local fake inbox's readable page (`npm run mail:inbox`, the demo). */
    MAIL_INBOX_PORT: z.coerce.number().int().min(1).max(65535).default(2580),
    // --- Account e-mails and co-sign reminders (lib/accounts, lib/orders/cosign-reminders.ts) ---
    /** An invitation link works this many hours. */
    INVITE_LINK_HOURS: z.coerce
      .number()
      .int()
      .min(1)
      .max(30 * 24)
      .default(72),
    /** A password-reset link works this many minutes. */
    RESET_LINK_MINUTES: z.coerce.number().int().min(5).max(1440).default(30),
    /** A verbal or telephone order waiting for co-signature is reminded to its prescriber this often. */
    COSIGN_REMIND_MINUTES: z.coerce.number().int().min(5).max(1440).default(60),
    /** …and escalated to the unit's designated co-signers this many hours after it was entered. */
    COSIGN_ESCALATE_HOURS: z.coerce.number().int().min(1).max(168).default(24),
    // --- Ledger integrity (lib/ledger; README "What the ledger promises") ---
    /** The ledger's HMAC secret. Kept out of the database, so an account that can INSERT cannot forge rows. */
    LEDGER_HMAC_KEY: z
      .string()
      .min(32, "LEDGER_HMAC_KEY must be at least 32 characters")
      .default(DEMO_LEDGER_KEY),
    /** Where the worker writes the signed chain-head anchor; default .data/ledger-anchor.<DATABASE_NAME>.json. */
    LEDGER_ANCHOR_PATH: z.string().min(1).optional(),
    LEDGER_ANCHOR_MINUTES: z.coerce.number().int().min(1).max(1440).default(5),
  })
  .refine((e) => e.FORECAST_CHECK_MIN_MINUTES < e.FORECAST_CHECK_MAX_MINUTES, {
    path: ["FORECAST_CHECK_MAX_MINUTES"],
    message: "FORECAST_CHECK_MAX_MINUTES must be above FORECAST_CHECK_MIN_MINUTES",
  })
  .refine((e) => !e.SMTP_USER || !!e.SMTP_PASS, {
    path: ["SMTP_PASS"],
    message: "set SMTP_PASS together with SMTP_USER",
  })
  .refine(
    (e) =>
      !(
        e.NODE_ENV === "production" &&
        e.TIDEMARK_DEMO !== "1" &&
        e.NEXTAUTH_SECRET === DEMO_SECRET
      ),
    {
      path: ["NEXTAUTH_SECRET"],
      message: "set a real NEXTAUTH_SECRET in production (the demo secret is refused)",
    },
  )
  // The published demo values protect nothing: a server others can reach
  // (NEXTAUTH_URL off this machine) refuses them whatever NODE_ENV or TIDEMARK_DEMO say.
  .superRefine((e, ctx) => {
    if (isLoopbackUrl(e.NEXTAUTH_URL)) return;
    const published = [
      ["NEXTAUTH_SECRET", e.NEXTAUTH_SECRET === DEMO_SECRET],
      ["DATABASE_PASSWORD", e.DATABASE_PASSWORD === DEMO_APP_PASSWORD],
      ["DATABASE_OWNER_PASSWORD", e.DATABASE_OWNER_PASSWORD === DEMO_OWNER_PASSWORD],
      ["LEDGER_HMAC_KEY", e.LEDGER_HMAC_KEY === DEMO_LEDGER_KEY],
    ] as const;
    for (const [name, isDemo] of published) {
      if (isDemo) {
        ctx.addIssue({
          code: "custom",
          path: [name],
          message: `the documented demo value is refused when NEXTAUTH_URL is not this machine; set ${name} (README "Configuration")`,
        });
      }
    }
  })
  // Ledger integrity: the demo key only in the demo and tests; never the session secret.
  .refine(
    (e) =>
      !(
        e.NODE_ENV === "production" &&
        e.TIDEMARK_DEMO !== "1" &&
        e.LEDGER_HMAC_KEY === DEMO_LEDGER_KEY
      ),
    {
      path: ["LEDGER_HMAC_KEY"],
      message: "set a real LEDGER_HMAC_KEY in production (the demo key is refused)",
    },
  )
  .refine((e) => e.LEDGER_HMAC_KEY !== e.NEXTAUTH_SECRET, {
    path: ["LEDGER_HMAC_KEY"],
    message: "LEDGER_HMAC_KEY must differ from NEXTAUTH_SECRET",
  });

export type Env = z.infer<typeof envSchema>;

let cached: Env | undefined;

/** Parses an environment; throws one error listing every problem. */
export function parseEnv(source: Record<string, string | undefined>): Env {
  const parsed = envSchema.safeParse(source);
  if (!parsed.success) {
    const problems = parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`);
    throw new Error(`Invalid environment:\n  ${problems.join("\n  ")}`);
  }
  return parsed.data;
}

/**
 * Parses process.env on first use, so a build without secrets still succeeds;
 * the server calls it once at start (instrumentation.ts) and refuses to run on error.
 */
export function getEnv(): Env {
  if (!cached) cached = parseEnv(process.env);
  return cached;
}
