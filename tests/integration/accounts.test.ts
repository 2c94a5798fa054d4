import { randomUUID } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { changePasswordOperation, inviteUserOperation } from "@/lib/accounts/operations";
import { requestPasswordReset } from "@/lib/accounts/reset";
import { inspectAccountToken, setPasswordWithToken } from "@/lib/accounts/service";
import { deliverOutbox } from "@/lib/alerts/outbox";
import { loadActor } from "@/lib/auth/actor-queries";
import { startSession } from "@/lib/auth/sessions";
import { verifySignIn } from "@/lib/auth/sign-in";
import { closeDb } from "@/lib/db";
import {
  ConflictError,
  PasswordChangeRequiredError,
  TooManyRequestsError,
  ValidationError,
} from "@/lib/errors";
import { startFakeInbox, type FakeInbox, type InboxMessage } from "@/lib/mail/fake-inbox";
import { createMailTransport } from "@/lib/mail/transport";
import { createUserOperation, updateUserOperation } from "@/lib/users/operations";
import { getUser } from "@/lib/users/queries";
import { actorByEmail, appDb, SEEDED, uniqueEmail } from "../helpers/db";

// Invitation and reset links through the real outbox and SMTP fake, with an
// injected clock: each works once, expires, and leaves ledger rows without
// its secret; an unknown address gets the same answer and no e-mail.

const ADMIN_PASSWORD = "tidemark-demo";
const MIN = 60_000;
let inbox: FakeInbox;
const sender = () => createMailTransport({ host: "127.0.0.1", port: inbox.smtpPort });

beforeAll(async () => {
  inbox = await startFakeInbox({ smtpPort: 0, httpPort: null });
});
afterAll(async () => {
  await inbox.stop();
  await closeDb();
});

async function micu(): Promise<number> {
  return ((await appDb()("units").where({ code: "MICU" }).first("id")) as { id: number }).id;
}

async function newUser(opts: { invite: boolean; now?: Date }) {
  const admin = await actorByEmail(SEEDED.admin);
  const email = uniqueEmail("account");
  const user = await createUserOperation.invoke(
    appDb(),
    admin,
    {
      email,
      name: "Account Test",
      role: "nurse",
      unitIds: [await micu()],
      pressureUnit: "mmHg",
      password: opts.invite ? "" : "set-by-the-admin-1",
      invite: opts.invite,
      rationale: "",
      currentPassword: ADMIN_PASSWORD,
    },
    opts.now,
  );
  return { admin, user, email };
}

/** Delivers the outbox at `now` and returns the messages the fake received for `to`. */
async function mailTo(to: string, now: Date): Promise<InboxMessage[]> {
  await deliverOutbox(appDb(), sender(), now);
  return inbox.messages().filter((m) => m.to.includes(to));
}

function tokenOf(message: InboxMessage): string {
  const match = /set-password\?token=([A-Za-z0-9_-]+)/.exec(message.text);
  if (!match) throw new Error(`no link in ${message.text}`);
  return match[1]!;
}

async function ledgerActions(userId: number): Promise<{ action: string; after_json: string }[]> {
  return (await appDb()("ledger_entries")
    .where({ entity_type: "user", entity_id: String(userId) })
    .orderBy("id")
    .select("action", "after_json")) as { action: string; after_json: string }[];
}

