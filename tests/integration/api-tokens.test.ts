import { createApiTokenOperation, revokeApiTokenOperation } from "@/lib/api-tokens/operations";
import { writeOrderOperation } from "@/lib/orders/operations";
import { createHash, randomUUID } from "node:crypto";
import { readFileSync } from "node:fs";
import { afterAll, describe, expect, it } from "vitest";
import { POST as postHl7 } from "@/app/api/v1/imports/hl7/route";
import { POST as postMonitor } from "@/app/api/v1/imports/monitor/route";
import { GET as getFhir } from "@/app/api/v1/patients/[patientId]/fhir/route";
import { TOKEN_DAYS_MAX } from "@/lib/api-tokens/schema";
import { listApiTokens } from "@/lib/api-tokens/queries";
import { closeDb } from "@/lib/db";
import { ForbiddenError, ValidationError } from "@/lib/errors";
import { actorByEmail, admitTestPatient, appDb, SEEDED } from "../helpers/db";
import { hfncOrder } from "../helpers/orders";

afterAll(async () => {
  await closeDb();
});

// The route handlers need no Next request context for token requests (no
// session), so they are called directly with a Request. Message times are
// moved to "now" so the services' real clock accepts them.
const stamp = (d: Date) => d.toISOString().replace(/[-:T]/g, "").slice(0, 12);

async function patientOnHfnc(unit: "MICU" | "RESP" = "MICU") {
  const p = await admitTestPatient(unit);
  const physician = await actorByEmail(SEEDED.physician);
  await writeOrderOperation.invoke(
    appDb(),
    physician,
    hfncOrder(p.patientId, { initialFio2: 0.45, rationale: "API token test" }),
  );
  await appDb()("admissions")
    .where({ patient_id: p.patientId })
    .whereNull("discharged_at")
    .update({ admitted_at: new Date(Date.now() - 6 * 3600_000) });
  const { mrn } = (await appDb()("patients").where({ id: p.patientId }).first("mrn")) as {
    mrn: string;
  };
  const { label } = (await appDb()("beds").where({ id: p.bedId }).first("label")) as {
    label: string;
  };
  return { ...p, mrn, bed: label };
}

function hl7(name: string, mrn: string, msgId: string): string {
  const at = new Date(Date.now() - 30 * 60_000);
  return readFileSync(new URL(`../fixtures/imports/${name}`, import.meta.url), "utf8")
    .replaceAll("{{MRN}}", mrn)
    .replaceAll("{{MSGID}}", msgId)
    .replace(/2026112010(\d{2})/g, (_, mm: string) =>
      stamp(new Date(at.getTime() + Number(mm) * 60_000)),
    )
    .replace(/2026112008(\d{2})/g, (_, mm: string) =>
      stamp(new Date(at.getTime() + Number(mm) * 60_000)),
    );
}

async function token(scope: "read" | "write", units: ("MICU" | "RESP")[] = ["MICU"]) {
  const admin = await actorByEmail(SEEDED.admin);
  const unitIds = (await appDb()("units").whereIn("code", units).pluck("id")) as number[];
  return createApiTokenOperation.invoke(appDb(), admin, {
    currentPassword: "tidemark-demo",
    name: `Engine ${randomUUID().slice(0, 6)}`,
    scope,
    unitIds,
  });
}

const request = (path: string, body: string, bearer?: string) =>
  new Request(`http://127.0.0.1${path}`, {
    method: "POST",
    headers: {
      "content-type": "text/plain",
      ...(bearer ? { authorization: `Bearer ${bearer}` } : {}),
    },
    body,
  });

type Json = {
  import?: { id: number; counts: { accepted: number; rejected: number }; status: string };
  replayed?: boolean;
  error?: { message: string; fieldErrors?: Record<string, string[]> };
};
const json = async (r: Response) => (await r.json()) as Json;

