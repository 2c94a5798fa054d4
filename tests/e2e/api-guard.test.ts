import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { Session } from "../helpers/http";

const ADMIN = "wren.achterberg@kestrel.example";
const NURSE = "hana.whitlock@kestrel.example";

function newUserBody(email: string) {
  return {
    email,
    name: "Api Created",
    role: "nurse",
    unitIds: [1],
    pressureUnit: "mmHg",
    password: "long-enough-password",
    rationale: "api test",
    currentPassword: "tidemark-demo",
  };
}

describe("JSON API guard", () => {
  it("answers 401 without a session", async () => {
    const anonymous = new Session();
    const res = await anonymous.fetch("/api/v1/me");
    expect(res.status).toBe(401);
    expect(await res.json()).toEqual({ error: { message: "Sign in to continue." } });
    expect(
      (await anonymous.json("/api/v1/users", "POST", newUserBody("anon@test.kestrel.example")))
        .status,
    ).toBe(401);
  });

  it("answers 403 to a nurse calling the admin route directly, and writes nothing", async () => {
    const nurse = await Session.signIn(NURSE);
    expect((await nurse.fetch("/api/v1/me")).status).toBe(200);
    const email = `nurse-probe-${Date.now()}@test.kestrel.example`;
    const res = await nurse.json("/api/v1/users", "POST", newUserBody(email));
    expect(res.status).toBe(403);
    expect(((await res.json()) as { error: { message: string } }).error.message).toMatch(/role/);
    const admin = await Session.signIn(ADMIN);
    const list = (await (await admin.fetch("/api/v1/users")).json()) as {
      users: { email: string }[];
    };
    expect(list.users.some((u) => u.email === email)).toBe(false);
  });

  it("answers 400 with per-field errors for malformed fields, and for a body that is not JSON", async () => {
    const admin = await Session.signIn(ADMIN);
    const res = await admin.json("/api/v1/users", "POST", {
      ...newUserBody("bad"),
      name: "",
      role: "wizard",
    });
    expect(res.status).toBe(400);
    const body = (await res.json()) as { error: { fieldErrors: Record<string, string[]> } };
    expect(Object.keys(body.error.fieldErrors).sort()).toEqual(["email", "name", "role"]);
    const notJson = await admin.json("/api/v1/users", "POST", "{not json");
    expect(notJson.status).toBe(400);
  });

  it("answers 413 to an oversized body", async () => {
    const admin = await Session.signIn(ADMIN);
    const res = await admin.json("/api/v1/users", "POST", {
      ...newUserBody("big@test.kestrel.example"),
      name: "x".repeat(70_000),
    });
    expect(res.status).toBe(413);
  });

  it("creates a user for an admin (201) and refuses a stale edit (409)", async () => {
    const admin = await Session.signIn(ADMIN);
    const email = `api-${Date.now()}@test.kestrel.example`;
    const created = await admin.json("/api/v1/users", "POST", newUserBody(email));
    expect(created.status).toBe(201);
    const { user } = (await created.json()) as { user: { id: number; version: number } };
    const edit = {
      ...newUserBody(email),
      password: "",
      version: user.version,
      name: "Renamed Once",
    };
    expect((await admin.json(`/api/v1/users/${user.id}`, "PATCH", edit)).status).toBe(200);
    const stale = await admin.json(`/api/v1/users/${user.id}`, "PATCH", {
      ...edit,
      name: "Renamed Twice",
    });
    expect(stale.status).toBe(409);
  });

  it("answers 404 to a non-numeric or unknown user id", async () => {
    const admin = await Session.signIn(ADMIN);
    expect((await admin.fetch("/api/v1/users/999999")).status).toBe(404);
    expect((await admin.fetch("/api/v1/users/abc")).status).toBe(400);
  });
});

/** The id Next gave a server action in this build (its manifest maps ids to exports). */
function serverActionId(exportedName: string): string {
  const manifest = JSON.parse(
    readFileSync(join(process.cwd(), ".next/server/server-reference-manifest.json"), "utf8"),
  ) as { node: Record<string, { exportedName?: string }> };
  const id = Object.entries(manifest.node).find(([, v]) => v.exportedName === exportedName)?.[0];
  if (!id) throw new Error(`server action ${exportedName} not in the build manifest`);
  return id;
}

describe("server actions are guarded like routes", () => {
  it("refuses a nurse who posts to the admin createUserAction directly, and writes nothing", async () => {
    const nurse = await Session.signIn(NURSE);
    const email = `action-probe-${Date.now()}@test.kestrel.example`;
    const res = await nurse.fetch("/admin/users/new", {
      method: "POST",
      headers: {
        "next-action": serverActionId("createUserAction"),
        "content-type": "text/plain;charset=UTF-8",
        accept: "text/x-component",
      },
      body: JSON.stringify([{ ...newUserBody(email), role: "admin" }]),
    });
    // The action protocol answers 200 and carries the action's typed result.
    const payload = await res.text();
    expect(payload).toContain('"ok":false');
    expect(payload).toContain('"status":403');
    const admin = await Session.signIn(ADMIN);
    const list = (await (await admin.fetch("/api/v1/users")).json()) as {
      users: { email: string }[];
    };
    expect(list.users.some((u) => u.email === email)).toBe(false);
  });

  it("refuses the same action without a session (401 result)", async () => {
    const res = await new Session().fetch("/admin/users/new", {
      method: "POST",
      headers: {
        "next-action": serverActionId("createUserAction"),
        "content-type": "text/plain;charset=UTF-8",
        accept: "text/x-component",
      },
      body: JSON.stringify([newUserBody(`anon-action-${Date.now()}@test.kestrel.example`)]),
    });
    // The middleware stops it before the action runs: a redirect to sign-in.
    expect([302, 303, 307]).toContain(res.status);
    expect(res.headers.get("location")).toMatch(/\/sign-in/);
  });
});
