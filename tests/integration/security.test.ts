import { setUserActiveOperation, updateUserOperation } from "@/lib/users/operations";
import { afterAll, describe, expect, it } from "vitest";
import { clientAddress, INVALID_ADDRESS, parseTrustedProxies } from "@/lib/auth/client-address";
import { hashPassword } from "@/lib/auth/password";
import { safeCallbackPath, safeRedirect } from "@/lib/auth/redirects";
import { confirmPassword } from "@/lib/auth/reauth";
import { checkSession, SessionEndedError, startSession, endSession } from "@/lib/auth/sessions";
import { SIGN_IN_FAILED, verifySignIn } from "@/lib/auth/sign-in";
import { closeDb } from "@/lib/db";
import { getEnv } from "@/lib/env";
import { TooManyRequestsError, ValidationError } from "@/lib/errors";
import { consumeQuota, QUOTAS } from "@/lib/rate-limit";
import { actorByEmail, appDb, SEEDED, uniqueEmail } from "../helpers/db";

afterAll(async () => {
  await closeDb();
});

const S = 1000;

async function newUser(password = "right-password-123") {
  const email = uniqueEmail("sec");
  const [id] = await appDb()("users").insert({
    email,
    name: "Security Probe",
    role: "physician",
    password_hash: await hashPassword(password),
  });
  const unit = (await appDb()("units").where({ code: "MICU" }).first("id")) as { id: number };
  await appDb()("user_units").insert({ user_id: Number(id), unit_id: unit.id });
  return { id: Number(id), email, password };
}

async function attempts(email: string) {
  return (await appDb()("sign_in_attempts")
    .where({ email_key: email })
    .orderBy("id")
    .select("client_ip", "outcome", "purpose")) as {
    client_ip: string;
    outcome: string;
    purpose: string;
  }[];
}

describe("sign-in: the client address", () => {
  it("reads X-Forwarded-For right to left past trusted proxies, bounded and validated", () => {
    const none = parseTrustedProxies("");
    const proxies = parseTrustedProxies("10.0.0.5, 10.0.0.6");
    // Next.js puts the socket's address there when the client sent none.
    expect(clientAddress("127.0.0.1", none)).toBe("127.0.0.1");
    expect(clientAddress(undefined, none)).toBe("local");
    // Without trusted proxies the right-most hop counts; a forged left part is ignored.
    expect(clientAddress("6.6.6.6, 192.0.2.10", none)).toBe("192.0.2.10");
    expect(clientAddress("6.6.6.6, 192.0.2.10, 10.0.0.6, 10.0.0.5", proxies)).toBe("192.0.2.10");
    expect(clientAddress("::ffff:192.0.2.10", none)).toBe("192.0.2.10");
    // Over-long, too many hops, or not an address: one shared bucket.
    expect(clientAddress("1".repeat(5000), none)).toBe(INVALID_ADDRESS);
    expect(clientAddress(Array(30).fill("192.0.2.1").join(","), none)).toBe(INVALID_ADDRESS);
    expect(clientAddress("x".repeat(70), none)).toBe(INVALID_ADDRESS);
  });

  it("records an attempt with an address of more than 64 characters, and answers the fixed message", async () => {
    const user = await newUser();
    const address = clientAddress(`${"a".repeat(80)}, 192.0.2.7x`, parseTrustedProxies(""));
    await expect(
      verifySignIn(appDb(), { email: user.email, password: "wrong-one" }, address),
    ).rejects.toThrow(SIGN_IN_FAILED);
    expect(await attempts(user.email)).toEqual([
      { client_ip: INVALID_ADDRESS, outcome: "wrong", purpose: "sign_in" },
    ]);
  });
});