describe("invitation links", () => {
  it("an invited user gets one e-mail with a link that sets their password once, then signs in", async () => {
    const t0 = new Date();
    const { user, email } = await newUser({ invite: true, now: t0 });
    expect(user).toMatchObject({ password: "none", invitation: { state: "pending" } });
    // No password yet: sign-in refuses, even with the decoy's own words.
    await expect(
      verifySignIn(appDb(), { email, password: "tidemark-decoy-password" }, "10.9.0.1"),
    ).rejects.toThrow(/do not match/);

    const mail = await mailTo(email, new Date(t0.getTime() + 1000));
    expect(mail).toHaveLength(1);
    const token = tokenOf(mail[0]!);
    const row = (await appDb()("account_tokens").where({ user_id: user.id }).first()) as {
      id: number;
      token_hash: string;
    };
    expect(mail[0]!.messageId).toBe(`<account-${row.id}.invite@kestrel.example>`);
    expect(row.token_hash).toMatch(/^[0-9a-f]{64}$/);
    expect(row.token_hash).not.toContain(token);

    const set = await setPasswordWithToken(
      appDb(),
      { token, password: "my-own-password-1", confirmPassword: "my-own-password-1" },
      new Date(t0.getTime() + 60 * MIN),
    );
    expect(set).toEqual({ email, kind: "invite" });
    await expect(
      verifySignIn(appDb(), { email, password: "my-own-password-1" }, "10.9.0.1"),
    ).resolves.toMatchObject({ email });
    expect(await getUser(appDb(), user.id)).toMatchObject({
      password: "own",
      invitation: { state: "used" },
    });

    // Used once: a second use refuses, and the refusal is recorded.
    await expect(
      setPasswordWithToken(
        appDb(),
        { token, password: "someone-elses-pass", confirmPassword: "someone-elses-pass" },
        new Date(t0.getTime() + 61 * MIN),
      ),
    ).rejects.toThrow(/already used/);
    const actions = await ledgerActions(user.id);
    expect(actions.map((a) => a.action)).toEqual([
      "user.create",
      "user.invite",
      "user.password_set",
      "user.account_link_refused",
    ]);
    expect(JSON.parse(actions[3]!.after_json)).toMatchObject({ reason: "used", kind: "invite" });
    for (const a of actions) expect(a.after_json).not.toContain(token);
    expect(
      (
        await appDb()("ledger_entries").where("after_json", "like", `%${token}%`).count("* as n")
      )[0],
    ).toEqual({ n: 0 });
  });

  it("expires after INVITE_LINK_HOURS (72 h): refused, recorded once, the password still unset", async () => {
    const t0 = new Date();
    const { user, email } = await newUser({ invite: true, now: t0 });
    const token = tokenOf((await mailTo(email, new Date(t0.getTime() + 1000)))[0]!);
    const late = new Date(t0.getTime() + 72 * 60 * MIN);
    expect(
      await inspectAccountToken(appDb(), token, new Date(late.getTime() - 1000)),
    ).toMatchObject({ state: "valid", email });
    expect(await inspectAccountToken(appDb(), token, late)).toMatchObject({ state: "expired" });
    for (let i = 0; i < 2; i++) {
      await expect(
        setPasswordWithToken(
          appDb(),
          { token, password: "too-late-password", confirmPassword: "too-late-password" },
          late,
        ),
      ).rejects.toBeInstanceOf(ValidationError);
    }
    const refusals = (await ledgerActions(user.id)).filter(
      (a) => a.action === "user.account_link_refused",
    );
    expect(refusals).toHaveLength(1);
    expect(JSON.parse(refusals[0]!.after_json)).toMatchObject({ reason: "expired" });
    expect(await getUser(appDb(), user.id)).toMatchObject({ password: "none" });
  });

  it("a new invitation voids the old link; one for a user with a password of their own is refused", async () => {
    const t0 = new Date();
    const { admin, user, email } = await newUser({ invite: true, now: t0 });
    const first = tokenOf((await mailTo(email, new Date(t0.getTime() + 1000)))[0]!);
    const again = await inviteUserOperation.invoke(
      appDb(),
      admin,
      { id: user.id, currentPassword: ADMIN_PASSWORD },
      new Date(t0.getTime() + 2000),
    );
    expect(again.voided).toBe(1);
    const mails = await mailTo(email, new Date(t0.getTime() + 3000));
    expect(mails).toHaveLength(2);
    const second = tokenOf(mails[1]!);
    await expect(
      setPasswordWithToken(
        appDb(),
        { token: first, password: "first-link-pass", confirmPassword: "first-link-pass" },
        new Date(t0.getTime() + 4000),
      ),
    ).rejects.toThrow(/newer link/);
    await setPasswordWithToken(
      appDb(),
      { token: second, password: "second-link-pass", confirmPassword: "second-link-pass" },
      new Date(t0.getTime() + 5000),
    );
    await expect(
      inviteUserOperation.invoke(appDb(), admin, { id: user.id, currentPassword: ADMIN_PASSWORD }),
    ).rejects.toBeInstanceOf(ConflictError);
    const nurse = await actorByEmail(SEEDED.nurse);
    await expect(
      inviteUserOperation.invoke(appDb(), nurse, { id: user.id, currentPassword: ADMIN_PASSWORD }),
    ).rejects.toMatchObject({ status: 403 });
  });
});

