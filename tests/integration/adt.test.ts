import { randomUUID } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { POST as postHl7 } from "@/app/api/v1/imports/hl7/route";
import { createApiTokenOperation } from "@/lib/api-tokens/operations";
import { closeDb } from "@/lib/db";
import { writeOrderOperation } from "@/lib/orders/operations";
import { chartReadingOperation } from "@/lib/readings/operations";
import { actorByEmail, appDb, SEEDED } from "../helpers/db";
import { hfncOrder } from "../helpers/orders";

// HL7 v2 ADT through the interface endpoint, as an interface engine sends it
// with a write token for the medical ICU: the same admit, move, discharge and
// update as the screens, a repeated MSH-10 changing nothing, and each refusal
// naming the segment field it came from. Messages are invented.

const tag = randomUUID().slice(0, 6).toUpperCase();
let secret: string;
let bedLabels: string[] = [];

const stamp = (d: Date) => d.toISOString().replace(/[-:T]/g, "").slice(0, 12);

function adt(
  trigger: "A01" | "A02" | "A03" | "A08",
  controlId: string,
  p: { mrn: string; family?: string; given?: string; dob?: string; sex?: string },
  pv1: { bed?: string; unit?: string; disposition?: string } = {},
): string {
  const now = stamp(new Date(Date.now() - 60_000));
  const pv1Fields = Array.from({ length: 37 }, () => "");
  pv1Fields[2] = "I";
  pv1Fields[3] = pv1.bed ? `${pv1.unit ?? "MICU"}^^${pv1.bed}` : "";
  pv1Fields[36] = pv1.disposition ?? "";
  return [
    `MSH|^~\\&|REGSYS|KESTREL|TIDEMARK|KESTREL|${now}||ADT^${trigger}|${controlId}|P|2.5`,
    `EVN|${trigger}|${now}`,
    `PID|1||${p.mrn}^^^KESTREL^MR||${p.family ?? "Harrowgate"}^${p.given ?? "Wendell"}||${p.dob ?? "19520314"}|${p.sex ?? "M"}`,
    `PV1|${pv1Fields.slice(1).join("|")}`,
  ].join("\r");
}

const send = async (message: string, bearer = secret) => {
  const res = await postHl7(
    new Request("http://127.0.0.1/api/v1/imports/hl7", {
      method: "POST",
      headers: { "content-type": "x-application/hl7-v2+er7", authorization: `Bearer ${bearer}` },
      body: message,
    }),
  );
  return {
    status: res.status,
    body: (await res.json()) as {
      replayed?: boolean;
      adt?: { admission: { admissionId: number; patientId: number; bed: { label: string } } };
      error?: { message: string; fieldErrors?: Record<string, string[]> };
    },
  };
};

beforeAll(async () => {
  const admin = await actorByEmail(SEEDED.admin);
  const micu = (await appDb()("units").where({ code: "MICU" }).first("id")) as { id: number };
  const created = await createApiTokenOperation.invoke(appDb(), admin, {
    currentPassword: "tidemark-demo",
    name: `ADT engine ${tag}`,
    scope: "write",
    unitIds: [micu.id],
  });
  secret = created.token;
  // Fresh beds of the ICU, so the seeded ones stay as they are.
  bedLabels = Array.from({ length: 6 }, (_, i) => `H${tag.slice(0, 4)}${i}`);
  await appDb()("beds").insert(
    bedLabels.map((label, i) => ({ unit_id: micu.id, label, sort_order: 960 + i })),
  );
});

afterAll(async () => {
  await closeDb();
});

