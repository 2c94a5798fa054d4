import { z } from "zod";

// Environment, parsed once with zod. Defaults are the documented demo values
// (README "Configuration"); production sets every secret itself.

/** The documented demo secret; refused in production unless TIDEMARK_DEMO=1. */
export const DEMO_SECRET = "tidemark-demo-secret-not-for-production-use";

/** The documented demo ledger key; refused in production unless TIDEMARK_DEMO=1 (like DEMO_SECRET). */
export const DEMO_LEDGER_KEY = "tidemark-demo-ledger-key-not-for-production-use";

const envSchema = z
  .object({
    NODE_ENV: z
      .enum(["development", "production", "test"])
      .default("development"),
    DATABASE_HOST: z.string().min(1).default("127.0.0.1"),
    DATABASE_PORT: z.coerce.number().int().min(1).max(65535).default(3399),
    DATABASE_NAME: z
      .string()
      .regex(/^[A-Za-z0-9_]+$/)
      .default("tidemark"),
    DATABASE_USER: z.string().min(1).default("tidemark_app"),
    DATABASE_PASSWORD: z.string().default("tidemark-app-dev"),
    DATABASE_OWNER_USER: z.string().min(1).default("tidemark_owner"),
    DATABASE_OWNER_PASSWORD: z.string().default("tidemark-owner-dev"),
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
    /** Alerts: how long a monitor series must stay out of band / back in band, escalation delay, urgent grade. */
    ALERT_SUSTAIN_SECONDS: z.coerce.number().int().min(0).max(3600).default(60),
    ALERT_RESOLVE_SECONDS: z.coerce.number().int().min(0).max(86400).default(300),
    ALERT_ESCALATE_MINUTES: z.coerce.number().int().min(1).max(1440).default(10),
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
    FORECAST_GAS_MAX_AGE_MINUTES: z.coerce.number().int().min(10).max(7 * 24 * 60).default(240),
    SMTP_HOST: z.string().default("127.0.0.1"),
    SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(2525),
    SMTP_FROM: z
      .string()
      .default("Tidemark <tidemark@kestrel.example>"),
    /** "1": TLS from the first byte (port 465); "0": plain, upgraded with STARTTLS off loopback. */
    SMTP_SECURE: z.enum(["0", "1"]).default("0"),
    /** Relay credentials; empty or unset means no authentication (the local fake takes none). */
    SMTP_USER: z.string().optional(),
    SMTP_PASS: z.string().optional(),
    /** HTTP port of the local fake inbox's readable page (`npm run mail:inbox`, the demo). */
    MAIL_INBOX_PORT: z.coerce.number().int().min(1).max(65535).default(2580),
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
      message:
        "set a real NEXTAUTH_SECRET in production (the demo secret is refused)",
    },
  )
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
      message:
        "set a real LEDGER_HMAC_KEY in production (the demo key is refused)",
    },
  )
  .refine((e) => e.LEDGER_HMAC_KEY !== e.NEXTAUTH_SECRET, {
    path: ["LEDGER_HMAC_KEY"],
    message: "LEDGER_HMAC_KEY must differ from NEXTAUTH_SECRET",
  });

export type Env = z.infer<typeof envSchema>;

let cached: Env | undefined;

/** Parses process.env on first use, so a build without secrets still succeeds. */
export function getEnv(): Env {
  if (!cached) {
    const parsed = envSchema.safeParse(process.env);
    if (!parsed.success) {
      const problems = parsed.error.issues.map(
        (i) => `${i.path.join(".")}: ${i.message}`,
      );
      throw new Error(`Invalid environment:\n  ${problems.join("\n  ")}`);
    }
    cached = parsed.data;
  }
  return cached;
}