describe("sign-in: throttling", () => {
  it("does not let rotating addresses bypass the per-account limit", async () => {
    const { email, password } = await newUser();
    const max = getEnv().SIGNIN_MAX_FAILURES;
    const t0 = Date.now();
    // Spaced a minute apart so the progressive delay never answers first.
    for (let i = 0; i < max; i++) {
      await expect(
        verifySignIn(
          appDb(),
          { email, password: `wrong-${i}` },
          `198.51.100.${i + 1}`,
          new Date(t0 + i * 60 * S),
        ),
      ).rejects.toThrow(SIGN_IN_FAILED);
    }
    await expect(
      verifySignIn(appDb(), { email, password }, "198.51.100.200", new Date(t0 + max * 60 * S)),
    ).rejects.toThrow(/Too many failed sign-ins\. Try again in \d+ minutes\./);
    // Locked until the oldest of those failures leaves the window.
    const free = new Date(t0 + (getEnv().SIGNIN_WINDOW_MINUTES + 1) * 60 * S);
    await expect(
      verifySignIn(appDb(), { email, password }, "198.51.100.201", free),
    ).resolves.toMatchObject({ email });
    const outcomes = (await attempts(email)).map((a) => a.outcome);
    expect(outcomes).toEqual([...Array<string>(max).fill("wrong"), "throttled", "ok"]);
  });

  it("slows quick repeated failures down progressively", async () => {
    const { email } = await newUser();
    const t0 = Date.now();
    const at = (ms: number) => new Date(t0 + ms);
    await expect(
      verifySignIn(appDb(), { email, password: "w1" }, "203.0.113.9", at(0)),
    ).rejects.toThrow(SIGN_IN_FAILED);
    await expect(
      verifySignIn(appDb(), { email, password: "w2" }, "203.0.113.9", at(100)),
    ).rejects.toThrow(SIGN_IN_FAILED);
    await expect(
      verifySignIn(appDb(), { email, password: "w3" }, "203.0.113.9", at(200)),
    ).rejects.toThrow(SIGN_IN_FAILED);
    // Three failures are free (a typo or two costs nothing); the fourth must wait a second.
    await expect(
      verifySignIn(appDb(), { email, password: "w4" }, "203.0.113.9", at(300)),
    ).rejects.toThrow("Too many failed sign-ins. Try again in 1 second.");
    await expect(
      verifySignIn(appDb(), { email, password: "w4" }, "203.0.113.9", at(1300)),
    ).rejects.toThrow(SIGN_IN_FAILED);
  });

  it("never locks an address out: many failures from one address only delay it, and other accounts still sign in", async () => {
    const shared = `192.0.2.${Math.floor(Math.random() * 200) + 20}`;
    const t0 = Date.now();
    for (let i = 0; i < 12; i++) {
      const victim = uniqueEmail("nobody");
      await verifySignIn(
        appDb(),
        { email: victim, password: "x-wrong" },
        shared,
        new Date(t0 + i * 61 * S),
      ).catch(() => null);
    }
    const { email, password } = await newUser();
    // Within the address's short delay the answer is "wait", not a lockout…
    const soon = new Date(t0 + 11 * 61 * S + 500);
    await expect(verifySignIn(appDb(), { email, password }, shared, soon)).rejects.toThrow(
      /Try again in \d+ seconds?\./,
    );
    // …and a minute later the right password works from the same address.
    await expect(
      verifySignIn(appDb(), { email, password }, shared, new Date(t0 + 12 * 61 * S + 60 * S)),
    ).resolves.toMatchObject({ email });
  });
});

describe("re-entered passwords (signing)", () => {
  it("locks signing after repeated wrong passwords, with a ledger row for every refusal", async () => {
    const user = await newUser();
    const t0 = Date.now();
    const results: string[] = [];
    for (let i = 0; i < 10; i++) {
      const error = (await confirmPassword(
        appDb(),
        user.id,
        `wrong-${i}`,
        new Date(t0 + i * 61 * S),
      ).catch((e: unknown) => e)) as Error;
      results.push(
        error instanceof TooManyRequestsError
          ? "locked"
          : error instanceof ValidationError
            ? "wrong"
            : "?",
      );
    }
    const max = getEnv().SIGNIN_MAX_FAILURES;
    expect(results).toEqual([
      ...Array<string>(max).fill("wrong"),
      ...Array<string>(10 - max).fill("locked"),
    ]);
    // The right password is refused too while locked.
    await expect(
      confirmPassword(appDb(), user.id, user.password, new Date(t0 + 10 * 61 * S)),
    ).rejects.toBeInstanceOf(TooManyRequestsError);
    const rows = (await appDb()("ledger_entries")
      .where({ action: "user.reauth_refused", entity_type: "user", entity_id: String(user.id) })
      .pluck("after_json")) as string[];
    expect(rows.map((r) => (JSON.parse(r) as { outcome: string }).outcome)).toEqual([
      ...Array<string>(max).fill("wrong"),
      ...Array<string>(11 - max).fill("throttled"),
    ]);
  });
});

