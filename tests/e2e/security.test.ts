import { updateUserOperation } from "@/lib/users/operations";
import { afterAll, describe, expect, it } from "vitest";
import { hashPassword } from "@/lib/auth/password";
import { SIGN_IN_FAILED } from "@/lib/auth/sign-in";
import { closeDb } from "@/lib/db";
import { DEMO_PASSWORD } from "../helpers/browser";
import { actorByEmail, appDb, SEEDED, uniqueEmail } from "../helpers/db";
import { Session } from "../helpers/http";

afterAll(async () => {
  await closeDb();
});

async function newNurse() {
  const email = uniqueEmail("e2e-sec");
  const [id] = await appDb()("users").insert({
    email,
    name: "Probe Nurse",
    role: "nurse",
    password_hash: await hashPassword(DEMO_PASSWORD),
  });
  const unit = (await appDb()("units").where({ code: "MICU" }).first("id")) as { id: number };
  await appDb()("user_units").insert({ user_id: Number(id), unit_id: unit.id });
  return { id: Number(id), email, unitId: unit.id };
}

/** The credentials callback as a browser would post it, with extra headers. */
async function postCredentials(email: string, password: string, headers: Record<string, string>) {
  const s = new Session();
  const csrf = (await (await s.fetch("/api/auth/csrf")).json()) as { csrfToken: string };
  const res = await s.fetch("/api/auth/callback/credentials", {
    method: "POST",
    headers: { "content-type": "application/x-www-form-urlencoded", ...headers },
    body: new URLSearchParams({
      csrfToken: csrf.csrfToken,
      email,
      password,
      json: "true",
    }).toString(),
  });
  return { session: s, body: await res.text(), location: res.headers.get("location") ?? "" };
}

describe("sign-in over HTTP", () => {
  it("answers a sign-in with an X-Forwarded-For longer than 64 characters with the fixed message, and records it", async () => {
    const { email } = await newNurse();
    const forwarded = `${"9".repeat(40)}.${"8".repeat(40)}`;
    const wrong = await postCredentials(email, "not-the-password", {
      "x-forwarded-for": forwarded,
    });
    const right = await postCredentials(email, DEMO_PASSWORD, { "x-forwarded-for": forwarded });
    for (const answer of [wrong, right]) {
      // Nothing of the database's own error text reaches the browser.
      expect(`${answer.body} ${answer.location}`).not.toMatch(
        /insert|sign_in_attempts|values|sql/i,
      );
    }
    expect(decodeURIComponent(`${wrong.body}${wrong.location}`)).toContain(SIGN_IN_FAILED);
    expect((await right.session.fetch("/api/v1/me")).status).toBe(200);
    const rows = (await appDb()("sign_in_attempts")
      .where({ email_key: email })
      .orderBy("id")
      .select("client_ip", "outcome")) as { client_ip: string; outcome: string }[];
    expect(rows).toEqual([
      { client_ip: "invalid", outcome: "wrong" },
      { client_ip: "invalid", outcome: "ok" },
    ]);
  });

  it("keeps the open-redirect payloads of the sign-in page on the site", async () => {
    const nurse = await Session.signIn(SEEDED.nurse);
    for (const payload of [
      "/%5Cevil.example",
      "/%09/evil.example",
      "//evil.example",
      "https://evil.example",
    ]) {
      const res = await nurse.fetch(`/sign-in?callbackUrl=${payload}`);
      expect(res.status).toBe(307);
      expect(res.headers.get("location")).toBe("/board");
    }
  });
});

describe("sessions that end", () => {
  it("refuses the old session token after sign-out", async () => {
    const { email } = await newNurse();
    const session = await Session.signIn(email);
    expect((await session.fetch("/api/v1/me")).status).toBe(200);
    const stolen = session.copy();
    await session.signOut();
    const res = await stolen.fetch("/api/v1/me");
    expect(res.status).toBe(401);
    expect(((await res.json()) as { error: { message: string } }).error.message).toMatch(
      /session was ended/,
    );
    // A page answers with the sign-in page and the reason.
    const page = await stolen.fetch("/board");
    expect(page.status).toBe(307);
    expect(page.headers.get("location")).toMatch(/\/sign-in\?ended=ended$/);
  });

  it("refuses the old session token after an administrator resets the password", async () => {
    const user = await newNurse();
    const session = await Session.signIn(user.email);
    expect((await session.fetch("/api/v1/me")).status).toBe(200);
    const admin = await actorByEmail(SEEDED.admin);
    const { version } = (await appDb()("users").where({ id: user.id }).first("version")) as {
      version: number;
    };
    await updateUserOperation.invoke(appDb(), admin, {
      id: user.id,
      version,
      email: user.email,
      name: "Probe Nurse",
      role: "nurse",
      unitIds: [user.unitId],
      pressureUnit: "mmHg",
      password: "a-fresh-password-789",
      rationale: "Password reset at the service desk",
      currentPassword: "tidemark-demo",
    });
    expect((await session.fetch("/api/v1/me")).status).toBe(401);
    const again = await Session.signIn(user.email, "a-fresh-password-789");
    // A password an administrator set must be changed before anything else.
    expect((await again.fetch("/api/v1/me")).status).toBe(403);
    const changed = await again.json("/api/v1/me/password", "POST", {
      currentPassword: "a-fresh-password-789",
      password: "my-own-password-789",
      confirmPassword: "my-own-password-789",
    });
    expect(changed.status).toBe(200);
    expect((await again.fetch("/api/v1/me")).status).toBe(200);
  });
});

