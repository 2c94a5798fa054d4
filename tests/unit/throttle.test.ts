import { describe, expect, it } from "vitest";
import { retryWords, throttleVerdict } from "@/lib/auth/throttle";

// The product's own throttle settings (README "Security model"): 5 wrong
// passwords in 15 minutes lock an account; three are free before sign-in waits.
const S = 1000;
const base = { maxFailures: 5, windowMs: 15 * 60 * S, now: 100 * 60 * S, progressive: true };
const times = (...ago: number[]) => ago.map((a) => base.now - a * S);

describe("throttleVerdict", () => {
  it("after three quick wrong sign-ins the next waits 1 s, doubling; two cost nothing", () => {
    const three = times(3, 2, 0.5);
    expect(
      throttleVerdict({
        ...base,
        accountFailures: three,
        accountSignInFailures: three,
        addressFailures: [],
      }),
    ).toEqual({
      allowed: false,
      retryAfterSeconds: 1,
      scope: "account",
    });
    const two = times(2, 1);
    expect(
      throttleVerdict({
        ...base,
        accountFailures: two,
        accountSignInFailures: two,
        addressFailures: [],
      }).allowed,
    ).toBe(true);
    const four = times(4, 3, 2, 0.5);
    // Four failures: 2 s after the last, 1.5 s from now.
    expect(
      throttleVerdict({
        ...base,
        accountFailures: four,
        accountSignInFailures: four,
        addressFailures: [],
      }),
    ).toMatchObject({
      allowed: false,
      retryAfterSeconds: 2,
    });
  });

  it("locks the account after five wrong passwords of either kind until the oldest leaves the window", () => {
    const five = times(600, 500, 400, 300, 200);
    const verdict = throttleVerdict({
      ...base,
      accountFailures: five,
      accountSignInFailures: [],
      addressFailures: [],
    });
    expect(verdict).toEqual({ allowed: false, retryAfterSeconds: 15 * 60 - 600, scope: "account" });
  });

  it("does not slow a re-entered password, and does not slow sign-in for signing typos", () => {
    const reauth = times(3, 2, 1);
    expect(
      throttleVerdict({
        ...base,
        accountFailures: reauth,
        accountSignInFailures: [],
        addressFailures: [],
      }).allowed,
    ).toBe(true);
    const signIn = times(3, 2, 1);
    expect(
      throttleVerdict({
        ...base,
        progressive: false,
        accountFailures: signIn,
        accountSignInFailures: signIn,
        addressFailures: [],
      }).allowed,
    ).toBe(true);
  });

  it("only delays an address, never locks it", () => {
    const many = Array.from({ length: 40 }, (_, i) => base.now - (40 - i) * 20 * S);
    const verdict = throttleVerdict({
      ...base,
      accountFailures: [],
      accountSignInFailures: [],
      addressFailures: many,
    });
    expect(verdict).toMatchObject({ allowed: false, scope: "address" });
    expect((verdict as { retryAfterSeconds: number }).retryAfterSeconds).toBeLessThanOrEqual(60);
  });

  it("says the wait in words", () => {
    expect(retryWords(1)).toBe("1 second");
    expect(retryWords(45)).toBe("45 seconds");
    expect(retryWords(600)).toBe("10 minutes");
  });
});