describe("HL7 ADT through a token", () => {
  it("A01 admits, A08 updates, A02 moves with the alert, A03 discharges: each once, each a ledger row by the interface", async () => {
    const mrn = `HL${tag}1`;
    const admitted = await send(adt("A01", `ADT-${tag}-1`, { mrn }, { bed: bedLabels[0] }));
    expect(admitted.status).toBe(201);
    const { admissionId, patientId } = admitted.body.adt!.admission;

    // The same message again: 200, nothing new.
    const again = await send(adt("A01", `ADT-${tag}-1`, { mrn }, { bed: bedLabels[0] }));
    expect(again.status).toBe(200);
    expect(again.body.replayed).toBe(true);
    expect(await appDb()("admissions").where({ patient_id: patientId }).count({ n: "*" })).toEqual([
      { n: 1 },
    ]);

    const updated = await send(adt("A08", `ADT-${tag}-2`, { mrn, given: "Wendel" }));
    expect(updated.status).toBe(201);
    const patient = (await appDb()("patients").where({ id: patientId }).first("given_name")) as {
      given_name: string;
    };
    expect(patient.given_name).toBe("Wendel");

    // An order and a low reading: the alert follows the move, the discharge resolves it.
    const physician = await actorByEmail(SEEDED.physician);
    await writeOrderOperation.invoke(appDb(), physician, hfncOrder(patientId));
    await chartReadingOperation.invoke(appDb(), await actorByEmail(SEEDED.therapist), {
      patientId,
      takenAt: new Date().toISOString(),
      spo2: 85,
      device: "hfnc",
      fio2: 0.4,
      flow: 40,
    });
    const moved = await send(adt("A02", `ADT-${tag}-3`, { mrn }, { bed: bedLabels[1] }));
    expect(moved.status).toBe(201);
    expect(moved.body.adt!.admission.bed.label).toBe(bedLabels[1]);
    const alert = (await appDb()("alerts as a")
      .join("beds as b", "b.id", "a.bed_id")
      .where({ "a.admission_id": admissionId })
      .first("a.id", "b.label", "a.state")) as { id: number; label: string; state: string };
    expect(alert.label).toBe(bedLabels[1]);

    const out = await send(adt("A03", `ADT-${tag}-4`, { mrn }, { disposition: "01" }));
    expect(out.status).toBe(201);
    const admission = (await appDb()("admissions").where({ id: admissionId }).first()) as {
      discharged_at: Date | null;
      discharge_disposition: string;
    };
    expect(admission.discharged_at).not.toBeNull();
    expect(admission.discharge_disposition).toBe("home");
    const order = (await appDb()("orders")
      .where({ admission_id: admissionId })
      .first("status", "discontinue_reason", "discontinued_by")) as Record<string, unknown>;
    expect(order).toEqual({
      status: "discontinued",
      discontinue_reason: `Discharged: home (HL7 ADT^A03 ADT-${tag}-4)`,
      discontinued_by: null,
    });
    const closed = (await appDb()("alerts").where({ id: alert.id }).first("state")) as {
      state: string;
    };
    expect(closed.state).toBe("resolved");

    const rows = (await appDb()("ledger_entries")
      .where({ patient_id: patientId })
      .whereIn("action", [
        "patient.admit",
        "patient.update",
        "patient.transfer",
        "patient.discharge",
      ])
      .orderBy("chain_seq")
      .select("action", "actor_role", "rationale")) as {
      action: string;
      actor_role: string;
      rationale: string;
    }[];
    expect(rows.map((r) => [r.action, r.actor_role])).toEqual([
      ["patient.admit", "interface"],
      ["patient.update", "interface"],
      ["patient.transfer", "interface"],
      ["patient.discharge", "interface"],
    ]);
    expect(rows[2]!.rationale).toBe(`HL7 ADT^A02 ADT-${tag}-3`);
  });

  it("names the segment field of each refusal and changes nothing", async () => {
    const badDob = await send(
      adt("A01", `ADT-${tag}-5`, { mrn: `HL${tag}2`, dob: "19521340" }, { bed: bedLabels[2] }),
    );
    expect(badDob.status).toBe(422);
    expect(badDob.body.error!.message).toMatch(/PID-7/);

    const noBed = await send(adt("A01", `ADT-${tag}-6`, { mrn: `HL${tag}2` }, { bed: "NOPE" }));
    expect(noBed.status).toBe(404);
    expect(noBed.body.error!.fieldErrors).toHaveProperty("PV1-3");

    // The token is for the ICU only: the ward's beds are not found.
    const otherUnit = await send(
      adt("A01", `ADT-${tag}-7`, { mrn: `HL${tag}2` }, { bed: "R01", unit: "RESP" }),
    );
    expect(otherUnit.status).toBe(404);

    const first = await send(
      adt("A01", `ADT-${tag}-8`, { mrn: `HL${tag}3` }, { bed: bedLabels[3] }),
    );
    expect(first.status).toBe(201);
    const taken = await send(
      adt("A01", `ADT-${tag}-9`, { mrn: `HL${tag}4` }, { bed: bedLabels[3] }),
    );
    expect(taken.status).toBe(409);
    expect(taken.body.error!.message).toContain(`Bed ${bedLabels[3]}`);

    const unknownDisposition = await send(
      adt("A03", `ADT-${tag}-10`, { mrn: `HL${tag}3` }, { disposition: "99" }),
    );
    expect(unknownDisposition.status).toBe(422);
    expect(unknownDisposition.body.error!.message).toMatch(/PV1-36/);

    for (const mrn of [`HL${tag}2`, `HL${tag}4`]) {
      expect(await appDb()("patients").where({ mrn }).count({ n: "*" })).toEqual([{ n: 0 }]);
    }
  });
});