describe("API tokens", () => {
  it("is created by the admin, shown once, stored only as its SHA-256 with a display prefix, and written to the ledger", async () => {
    const { token: secret, summary } = await token("write");
    expect(secret).toMatch(/^tdm_[A-Za-z0-9_-]{43}$/);
    const row = (await appDb()("api_tokens").where({ id: summary.id }).first()) as Record<
      string,
      unknown
    >;
    expect(row.token_hash).toBe(createHash("sha256").update(secret).digest("hex"));
    expect(
      Object.values(row).some((v) => typeof v === "string" && v.includes(secret.slice(12))),
    ).toBe(false);
    expect(summary.prefix).toBe(secret.slice(0, 12));
    expect(summary.units.map((u) => u.code)).toEqual(["MICU"]);
    const listed = (await listApiTokens(appDb())).find((t) => t.id === summary.id);
    expect(listed).not.toHaveProperty("token");
    const ledger = (await appDb()("ledger_entries")
      .where({
        entity_type: "api_token",
        entity_id: String(summary.id),
        action: "api_token.create",
      })
      .orderBy("id", "desc")
      .first("action", "after_json")) as { action: string; after_json: string } | undefined;
    expect(ledger?.action).toBe("api_token.create");
    expect(JSON.parse(ledger!.after_json)).toEqual({
      name: summary.name,
      scope: "write",
      unitIds: summary.units.map((u) => u.id),
      expiresAt: summary.expiresAt,
    });
    const therapist = await actorByEmail(SEEDED.therapist);
    await expect(
      createApiTokenOperation.invoke(appDb(), therapist, {
        name: "Nope",
        scope: "write",
        unitIds: [1],
        currentPassword: "tidemark-demo",
      }),
    ).rejects.toBeInstanceOf(ForbiddenError);
  });

  it("imports an HL7 message with a write token as the interface, and answers a re-sent message with the first import", async () => {
    const p = await patientOnHfnc();
    const { token: secret, summary } = await token("write");
    const message = hl7("hl7-valid.hl7", p.mrn, `A${randomUUID().slice(0, 12)}`);
    const first = await postHl7(request("/api/v1/imports/hl7", message, secret));
    const body = await json(first);
    expect(first.status).toBe(201);
    expect(body.import).toMatchObject({ status: "imported", counts: { accepted: 2, rejected: 0 } });
    const gas = (await appDb()("blood_gases")
      .where({ patient_id: p.patientId })
      .first("recorded_by", "import_id")) as {
      recorded_by: number | null;
      import_id: number;
    };
    expect(gas).toEqual({ recorded_by: null, import_id: body.import!.id });
    const stored = (await appDb()("imports")
      .where({ id: body.import!.id })
      .first("api_token_id", "created_by")) as Record<string, unknown>;
    expect(stored).toEqual({ api_token_id: summary.id, created_by: null });
    const ledger = (await appDb()("ledger_entries")
      .where({ entity_type: "import", entity_id: String(body.import!.id), patient_id: p.patientId })
      .select("action", "actor_role", "actor_user_id")) as Record<string, unknown>[];
    expect(ledger).toEqual([
      { action: "import.hl7", actor_role: "interface", actor_user_id: null },
    ]);

    const again = await postHl7(request("/api/v1/imports/hl7", message, secret));
    expect(again.status).toBe(200);
    expect(await json(again)).toMatchObject({ replayed: true, import: { id: body.import!.id } });
    expect(
      await appDb()("blood_gases").where({ patient_id: p.patientId }).count({ n: "*" }).first(),
    ).toEqual({ n: 1 });
    const used = (await appDb()("api_tokens").where({ id: summary.id }).first("last_used_at")) as {
      last_used_at: Date | null;
    };
    expect(used.last_used_at).not.toBeNull();
  });

  it("refuses a message with bad rows as a whole (422, every row listed, nothing stored) unless partial=accept", async () => {
    const p = await patientOnHfnc();
    const { token: secret } = await token("write");
    const msgId = `B${randomUUID().slice(0, 12)}`;
    const message = hl7("hl7-bad-rows.hl7", p.mrn, msgId);
    const refused = await postHl7(request("/api/v1/imports/hl7", message, secret));
    expect(refused.status).toBe(422);
    const error = (await json(refused)).error!;
    expect(error.message).toBe(
      "2 of 3 rows were rejected; nothing was stored. Fix them, or send ?partial=accept to import the good ones (1).",
    );
    expect(error.fieldErrors?.["OBR 2"]).toEqual([
      "PaO2 column is labelled mmHg but 9.1 looks like kPa; check the column's unit.",
    ]);
    expect(Object.keys(error.fieldErrors ?? {})).toEqual(["OBR 2", "OBR 3"]);
    expect(
      await appDb()("imports")
        .where({ source_message_id: `GASLAB|KESTREL|${msgId}` })
        .first(),
    ).toBeUndefined();
    expect(await appDb()("blood_gases").where({ patient_id: p.patientId }).first()).toBeUndefined();

    const partial = await postHl7(request("/api/v1/imports/hl7?partial=accept", message, secret));
    expect(partial.status).toBe(201);
    expect((await json(partial)).import?.counts).toEqual({ total: 3, accepted: 1, rejected: 2 });
  });

  it("refuses a truncated message with a clear 422 and stores nothing", async () => {
    const p = await patientOnHfnc();
    const { token: secret } = await token("write");
    const msgId = `C${randomUUID().slice(0, 12)}`;
    const response = await postHl7(
      request("/api/v1/imports/hl7", hl7("hl7-truncated.hl7", p.mrn, msgId), secret),
    );
    expect(response.status).toBe(422);
    expect((await json(response)).error?.message).toMatch(
      /^The message is truncated or incomplete: OBX \(segment 6\)/,
    );
    expect(
      await appDb()("imports")
        .where({ source_message_id: `GASLAB|KESTREL|${msgId}` })
        .first(),
    ).toBeUndefined();
  });

  it("refuses a missing, unknown or revoked token with 401, a read token with 403, and another unit with 403", async () => {
    const p = await patientOnHfnc();
    const message = hl7("hl7-valid.hl7", p.mrn, `D${randomUUID().slice(0, 12)}`);
    const none = await postHl7(request("/api/v1/imports/hl7", message));
    expect(none.status).toBe(401);
    expect((await json(none)).error?.message).toBe(
      "Send an API token as 'Authorization: Bearer tdm_…'.",
    );
    const forged = await postHl7(request("/api/v1/imports/hl7", message, `tdm_${"A".repeat(43)}`));
    expect(forged.status).toBe(401);

    const admin = await actorByEmail(SEEDED.admin);
    const { token: revoked, summary } = await token("write");
    await revokeApiTokenOperation.invoke(appDb(), admin, {
      currentPassword: "tidemark-demo",
      id: summary.id,
      rationale: "Interface engine replaced",
    });
    const refused = await postHl7(request("/api/v1/imports/hl7", message, revoked));
    expect(refused.status).toBe(401);
    expect((await json(refused)).error?.message).toBe(
      "This API token is not valid or has been revoked.",
    );

    const { token: reader } = await token("read");
    const readOnly = await postHl7(request("/api/v1/imports/hl7", message, reader));
    expect(readOnly.status).toBe(403);
    expect((await json(readOnly)).error?.message).toMatch(/may only read/);

    const { token: respOnly } = await token("write", ["RESP"]);
    const otherUnit = await postMonitor(
      request(
        `/api/v1/imports/monitor?mrn=${p.mrn}&bed=${p.bed}&unit=MICU`,
        "time,spo2\n",
        respOnly,
      ),
    );
    expect(otherUnit.status).toBe(403);
    expect((await json(otherUnit)).error?.message).toBe(
      "This API token is not allowed on unit MICU.",
    );
    // A MICU patient named in a message to a RESP-only token is an unknown patient, row by row.
    const hidden = await postHl7(request("/api/v1/imports/hl7", message, respOnly));
    expect(hidden.status).toBe(422);
    expect((await json(hidden)).error?.fieldErrors?.["OBR 1"]).toEqual([
      `MRN ${p.mrn} is not an admitted patient on RESP.`,
    ]);
    expect(await appDb()("blood_gases").where({ patient_id: p.patientId }).first()).toBeUndefined();
  });

  it("lets a read token export a patient of its units as FHIR, and no other unit's", async () => {
    const p = await patientOnHfnc();
    const get = (secret: string) =>
      getFhir(
        new Request(`http://127.0.0.1/api/v1/patients/${p.patientId}/fhir`, {
          headers: { authorization: `Bearer ${secret}` },
        }),
        { params: Promise.resolve({ patientId: String(p.patientId) }) },
      );
    const { token: reader } = await token("read");
    const ok = await get(reader);
    expect(ok.status).toBe(200);
    expect(ok.headers.get("content-type")).toContain("application/fhir+json");
    const bundle = (await ok.json()) as {
      resourceType: string;
      entry: { resource: { resourceType: string } }[];
    };
    expect(bundle.resourceType).toBe("Bundle");
    expect(bundle.entry.map((e) => e.resource.resourceType)).toContain("ServiceRequest");
    const { token: respOnly } = await token("read", ["RESP"]);
    expect((await get(respOnly)).status).toBe(404);
    const admin = await actorByEmail(SEEDED.admin);
    const { token: revoked, summary } = await token("read");
    await revokeApiTokenOperation.invoke(appDb(), admin, {
      id: summary.id,
      rationale: "No longer used",
      currentPassword: "tidemark-demo",
    });
    expect((await get(revoked)).status).toBe(401);
  });

  it("streams a monitor CSV body into readings for the MRN and bed in the query, once", async () => {
    const p = await patientOnHfnc();
    const { token: secret } = await token("write");
    const start = Date.now() - 3600_000;
    const lines = ["time,spo2,pulse_rate"];
    for (let i = 0; i < 2500; i++)
      lines.push(`${new Date(start + i * 1000).toISOString()},${90 + (i % 8)},${80 + (i % 5)}`);
    const body = `${lines.join("\n")}\n`;
    const path = `/api/v1/imports/monitor?mrn=${p.mrn}&bed=${p.bed}`;
    const response = await postMonitor(request(path, body, secret));
    expect(response.status).toBe(201);
    expect((await json(response)).import?.counts).toEqual({
      total: 2500,
      accepted: 2500,
      rejected: 0,
    });
    const n = async () =>
      Number(
        (
          (await appDb()("readings")
            .where({ patient_id: p.patientId, source: "monitor" })
            .count({ n: "*" })
            .first()) as { n: number }
        ).n,
      );
    expect(await n()).toBe(2500);
    const again = await postMonitor(request(path, body, secret));
    expect(again.status).toBe(200);
    expect(await n()).toBe(2500);
    const bad = await postMonitor(request(path, "time;spo2\n2026-11-20T08:00:00Z;95\n", secret));
    expect(bad.status).toBe(422);
    expect((await json(bad)).error?.message).toMatch(/looks separated by semicolon/);
  });

  it("keeps nothing of a monitor body whose CSV breaks after its first batches were written", async () => {
    const p = await patientOnHfnc();
    const { token: secret } = await token("write");
    const start = Date.now() - 3600_000;
    const lines = ["time,spo2,pulse_rate"];
    for (let i = 0; i < 2500; i++)
      lines.push(`${new Date(start + i * 1000).toISOString()},${90 + (i % 8)},80`);
    // An opening quote never closed: csv-parse finds out only at the end of the body.
    lines.push(`"${new Date(start + 2_500_000).toISOString()},95,80`);
    const response = await postMonitor(
      request(`/api/v1/imports/monitor?mrn=${p.mrn}&bed=${p.bed}`, `${lines.join("\n")}\n`, secret),
    );
    expect(response.status).toBe(422);
    expect((await json(response)).error?.message).toMatch(/not valid CSV/);
    const left = async (table: string, where: Record<string, unknown>) =>
      Number(((await appDb()(table).where(where).count({ n: "*" }).first()) as { n: number }).n);
    expect(await left("readings", { patient_id: p.patientId })).toBe(0);
    expect(await left("rollup_minutes", { patient_id: p.patientId })).toBe(0);
    expect(await left("ledger_entries", { patient_id: p.patientId, entity_type: "import" })).toBe(
      0,
    );
  });

  it("writes no part of the secret to the ledger when a token is created or revoked", async () => {
    const admin = await actorByEmail(SEEDED.admin);
    const { token: secret, summary } = await token("write");
    await revokeApiTokenOperation.invoke(appDb(), admin, {
      id: summary.id,
      rationale: "Rotated for the test",
      currentPassword: "tidemark-demo",
    });
    const rows = (await appDb()("ledger_entries")
      .where({ entity_type: "api_token", entity_id: String(summary.id) })
      .orderBy("id")
      .select()) as Record<string, unknown>[];
    expect(rows.map((r) => r.action)).toEqual(["api_token.create", "api_token.revoke"]);
    // Every six characters of the random part (the display prefix holds eight of them).
    const random = secret.slice(4);
    const pieces = Array.from({ length: random.length - 5 }, (_, i) => random.slice(i, i + 6));
    for (const row of rows) {
      const text = JSON.stringify(row);
      expect(pieces.filter((piece) => text.includes(piece))).toEqual([]);
      expect(text).not.toContain(summary.prefix);
    }
  });

  it("expires a year after creation unless the admin chooses otherwise, up to two years, and lists the expiry", async () => {
    const admin = await actorByEmail(SEEDED.admin);
    const micu = (await appDb()("units").where({ code: "MICU" }).pluck("id")) as number[];
    const now = new Date("2026-12-03T10:00:00.000Z");
    const { summary: year } = await createApiTokenOperation.invoke(
      appDb(),
      admin,
      {
        name: `Default ${randomUUID().slice(0, 6)}`,
        scope: "read",
        unitIds: micu,
        currentPassword: "tidemark-demo",
      },
      now,
    );
    expect(year.expiresAt).toBe("2027-12-03T10:00:00.000Z");
    const { summary: month } = await createApiTokenOperation.invoke(
      appDb(),
      admin,
      {
        name: `Month ${randomUUID().slice(0, 6)}`,
        scope: "read",
        unitIds: micu,
        validDays: 30,
        currentPassword: "tidemark-demo",
      },
      now,
    );
    expect(month.expiresAt).toBe("2027-01-02T10:00:00.000Z");
    const tooLong = (await createApiTokenOperation
      .invoke(appDb(), admin, {
        currentPassword: "tidemark-demo",
        name: "Too long",
        scope: "read",
        unitIds: micu,
        validDays: TOKEN_DAYS_MAX + 1,
      })
      .catch((e: unknown) => e)) as ValidationError;
    expect(tooLong).toBeInstanceOf(ValidationError);
    expect(tooLong.fieldErrors?.validDays).toEqual([
      `Valid for must be a whole number of days between 1 and ${TOKEN_DAYS_MAX}.`,
    ]);
    const listed = (await listApiTokens(appDb())).find((t) => t.id === month.id);
    expect(listed).toMatchObject({ expiresAt: "2027-01-02T10:00:00.000Z" });
    expect(listed?.expired).toBe(Date.now() >= Date.parse("2027-01-02T10:00:00.000Z"));
  });

  it("refuses an expired token with 401, like a revoked one, and nothing is imported", async () => {
    const p = await patientOnHfnc();
    const message = hl7("hl7-valid.hl7", p.mrn, `E${randomUUID().slice(0, 12)}`);
    const { token: secret, summary } = await token("write");
    // Its expiry passed a second ago.
    await appDb()("api_tokens")
      .where({ id: summary.id })
      .update({ expires_at: new Date(Date.now() - 1000) });
    const refused = await postHl7(request("/api/v1/imports/hl7", message, secret));
    expect(refused.status).toBe(401);
    expect((await json(refused)).error?.message).toBe(
      "This API token has expired; an administrator can create a new one.",
    );
    expect(await appDb()("blood_gases").where({ patient_id: p.patientId }).first()).toBeUndefined();
    const row = (await appDb()("api_tokens").where({ id: summary.id }).first("last_used_at")) as {
      last_used_at: Date | null;
    };
    expect(row.last_used_at).toBeNull();
    expect((await listApiTokens(appDb())).find((t) => t.id === summary.id)?.expired).toBe(true);

    // The same token a day from expiry still works.
    await appDb()("api_tokens")
      .where({ id: summary.id })
      .update({ expires_at: new Date(Date.now() + 86_400_000) });
    expect((await postHl7(request("/api/v1/imports/hl7", message, secret))).status).toBe(201);
  });
});