describe("writes from other sites, odd bodies and out-of-range queries", () => {
  const readings = async () =>
    Number(((await appDb()("readings").count({ n: "*" }).first()) as { n: number }).n);
  const reading = { patientId: 1, takenAt: new Date().toISOString(), spo2: 93, device: "room_air" };

  it("refuses a cookie-session write as text/plain from another origin, and writes nothing", async () => {
    const nurse = await Session.signIn(SEEDED.nurse);
    const before = await readings();
    const res = await nurse.fetch("/api/v1/readings", {
      method: "POST",
      headers: { "content-type": "text/plain", origin: "https://evil.example" },
      body: JSON.stringify(reading),
    });
    expect(res.status).toBe(403);
    expect(((await res.json()) as { error: { message: string } }).error.message).toContain(
      "https://evil.example",
    );
    // The same from another site as JSON, and from our own origin as text/plain.
    const json = await nurse.fetch("/api/v1/readings", {
      method: "POST",
      headers: { "content-type": "application/json", origin: "https://evil.example" },
      body: JSON.stringify(reading),
    });
    expect(json.status).toBe(403);
    const plain = await nurse.fetch("/api/v1/readings", {
      method: "POST",
      headers: { "content-type": "text/plain", "sec-fetch-site": "same-origin" },
      body: JSON.stringify(reading),
    });
    expect(plain.status).toBe(415);
    expect(await readings()).toBe(before);
  });

  it("answers an asOf beyond the order history with 400, not 500", async () => {
    const physician = await Session.signIn(SEEDED.physician);
    const res = await physician.fetch("/api/v1/orders/10?asOf=99999-01-01");
    expect(res.status).toBe(400);
    expect(
      ((await res.json()) as { error: { fieldErrors: Record<string, string[]> } }).error.fieldErrors
        .asOf?.[0],
    ).toMatch(/asOf must be a date and time between 1970-01-01 and 2038-01-19/);
    const ledger = await physician.fetch("/api/v1/ledger?from=99999-01-01");
    expect(ledger.status).toBe(400);
  });

  it("refuses a 50 MB chunked upload at the cap (413) without reading it whole", async () => {
    const therapist = await Session.signIn(SEEDED.therapist);
    const chunk = new Uint8Array(1024 * 1024).fill(65);
    let sent = 0;
    const body = new ReadableStream<Uint8Array>({
      pull(controller) {
        if (sent >= 50) return controller.close();
        sent += 1;
        controller.enqueue(chunk);
      },
    });
    const res = await therapist.fetch("/api/v1/imports", {
      method: "POST",
      headers: { "content-type": "multipart/form-data; boundary=tidemark" },
      body,
      duplex: "half",
    } as RequestInit);
    expect(res.status).toBe(413);
    expect(((await res.json()) as { error: { message: string } }).error.message).toMatch(
      /larger than 12 MB/,
    );
  });
});

describe("quotas", () => {
  it("answers the seventh ledger verification within a minute with 429 and Retry-After", async () => {
    const { email } = await newNurse();
    const nurse = await Session.signIn(email);
    // Start early in a minute, so all seven land in one window.
    const second = new Date().getUTCSeconds();
    if (second >= 45) await new Promise((resolve) => setTimeout(resolve, (61 - second) * 1000));
    const statuses: number[] = [];
    let retryAfter: string | null = null;
    for (let i = 0; i < 7; i++) {
      const res = await nurse.fetch("/api/v1/ledger/verify?mode=incremental");
      statuses.push(res.status);
      if (res.status === 429) retryAfter = res.headers.get("retry-after");
      await res.arrayBuffer();
    }
    expect(statuses).toEqual([200, 200, 200, 200, 200, 200, 429]);
    expect(Number(retryAfter)).toBeGreaterThan(0);
    expect(Number(retryAfter)).toBeLessThanOrEqual(60);
  }, 90_000);
});