describe("password reset", () => {
  it("answers an unknown address exactly as a known one, and sends nothing to it", async () => {
    const t0 = new Date();
    const { email } = await newUser({ invite: false, now: t0 });
    const unknown = uniqueEmail("nobody");
    const ip = `10.1.${Math.floor(Math.random() * 250)}.1`;
    const known = await requestPasswordReset(appDb(), { email }, ip, t0);
    const stranger = await requestPasswordReset(appDb(), { email: unknown }, ip, t0);
    expect(stranger).toEqual(known);
    expect(await appDb()("mail_outbox").where({ to_address: unknown }).first()).toBeUndefined();
    await deliverOutbox(appDb(), sender(), new Date(t0.getTime() + 1000));
    expect(inbox.messages().filter((m) => m.to.includes(unknown))).toHaveLength(0);
    const mail = inbox.messages().filter((m) => m.to.includes(email));
    expect(mail).toHaveLength(1);
    expect(mail[0]!.subject).toMatch(/new password/);
  });

  it("a reset link works once within RESET_LINK_MINUTES, ends the user's sessions and clears an admin-set password", async () => {
    const t0 = new Date();
    const { user, email } = await newUser({ invite: false, now: t0 });
    const session = await startSession(appDb(), user.id, t0);
    const ip = `10.2.${Math.floor(Math.random() * 250)}.1`;
    await requestPasswordReset(appDb(), { email }, ip, t0);
    const token = tokenOf((await mailTo(email, new Date(t0.getTime() + 1000)))[0]!);
    const set = () =>
      setPasswordWithToken(
        appDb(),
        { token, password: "after-the-reset-1", confirmPassword: "after-the-reset-1" },
        new Date(t0.getTime() + 29 * MIN),
      );
    await set();
    await expect(set()).rejects.toThrow(/already used/);
    const ended = (await appDb()("user_sessions").where({ id: session }).first()) as {
      ended_at: Date | null;
      end_reason: string | null;
    };
    expect(ended).toMatchObject({ end_reason: "password_changed" });
    // The reset password is the user's own: no change is forced.
    await expect(loadActor(appDb(), user.id)).resolves.toMatchObject({ email });

    await requestPasswordReset(appDb(), { email }, ip, new Date(t0.getTime() + 30 * MIN));
    const later = await mailTo(email, new Date(t0.getTime() + 31 * MIN));
    const second = tokenOf(later[1]!);
    await expect(
      setPasswordWithToken(
        appDb(),
        { token: second, password: "too-late-reset-1", confirmPassword: "too-late-reset-1" },
        new Date(t0.getTime() + 60 * MIN),
      ),
    ).rejects.toThrow(/expired/);
  });

  it("counts requests per typed address and per client address, known or not", async () => {
    const t0 = new Date(Math.floor(Date.now() / 3_600_000) * 3_600_000 + 60_000);
    const ip = `10.3.${Math.floor(Math.random() * 250)}.1`;
    const { email } = await newUser({ invite: false });
    for (const address of [email, uniqueEmail("nobody")]) {
      for (let i = 0; i < 3; i++) await requestPasswordReset(appDb(), { email: address }, ip, t0);
      await expect(
        requestPasswordReset(appDb(), { email: address }, ip, t0),
      ).rejects.toBeInstanceOf(TooManyRequestsError);
    }
    expect(
      await appDb()("account_tokens")
        .whereIn("user_id", appDb()("users").where({ email }).select("id"))
        .where({ kind: "reset" }),
    ).toHaveLength(3);
    // Twenty an hour from one client address, whatever the addresses typed.
    const busy = `10.4.${Math.floor(Math.random() * 250)}.1`;
    for (let i = 0; i < 20; i++)
      await requestPasswordReset(appDb(), { email: uniqueEmail(`spray${i}`) }, busy, t0);
    await expect(
      requestPasswordReset(appDb(), { email: uniqueEmail("spray") }, busy, t0),
    ).rejects.toBeInstanceOf(TooManyRequestsError);
  });
});

