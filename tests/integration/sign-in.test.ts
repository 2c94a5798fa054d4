import { afterAll, describe, expect, it } from "vitest";
import { hashPassword } from "@/lib/auth/password";
import { SIGN_IN_FAILED, signInThrottledMessage, verifySignIn } from "@/lib/auth/sign-in";
import { closeDb } from "@/lib/db";
import { getEnv } from "@/lib/env";
import { appDb, SEEDED, uniqueEmail } from "../helpers/db";

afterAll(async () => {
  await closeDb();
});

// Each test uses its own client address so throttling counts never leak between tests.
const ip = () => `10.0.${Math.floor(Math.random() * 250)}.${Math.floor(Math.random() * 250)}`;

describe("sign-in", () => {
  it("accepts the seeded demo password for an active user", async () => {
    const user = await verifySignIn(
      appDb(),
      { email: SEEDED.nurse, password: "tidemark-demo" },
      ip(),
    );
    expect(user).toMatchObject({ email: SEEDED.nurse, role: "nurse" });
  });

  it("answers a wrong password and an unknown e-mail with the same message", async () => {
    const wrong = await verifySignIn(
      appDb(),
      { email: SEEDED.nurse, password: "not-it" },
      ip(),
    ).catch((e: Error) => e.message);
    const unknown = await verifySignIn(
      appDb(),
      { email: uniqueEmail("ghost"), password: "whatever" },
      ip(),
    ).catch((e: Error) => e.message);
    expect(wrong).toBe(SIGN_IN_FAILED);
    expect(unknown).toBe(SIGN_IN_FAILED);
  });

  it("refuses a deactivated account with the same message", async () => {
    const email = uniqueEmail("inactive");
    await appDb()("users").insert({
      email,
      name: "Inactive Person",
      role: "nurse",
      password_hash: await hashPassword("right-password-123"),
      active: false,
    });
    await expect(
      verifySignIn(appDb(), { email, password: "right-password-123" }, ip()),
    ).rejects.toThrow(SIGN_IN_FAILED);
  });

  it("throttles an e-mail after repeated failures, even with the right password, known or not", async () => {
    const max = getEnv().SIGNIN_MAX_FAILURES;
    const email = uniqueEmail("throttle");
    await appDb()("users").insert({
      email,
      name: "Throttle Person",
      role: "nurse",
      password_hash: await hashPassword("right-password-123"),
    });
    const t0 = Date.now();
    // A minute apart, so the progressive delay between quick failures never answers first.
    for (let i = 0; i < max; i++) {
      await expect(
        verifySignIn(appDb(), { email, password: `wrong-${i}` }, ip(), new Date(t0 + i * 60_000)),
      ).rejects.toThrow(SIGN_IN_FAILED);
    }
    await expect(
      verifySignIn(
        appDb(),
        { email, password: "right-password-123" },
        ip(),
        new Date(t0 + max * 60_000),
      ),
    ).rejects.toThrow(signInThrottledMessage((getEnv().SIGNIN_WINDOW_MINUTES - max) * 60));
    // The window passes: the right password works again.
    const later = new Date(t0 + (getEnv().SIGNIN_WINDOW_MINUTES + 1) * 60_000);
    await expect(
      verifySignIn(appDb(), { email, password: "right-password-123" }, ip(), later),
    ).resolves.toMatchObject({
      email,
    });
  });

  it("refuses malformed input with the same message, recording the attempt without looking anyone up", async () => {
    const address = ip();
    await expect(
      verifySignIn(appDb(), { email: "x".repeat(300), password: "" }, address),
    ).rejects.toThrow(SIGN_IN_FAILED);
    const rows = (await appDb()("sign_in_attempts")
      .where({ client_ip: address })
      .select("outcome", "email_key")) as {
      outcome: string;
      email_key: string;
    }[];
    expect(rows).toEqual([{ outcome: "invalid", email_key: "x".repeat(254) }]);
  });
});