describe("sessions that end", () => {
  it("refuses a session after sign-out, after a password reset, after deactivation and when idle", async () => {
    const user = await newUser();
    const admin = await actorByEmail(SEEDED.admin);
    const now = new Date();
    const signedOut = await startSession(appDb(), user.id, now);
    await checkSession(appDb(), signedOut, user.id, now);
    await endSession(appDb(), signedOut, "sign_out", now);
    await expect(checkSession(appDb(), signedOut, user.id, now)).rejects.toBeInstanceOf(
      SessionEndedError,
    );

    const beforeReset = await startSession(appDb(), user.id, now);
    const { version } = (await appDb()("users").where({ id: user.id }).first("version")) as {
      version: number;
    };
    const unit = (await appDb()("units").where({ code: "MICU" }).first("id")) as { id: number };
    await updateUserOperation.invoke(appDb(), admin, {
      id: user.id,
      version,
      email: user.email,
      name: "Security Probe",
      role: "physician",
      unitIds: [unit.id],
      pressureUnit: "mmHg",
      password: "a-brand-new-password-456",
      rationale: "Reset after a lost badge",
      currentPassword: "tidemark-demo",
    });
    await expect(checkSession(appDb(), beforeReset, user.id)).rejects.toMatchObject({
      reason: "ended",
    });

    const beforeDeactivation = await startSession(appDb(), user.id);
    const v2 = (
      (await appDb()("users").where({ id: user.id }).first("version")) as { version: number }
    ).version;
    await setUserActiveOperation.invoke(appDb(), admin, {
      id: user.id,
      version: v2,
      active: false,
      rationale: "Left the hospital",
      currentPassword: "tidemark-demo",
    });
    await expect(checkSession(appDb(), beforeDeactivation, user.id)).rejects.toBeInstanceOf(
      SessionEndedError,
    );

    const idle = await startSession(appDb(), user.id, now);
    const later = new Date(now.getTime() + (getEnv().SESSION_IDLE_MINUTES + 1) * 60 * S);
    await expect(checkSession(appDb(), idle, user.id, later)).rejects.toMatchObject({
      reason: "idle",
    });
    // Another user's session id is not this user's.
    const mine = await startSession(appDb(), user.id);
    await expect(checkSession(appDb(), mine, admin.id)).rejects.toBeInstanceOf(SessionEndedError);
  });
});

describe("redirects after sign-in", () => {
  it("keeps every open-redirect payload on the site", () => {
    for (const payload of [
      "/\\evil.example",
      "/\t/evil.example",
      "//evil.example",
      "https://evil.example/",
      "/%5Cevil.example".replace("%5C", "\\"),
      "javascript:alert(1)",
      "",
    ]) {
      expect(safeCallbackPath(payload)).toBe("/board");
    }
    expect(safeCallbackPath("/patients/4?tab=trend#x")).toBe("/patients/4?tab=trend#x");
    expect(safeRedirect("https://evil.example/x", "http://localhost:3000")).toBe(
      "http://localhost:3000/board",
    );
    expect(safeRedirect("http://localhost:3000/alerts", "http://localhost:3000")).toBe(
      "http://localhost:3000/alerts",
    );
    expect(safeRedirect("/\\evil.example", "http://localhost:3000")).toBe(
      "http://localhost:3000/board",
    );
  });
});

describe("quotas on expensive reads", () => {
  it("answers the request past the quota with 429 and the seconds until the minute turns", async () => {
    const subject = `user:quota-${Date.now()}-${Math.random()}`;
    const now = new Date(Math.floor(Date.now() / 60_000) * 60_000 + 15_000);
    for (let i = 0; i < QUOTAS.ledger_verify.perWindow; i++)
      await consumeQuota(appDb(), subject, "ledger_verify", now);
    const error = (await consumeQuota(appDb(), subject, "ledger_verify", now).catch(
      (e: unknown) => e,
    )) as TooManyRequestsError;
    expect(error).toBeInstanceOf(TooManyRequestsError);
    expect(error.retryAfterSeconds).toBe(45);
    expect(error.message).toBe(
      "Too many ledger verifications: at most 6 a minute. Try again in 45 seconds.",
    );
    // Another bucket, and the next minute, are counted afresh.
    await consumeQuota(appDb(), subject, "ledger_export", now);
    await consumeQuota(appDb(), subject, "ledger_verify", new Date(now.getTime() + 60_000));
  });
});