describe("a password set by an administrator", () => {
  it("must be changed at first sign-in before anything else, and the new one must differ", async () => {
    const { user, email } = await newUser({ invite: false });
    expect(user.password).toBe("set_by_admin");
    await expect(
      verifySignIn(appDb(), { email, password: "set-by-the-admin-1" }, "10.9.0.2"),
    ).resolves.toMatchObject({ id: user.id });
    await expect(loadActor(appDb(), user.id)).rejects.toBeInstanceOf(PasswordChangeRequiredError);
    const actor = await loadActor(appDb(), user.id, { allowPasswordChange: true });
    const keep = await startSession(appDb(), user.id);
    const other = await startSession(appDb(), user.id);
    await expect(
      changePasswordOperation.invoke(
        appDb(),
        { ...actor, sessionId: keep },
        {
          currentPassword: "set-by-the-admin-1",
          password: "set-by-the-admin-1",
          confirmPassword: "set-by-the-admin-1",
        },
      ),
    ).rejects.toMatchObject({ fieldErrors: { password: [expect.stringMatching(/different/)] } });
    await expect(
      changePasswordOperation.invoke(
        appDb(),
        { ...actor, sessionId: keep },
        {
          currentPassword: "set-by-the-admin-1",
          password: "chosen-by-me-123",
          confirmPassword: "chosen-by-me-124",
        },
      ),
    ).rejects.toMatchObject({ fieldErrors: { confirmPassword: [expect.any(String)] } });
    await changePasswordOperation.invoke(
      appDb(),
      { ...actor, sessionId: keep },
      {
        currentPassword: "set-by-the-admin-1",
        password: "chosen-by-me-123",
        confirmPassword: "chosen-by-me-123",
      },
    );
    await expect(loadActor(appDb(), user.id)).resolves.toMatchObject({ id: user.id });
    const sessions = (await appDb()("user_sessions")
      .whereIn("id", [keep, other])
      .select("id", "ended_at")) as { id: string; ended_at: Date | null }[];
    expect(sessions.find((s) => s.id === keep)!.ended_at).toBeNull();
    expect(sessions.find((s) => s.id === other)!.ended_at).not.toBeNull();
    expect((await ledgerActions(user.id)).map((a) => a.action)).toContain("user.password_change");
  });

  it("an administrator's reset of someone's password forces the change again", async () => {
    const { admin, user } = await newUser({ invite: false });
    await appDb()("users").where({ id: user.id }).update({ password_change_required: false });
    const fresh = (await getUser(appDb(), user.id))!;
    expect(fresh.password).toBe("own");
    await updateUserOperation.invoke(appDb(), admin, {
      id: user.id,
      version: fresh.version,
      email: fresh.email,
      name: fresh.name,
      role: fresh.role,
      unitIds: fresh.units.map((u) => u.id),
      pressureUnit: fresh.pressureUnit,
      password: "another-admin-pass",
      rationale: "",
      currentPassword: ADMIN_PASSWORD,
    });
    await expect(loadActor(appDb(), user.id)).rejects.toBeInstanceOf(PasswordChangeRequiredError);
  });

  it("creating a user needs a password or an invitation", async () => {
    const admin = await actorByEmail(SEEDED.admin);
    await expect(
      createUserOperation.invoke(appDb(), admin, {
        email: uniqueEmail(`neither-${randomUUID().slice(0, 4)}`),
        name: "Neither Way",
        role: "nurse",
        unitIds: [await micu()],
        pressureUnit: "mmHg",
        password: "",
        rationale: "",
        currentPassword: ADMIN_PASSWORD,
      }),
    ).rejects.toMatchObject({ fieldErrors: { password: [expect.stringMatching(/invitation/)] } });
  });
});
