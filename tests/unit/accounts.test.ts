import { describe, expect, it } from "vitest";
import { composeAccountEmail, durationWords } from "@/lib/accounts/email";
import { changePasswordSchema, tokenPasswordSchema } from "@/lib/accounts/schema";
import {
  accountLink,
  accountMessageId,
  accountTokenState,
  hashAccountToken,
  newAccountToken,
} from "@/lib/accounts/tokens";
import { signInWords } from "@/components/users/invitation-words";
import { composeCosignEmail, cosignMessageId, cosignStepDue } from "@/lib/orders/cosign-steps";
import { waitingWords } from "@/lib/orders/waiting";
import { userCreateSchema } from "@/lib/users/schema";

const MIN = 60_000;
const HOUR = 60 * MIN;

describe("account links", () => {
  it("stores only a SHA-256 of a 256-bit secret, and the link carries the secret", () => {
    const a = newAccountToken();
    const b = newAccountToken();
    expect(a.token).toMatch(/^[A-Za-z0-9_-]{43}$/);
    expect(a.token).not.toBe(b.token);
    expect(a.hash).toBe(hashAccountToken(a.token));
    expect(a.hash).toMatch(/^[0-9a-f]{64}$/);
    expect(accountLink("https://tidemark.example/", a.token)).toBe(
      `https://tidemark.example/set-password?token=${a.token}`,
    );
    expect(accountMessageId(7, "reset", "kestrel.example")).toBe(
      "<account-7.reset@kestrel.example>",
    );
  });

  it("a link is used or voided before it is expired, and expired at its expiry instant", () => {
    const expires_at = new Date("2026-12-08T12:00:00Z");
    const row = { used_at: null, voided_at: null, expires_at };
    expect(accountTokenState(row, new Date(expires_at.getTime() - 1))).toBe("valid");
    expect(accountTokenState(row, expires_at)).toBe("expired");
    expect(accountTokenState({ ...row, used_at: new Date() }, new Date("2027-01-01"))).toBe("used");
    expect(accountTokenState({ ...row, voided_at: new Date() }, new Date("2027-01-01"))).toBe(
      "voided",
    );
  });

  it("the e-mails say how long the link works and carry it in both parts", () => {
    const mail = composeAccountEmail({
      kind: "invite",
      name: "Ada Quill",
      email: "ada@kestrel.example",
      link: "https://t.example/set-password?token=abc",
      validFor: durationWords(72 * 60),
      invitedBy: "Wren Achterberg",
    });
    expect(mail.text).toContain("The link works once, for 72 hours.");
    expect(mail.text).toContain("https://t.example/set-password?token=abc");
    expect(mail.html).toContain('href="https://t.example/set-password?token=abc"');
    expect(durationWords(30)).toBe("30 minutes");
    expect(durationWords(60)).toBe("1 hour");
  });

  it("the password forms name the field that failed", () => {
    const short = tokenPasswordSchema.safeParse({
      token: "x".repeat(43),
      password: "short",
      confirmPassword: "short",
    });
    expect(short.error?.issues[0]).toMatchObject({
      path: ["password"],
      message: "Password must be 12 to 200 characters.",
    });
    const differ = changePasswordSchema.safeParse({
      currentPassword: "old",
      password: "a-long-password-1",
      confirmPassword: "a-long-password-2",
    });
    expect(differ.error?.issues[0]?.path).toEqual(["confirmPassword"]);
    const neither = userCreateSchema.safeParse({
      email: "a@kestrel.example",
      name: "Ab",
      role: "nurse",
      unitIds: [1],
      pressureUnit: "mmHg",
      password: "",
      currentPassword: "x",
    });
    expect(neither.error?.issues[0]?.path).toEqual(["password"]);
    expect(
      userCreateSchema.safeParse({
        email: "a@kestrel.example",
        name: "Ab",
        role: "nurse",
        unitIds: [1],
        pressureUnit: "mmHg",
        password: "",
        invite: true,
        currentPassword: "x",
      }).success,
    ).toBe(true);
  });

  it("the users screen words each sign-in state", () => {
    const now = new Date("2026-12-08T12:00:00Z");
    const sent = "2026-12-08T10:00:00.000Z";
    expect(
      signInWords(
        {
          password: "none",
          invitation: { state: "pending", sentAt: sent, expiresAt: "2026-12-11T10:00:00.000Z" },
        },
        now,
      ).label,
    ).toBe("Invitation pending");
    // Still "pending" in the row, but its time has passed.
    expect(
      signInWords(
        {
          password: "none",
          invitation: { state: "pending", sentAt: sent, expiresAt: "2026-12-08T11:00:00.000Z" },
        },
        now,
      ).label,
    ).toBe("Invitation expired");
    expect(
      signInWords(
        { password: "own", invitation: { state: "used", sentAt: sent, expiresAt: sent } },
        now,
      ).label,
    ).toBe("Invitation used");
    expect(signInWords({ password: "set_by_admin", invitation: null }, now).label).toBe(
      "Must change password",
    );
    expect(signInWords({ password: "none", invitation: null }, now).label).toBe("No password yet");
  });
});

describe("co-sign steps", () => {
  const cfg = { remindMs: 60 * MIN, escalateMs: 24 * HOUR };
  const t0 = new Date("2026-12-08T08:00:00Z");
  const at = (ms: number) => new Date(t0.getTime() + ms);

  it("nothing before the first interval; then the latest reminder only; escalation at the deadline", () => {
    expect(cosignStepDue(t0, at(60 * MIN - 1), cfg)).toBeNull();
    expect(cosignStepDue(t0, at(60 * MIN), cfg)).toEqual({
      step: "remind-1",
      kind: "remind",
      dueAt: at(60 * MIN),
    });
    expect(cosignStepDue(t0, at(5 * HOUR + 59 * MIN), cfg)?.step).toBe("remind-5");
    expect(cosignStepDue(t0, at(24 * HOUR - 1), cfg)?.step).toBe("remind-23");
    expect(cosignStepDue(t0, at(24 * HOUR), cfg)).toEqual({
      step: "escalate",
      kind: "escalate",
      dueAt: at(24 * HOUR),
    });
    expect(cosignStepDue(t0, at(72 * HOUR), cfg)?.step).toBe("escalate");
  });

  it("an escalation deadline shorter than the interval escalates without a reminder", () => {
    expect(
      cosignStepDue(t0, at(2 * HOUR), { remindMs: 3 * HOUR, escalateMs: 2 * HOUR })?.step,
    ).toBe("escalate");
  });

  it("says how long an order waited, and never names the patient in its e-mail", () => {
    expect(waitingWords(3 * HOUR + 10 * MIN + 59_000)).toBe("3 h 10 min");
    expect(waitingWords(45 * MIN)).toBe("45 min");
    expect(waitingWords(52 * HOUR)).toBe("2 d 4 h");
    const mail = composeCosignEmail({
      kind: "escalate",
      orderId: 12,
      entryMode: "verbal",
      enteredBy: "Hana Whitlock",
      prescriber: "Dr Tobias Renwick",
      unitCode: "MICU",
      unitName: "Medical ICU",
      bedLabel: "4",
      enteredAt: "08 Dec, 08:00 (UTC)",
      waiting: "24 h 0 min",
      basis: "designated",
      baseUrl: "http://localhost:3000/",
    });
    expect(mail.subject).toBe("Co-sign overdue: verbal order #12 waiting 24 h 0 min — MICU bed 4");
    expect(mail.text).toContain("http://localhost:3000/orders/12");
    expect(cosignMessageId(12, "remind-2", null, "k.example")).toBe(
      "<order-12.cosign-remind-2.0@k.example>",
    );
  });
});
