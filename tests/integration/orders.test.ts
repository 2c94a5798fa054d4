import {
  cosignOrderOperation,
  discontinueOrderOperation,
  writeOrderOperation,
} from "@/lib/orders/operations";
import { createStepTableOperation } from "@/lib/step-tables/operations";
import { afterAll, describe, expect, it } from "vitest";
import { hashPassword } from "@/lib/auth/password";
import { closeDb } from "@/lib/db";
import { ConflictError, ForbiddenError, NotFoundError, ValidationError } from "@/lib/errors";
import { listLedgerForEntity } from "@/lib/ledger/queries";
import { verifyLedger } from "@/lib/ledger/verify";
import { stepTableMismatchMessage } from "@/lib/devices";
import { DESIGNATED_COSIGN_MEANING, SIGNATURE_MEANING } from "@/lib/orders/wording";
import { getBedsideContext } from "@/lib/chart/bedside";
import { getOrder, listCosignQueue } from "@/lib/orders/queries";
import { PAO2_BAND_INCOMPLETE, type OrderInput } from "@/lib/orders/schema";
import { actorByEmail, admitTestPatient, appDb, SEEDED, uniqueEmail } from "../helpers/db";

afterAll(async () => {
  await closeDb();
});

const PASSWORD = "tidemark-demo";

function ventilatorOrder(patientId: number, over: Partial<OrderInput> = {}): OrderInput {
  return {
    entryMode: "written",
    password: PASSWORD,
    patientId,
    device: "invasive",
    spo2Lower: 88,
    spo2Upper: 95,
    fio2Min: 0.3,
    fio2Max: 0.8,
    peepMin: 5,
    peepMax: 16,
    initialFio2: 0.5,
    initialPeep: 8,
    ventMode: "volume_control",
    vtTarget: 6,
    vtMin: 4,
    vtMax: 8,
    rateMin: 12,
    rateMax: 30,
    reassessMinutes: 60,
    rationale: "ARDS, protective ventilation",
    supersedesOrderId: null,
    ...over,
  } as OrderInput;
}

function hfncOrder(patientId: number, over: Partial<OrderInput> = {}): OrderInput {
  return ventilatorOrder(patientId, {
    device: "hfnc",
    fio2Max: 0.6,
    peepMin: undefined,
    peepMax: undefined,
    initialPeep: undefined,
    ventMode: undefined,
    vtTarget: undefined,
    vtMin: undefined,
    vtMax: undefined,
    rateMin: undefined,
    rateMax: undefined,
    flowMin: 30,
    flowMax: 60,
    initialFlow: 40,
    initialFio2: 0.4,
    ...over,
  });
}

async function stepTableByCode(code: string) {
  return (await appDb()("step_tables").where({ code }).first("id", "name", "kind")) as {
    id: number;
    name: string;
    kind: "fio2_peep" | "flow_fio2";
  };
}

async function ledgerFor(entityType: string, id: number) {
  return (await appDb()("ledger_entries")
    .where({ entity_type: entityType, entity_id: String(id) })
    .orderBy("id")) as {
    action: string;
    rationale: string | null;
    patient_id: number;
    chain_key: string;
  }[];
}

/** A physician of its own on one unit, optionally designated there to co-sign, signing with PASSWORD. */
async function newPhysician(unitId: number, opts: { designated?: boolean } = {}) {
  const email = uniqueEmail("physician");
  const [id] = await appDb()("users").insert({
    email,
    name: `Dr Test ${email.slice(10, 18)}`,
    role: "physician",
    password_hash: await hashPassword(PASSWORD),
  });
  await appDb()("user_units").insert({ user_id: id, unit_id: unitId });
  if (opts.designated) await appDb()("unit_cosigners").insert({ unit_id: unitId, user_id: id });
  return actorByEmail(email);
}

function verbalOrder(patientId: number, prescriberId: number, over: Partial<OrderInput> = {}) {
  return {
    ...ventilatorOrder(patientId, over),
    entryMode: "telephone",
    prescriberId,
    readBackConfirmed: true,
  } as unknown as OrderInput;
}

async function supersedeMail(orderId: number) {
  return (await appDb()("mail_outbox")
    .where({ purpose: "order_superseded" })
    .where("message_id", "like", `<order-${orderId}.superseded.%`)
    .select()) as {
    alert_id: number | null;
    recipient_user_id: number;
    to_address: string;
    subject: string;
    text_body: string;
    state: string;
  }[];
}

describe("orders", () => {
  it("a physician writes and signs an order: active, bedside settings started, ledger row with rationale", async () => {
    const { patientId } = await admitTestPatient();
    const physician = await actorByEmail(SEEDED.physician);
    const order = await writeOrderOperation.invoke(appDb(), physician, ventilatorOrder(patientId));
    expect(order).toMatchObject({
      status: "active",
      device: "invasive",
      spo2Band: { lower: 88, upper: 95 },
    });
    expect(order.signedAt).not.toBeNull();
    const context = await getBedsideContext(appDb(), physician, patientId);
    expect(context.settings).toMatchObject({ fio2: 0.5, peep: 8, version: 1 });
    const rows = await ledgerFor("order", order.id);
    expect(rows).toEqual([
      expect.objectContaining({
        action: "order.write",
        rationale: "ARDS, protective ventilation",
        chain_key: `patient:${patientId}`,
      }),
    ]);
  });

  it("writes the first orders of several patients at once: none is refused by a lock on a neighbouring patient", async () => {
    // Two first orders insert into neighbouring gaps of the current-order index;
    // InnoDB may pick one as a deadlock victim although they do not conflict.
    const physician = await actorByEmail(SEEDED.physician);
    const patients = await Promise.all(Array.from({ length: 6 }, () => admitTestPatient()));
    const results = await Promise.allSettled(
      patients.map(({ patientId }) =>
        writeOrderOperation.invoke(appDb(), physician, ventilatorOrder(patientId)),
      ),
    );
    expect(results.map((r) => (r.status === "rejected" ? String(r.reason) : r.status))).toEqual(
      patients.map(() => "fulfilled"),
    );
  });

  it("refuses a wrong signing password and writes nothing", async () => {
    const { patientId } = await admitTestPatient();
    const physician = await actorByEmail(SEEDED.physician);
    const error = await writeOrderOperation
      .invoke(appDb(), physician, ventilatorOrder(patientId, { password: "nope" }))
      .catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ValidationError);
    expect((error as ValidationError).fieldErrors?.password).toBeDefined();
    expect(await appDb()("orders").where({ patient_id: patientId }).first()).toBeUndefined();
  });

  it("refuses limits that do not fit the device, naming the field and range", async () => {
    const { patientId } = await admitTestPatient();
    const physician = await actorByEmail(SEEDED.physician);
    const error = (await writeOrderOperation
      .invoke(
        appDb(),
        physician,
        ventilatorOrder(patientId, {
          device: "nasal_cannula",
          peepMin: 5,
          fio2Max: 0.8,
          flowMin: undefined,
        }),
      )
      .catch((e: unknown) => e)) as ValidationError;
    expect(error).toBeInstanceOf(ValidationError);
    expect(error.fieldErrors?.fio2Max?.[0]).toMatch(
      /Nasal cannula delivers FiO2 between 0.21 and 0.45/,
    );
    expect(error.fieldErrors?.peepMin?.[0]).toMatch(/no PEEP setting/);
    expect(error.fieldErrors?.flowMin?.[0]).toMatch(/required/);
  });

  it("refuses a PaO2 band with one bound, on the missing bound, and writes nothing", async () => {
    const { patientId } = await admitTestPatient();
    const physician = await actorByEmail(SEEDED.physician);
    await expect(
      writeOrderOperation.invoke(appDb(), physician, ventilatorOrder(patientId, { pao2Lower: 60 })),
    ).rejects.toMatchObject({ fieldErrors: { pao2Upper: [PAO2_BAND_INCOMPLETE] } });
    await expect(
      writeOrderOperation.invoke(appDb(), physician, ventilatorOrder(patientId, { pao2Upper: 80 })),
    ).rejects.toMatchObject({ fieldErrors: { pao2Lower: [PAO2_BAND_INCOMPLETE] } });
    expect(await appDb()("orders").where({ patient_id: patientId }).first()).toBeUndefined();

    const order = await writeOrderOperation.invoke(
      appDb(),
      physician,
      ventilatorOrder(patientId, { pao2Lower: 60, pao2Upper: 80 }),
    );
    expect(order.pao2Band).toEqual({ lower: 60, upper: 80 });
  });

  it("refuses a step table whose kind does not fit the device, naming the table and the device", async () => {
    const { patientId, unitId } = await admitTestPatient();
    const physician = await actorByEmail(SEEDED.physician);
    const admin = await actorByEmail(SEEDED.admin);
    // A FiO2/PEEP table for a device without PEEP.
    const ardsnet = await stepTableByCode("ardsnet-lower-peep");
    await expect(
      writeOrderOperation.invoke(
        appDb(),
        physician,
        hfncOrder(patientId, { stepTableId: ardsnet.id }),
      ),
    ).rejects.toMatchObject({
      fieldErrors: { stepTableId: [stepTableMismatchMessage(ardsnet, "hfnc")] },
    });
    // A flow/FiO2 table for a device without flow.
    const ladder = await createStepTableOperation.invoke(appDb(), admin, {
      unitId,
      name: `HFNC ladder ${patientId}`,
      kind: "flow_fio2",
      source: "Unit protocol (invented for tests)",
      rows: [
        { fio2Min: 0.3, fio2Max: 0.3, flow: 30 },
        { fio2Min: 0.4, fio2Max: 0.4, flow: 40 },
      ],
      rationale: "unit ladder for a test",
    });
    const refusal = (await writeOrderOperation
      .invoke(appDb(), physician, ventilatorOrder(patientId, { stepTableId: ladder.id }))
      .catch((e: unknown) => e)) as ValidationError;
    expect(refusal).toBeInstanceOf(ValidationError);
    expect(refusal.fieldErrors?.stepTableId).toEqual([
      stepTableMismatchMessage(ladder, "invasive"),
    ]);
    expect(await appDb()("orders").where({ patient_id: patientId }).first()).toBeUndefined();

    // Each kind is accepted where it fits.
    const first = await writeOrderOperation.invoke(
      appDb(),
      physician,
      hfncOrder(patientId, { stepTableId: ladder.id }),
    );
    const second = await writeOrderOperation.invoke(
      appDb(),
      physician,
      ventilatorOrder(patientId, { stepTableId: ardsnet.id, supersedesOrderId: first.id }),
    );
    expect([first.stepTableId, second.stepTableId]).toEqual([ladder.id, ardsnet.id]);
  });

  it("an order names who signed it, what it replaced and what replaced it; its history stays on its unit", async () => {
    const { patientId } = await admitTestPatient("RESP");
    const physician = await actorByEmail(SEEDED.physician);
    const first = await writeOrderOperation.invoke(appDb(), physician, hfncOrder(patientId));
    const second = await writeOrderOperation.invoke(
      appDb(),
      physician,
      hfncOrder(patientId, { supersedesOrderId: first.id }),
    );
    const replaced = await getOrder(appDb(), first.id);
    expect(replaced).toMatchObject({
      status: "superseded",
      signedBy: { id: physician.id, name: physician.name },
      supersededBy: { id: second.id, at: second.createdAt },
      replacedOrderId: null,
      readBackConfirmed: false,
      discontinuedBy: null,
    });
    expect(await getOrder(appDb(), second.id)).toMatchObject({
      supersededBy: null,
      replacedOrderId: first.id,
    });

    const history = await listLedgerForEntity(appDb(), physician, "order", first.id);
    expect(history.map((e) => e.action)).toEqual(["order.write", "order.supersede"]);
    const micuOnly = await actorByEmail("tobias.renwick@kestrel.example");
    expect(await listLedgerForEntity(appDb(), micuOnly, "order", first.id)).toEqual([]);
  });

  it("a nurse cannot write a signed order, but can enter a read-back verbal order that waits for co-signature", async () => {
    const { patientId } = await admitTestPatient();
    const nurse = await actorByEmail(SEEDED.nurse);
    const physician = await actorByEmail(SEEDED.physician);
    await expect(
      writeOrderOperation.invoke(appDb(), nurse, ventilatorOrder(patientId)),
    ).rejects.toMatchObject({
      fieldErrors: { entryMode: [expect.stringMatching(/verbal or telephone/)] },
    });
    const verbal = {
      ...ventilatorOrder(patientId),
      entryMode: "verbal",
      prescriberId: physician.id,
      readBackConfirmed: false,
    } as unknown as OrderInput;
    await expect(writeOrderOperation.invoke(appDb(), nurse, verbal)).rejects.toMatchObject({
      fieldErrors: { readBackConfirmed: [expect.any(String)] },
    });
    const order = await writeOrderOperation.invoke(appDb(), nurse, {
      ...verbal,
      readBackConfirmed: true,
    } as OrderInput);
    expect(order).toMatchObject({
      status: "awaiting_cosign",
      entryMode: "verbal",
      prescriber: { id: physician.id },
    });
    const before = new Date();
    await new Promise((r) => setTimeout(r, 20));

    // Only a physician co-signs, with the password re-asked.
    await expect(
      cosignOrderOperation.invoke(appDb(), nurse, {
        orderId: order.id,
        version: order.version,
        password: PASSWORD,
      }),
    ).rejects.toBeInstanceOf(ForbiddenError);
    const signed = await cosignOrderOperation.invoke(appDb(), physician, {
      orderId: order.id,
      version: order.version,
      password: PASSWORD,
    });
    expect(signed).toMatchObject({ status: "active", cosignedBy: { id: physician.id } });
    // The system-versioned table still shows the order as it stood before co-signature.
    expect((await getOrder(appDb(), order.id, before))?.status).toBe("awaiting_cosign");
    expect((await ledgerFor("order", order.id)).map((r) => r.action)).toEqual([
      "order.verbal",
      "order.cosign",
    ]);
  });

  it("a new order supersedes the one in effect; a writer who saw a different order gets a conflict", async () => {
    const { patientId } = await admitTestPatient();
    const physician = await actorByEmail(SEEDED.physician);
    const first = await writeOrderOperation.invoke(appDb(), physician, ventilatorOrder(patientId));
    await expect(
      writeOrderOperation.invoke(appDb(), physician, ventilatorOrder(patientId)),
    ).rejects.toBeInstanceOf(ConflictError);
    const second = await writeOrderOperation.invoke(
      appDb(),
      physician,
      ventilatorOrder(patientId, { supersedesOrderId: first.id, fio2Max: 0.9 }),
    );
    expect(second.status).toBe("active");
    expect((await getOrder(appDb(), first.id))?.status).toBe("superseded");
    expect((await ledgerFor("order", first.id)).map((r) => r.action)).toEqual([
      "order.write",
      "order.supersede",
    ]);
  });

  it("lets exactly one of two simultaneous first orders win", async () => {
    const { patientId } = await admitTestPatient();
    const physician = await actorByEmail(SEEDED.physician);
    const results = await Promise.allSettled([
      writeOrderOperation.invoke(appDb(), physician, ventilatorOrder(patientId)),
      writeOrderOperation.invoke(appDb(), physician, ventilatorOrder(patientId)),
    ]);
    expect(results.filter((r) => r.status === "fulfilled")).toHaveLength(1);
    expect(
      (results.find((r) => r.status === "rejected") as PromiseRejectedResult).reason,
    ).toBeInstanceOf(ConflictError);
  });

  it("writes once for a repeated idempotency key", async () => {
    const { patientId } = await admitTestPatient();
    const physician = await actorByEmail(SEEDED.physician);
    const input = ventilatorOrder(patientId, { idempotencyKey: `order-${patientId}-key` });
    const [a, b] = await Promise.all([
      writeOrderOperation.invoke(appDb(), physician, input),
      writeOrderOperation.invoke(appDb(), physician, input),
    ]);
    expect(a.id).toBe(b.id);
    expect(
      await appDb()("orders").where({ patient_id: patientId }).count({ n: "*" }).first(),
    ).toMatchObject({ n: 1 });
  });

  it("discontinues with a reason; another unit's order answers not found", async () => {
    const { patientId } = await admitTestPatient("RESP");
    const physician = await actorByEmail(SEEDED.physician);
    const order = await writeOrderOperation.invoke(appDb(), physician, hfncOrder(patientId));
    const micuOnly = await actorByEmail("tobias.renwick@kestrel.example");
    await expect(
      discontinueOrderOperation.invoke(appDb(), micuOnly, {
        orderId: order.id,
        version: order.version,
        reason: "not mine",
        password: PASSWORD,
      }),
    ).rejects.toBeInstanceOf(NotFoundError);
    await expect(
      discontinueOrderOperation.invoke(appDb(), physician, {
        orderId: order.id,
        version: order.version,
        reason: "",
        password: PASSWORD,
      }),
    ).rejects.toMatchObject({ fieldErrors: { reason: [expect.any(String)] } });
    const done = await discontinueOrderOperation.invoke(appDb(), physician, {
      orderId: order.id,
      version: order.version,
      reason: "Extubated to room air",
      password: PASSWORD,
    });
    expect(done).toMatchObject({
      status: "discontinued",
      discontinueReason: "Extubated to room air",
    });
    expect((await verifyLedger(appDb())).ok).toBe(true);
  });
});

describe("who co-signs a verbal order", () => {
  it("refuses a physician who is neither the named prescriber nor designated, with 403 naming who may, and changes nothing", async () => {
    const { patientId, unitId } = await admitTestPatient();
    const nurse = await actorByEmail(SEEDED.nurse);
    const prescriber = await newPhysician(unitId);
    const colleague = await newPhysician(unitId);
    const order = await writeOrderOperation.invoke(
      appDb(),
      nurse,
      verbalOrder(patientId, prescriber.id),
    );

    for (const physician of [colleague, await actorByEmail(SEEDED.physician)]) {
      const error = (await cosignOrderOperation
        .invoke(appDb(), physician, {
          orderId: order.id,
          version: order.version,
          password: PASSWORD,
        })
        .catch((e: unknown) => e)) as ForbiddenError;
      expect(error).toBeInstanceOf(ForbiddenError);
      expect(error.status).toBe(403);
      // The seed designates Dr Tobias Renwick on MICU (other tests may add more).
      expect(error.message).toMatch(
        `Only the prescriber named on the order, ${prescriber.name}, or a co-signer this unit designates (`,
      );
      expect(error.message).toMatch(/Dr Tobias Renwick.*\) may co-sign it\.$/);
    }
    expect(await getOrder(appDb(), order.id)).toMatchObject({
      status: "awaiting_cosign",
      version: order.version,
      cosignedBy: null,
      signedBy: null,
    });
    expect((await ledgerFor("order", order.id)).map((r) => r.action)).toEqual(["order.verbal"]);

    // The queue tells each physician whether they may co-sign.
    const entry = (await listCosignQueue(appDb(), [unitId])).find((o) => o.id === order.id);
    expect(entry?.cosigners.prescriber.id).toBe(prescriber.id);
    expect(entry?.cosigners.designated.map((p) => p.name)).toContain("Dr Tobias Renwick");
    expect(entry?.cosigners.designated.map((p) => p.id)).not.toContain(colleague.id);
  });

  it("lets the named prescriber co-sign, with the prescriber's signature meaning", async () => {
    const { patientId, unitId } = await admitTestPatient();
    const nurse = await actorByEmail(SEEDED.nurse);
    const prescriber = await newPhysician(unitId);
    const order = await writeOrderOperation.invoke(
      appDb(),
      nurse,
      verbalOrder(patientId, prescriber.id),
    );
    const signed = await cosignOrderOperation.invoke(appDb(), prescriber, {
      orderId: order.id,
      version: order.version,
      password: PASSWORD,
    });
    expect(signed).toMatchObject({
      status: "active",
      cosignedBy: { id: prescriber.id },
      signedBy: { id: prescriber.id },
      signatureMeaning: SIGNATURE_MEANING,
    });
  });

  it("lets a physician the unit designates co-sign another prescriber's order, and only on that unit", async () => {
    const { patientId, unitId } = await admitTestPatient();
    const resp = await admitTestPatient("RESP");
    const nurse = await actorByEmail(SEEDED.nurse);
    const prescriber = await newPhysician(unitId);
    const designated = await newPhysician(unitId, { designated: true });
    // Designated on RESP only (and assigned to MICU too): not a co-signer on MICU.
    const respCosigner = await newPhysician(resp.unitId, { designated: true });
    await appDb()("user_units").insert({ user_id: respCosigner.id, unit_id: unitId });
    const order = await writeOrderOperation.invoke(
      appDb(),
      nurse,
      verbalOrder(patientId, prescriber.id),
    );

    await expect(
      cosignOrderOperation.invoke(appDb(), await actorByEmail(respCosigner.email), {
        orderId: order.id,
        version: order.version,
        password: PASSWORD,
      }),
    ).rejects.toBeInstanceOf(ForbiddenError);
    const signed = await cosignOrderOperation.invoke(appDb(), designated, {
      orderId: order.id,
      version: order.version,
      password: PASSWORD,
    });
    expect(signed).toMatchObject({
      status: "active",
      prescriber: { id: prescriber.id },
      cosignedBy: { id: designated.id },
      signatureMeaning: DESIGNATED_COSIGN_MEANING,
    });
    expect((await ledgerFor("order", order.id)).map((r) => [r.action, r.rationale])).toEqual([
      ["order.verbal", expect.any(String)],
      [
        "order.cosign",
        `Co-signed telephone order entered by ${nurse.name} from ${prescriber.name}, as a co-signer the unit designates`,
      ],
    ]);
  });

  it("a designation lapses when the physician leaves the unit or is deactivated", async () => {
    const { patientId, unitId } = await admitTestPatient();
    const nurse = await actorByEmail(SEEDED.nurse);
    const prescriber = await newPhysician(unitId);
    const deactivated = await newPhysician(unitId, { designated: true });
    const moved = await newPhysician(unitId, { designated: true });
    const order = await writeOrderOperation.invoke(
      appDb(),
      nurse,
      verbalOrder(patientId, prescriber.id),
    );
    const designatedNow = async () =>
      (await listCosignQueue(appDb(), [unitId]))
        .find((o) => o.id === order.id)
        ?.cosigners.designated.map((p) => p.id);
    expect(await designatedNow()).toEqual(expect.arrayContaining([deactivated.id, moved.id]));
    await appDb()("users").where({ id: deactivated.id }).update({ active: false });
    await appDb()("user_units").where({ user_id: moved.id }).delete();
    const now = await designatedNow();
    expect(now).not.toContain(deactivated.id);
    expect(now).not.toContain(moved.id);
  });
});

describe("a verbal order superseding a signed one", () => {
  it("queues one e-mail to the replaced order's prescriber in the same transaction, and says so in the ledger", async () => {
    const { patientId, unitId } = await admitTestPatient();
    const nurse = await actorByEmail(SEEDED.nurse);
    const oldPrescriber = await newPhysician(unitId);
    const signed = await writeOrderOperation.invoke(
      appDb(),
      oldPrescriber,
      ventilatorOrder(patientId),
    );
    expect(await supersedeMail(signed.id)).toEqual([]);

    const ines = await actorByEmail(SEEDED.physician);
    const verbal = await writeOrderOperation.invoke(
      appDb(),
      nurse,
      verbalOrder(patientId, ines.id, { supersedesOrderId: signed.id, fio2Max: 0.9 }),
    );
    const mail = await supersedeMail(signed.id);
    expect(mail).toHaveLength(1);
    expect(mail[0]).toMatchObject({
      alert_id: null,
      recipient_user_id: oldPrescriber.id,
      to_address: oldPrescriber.email,
      state: "pending",
    });
    expect(mail[0]!.subject).toContain(
      `Your order #${signed.id} was replaced by a telephone order`,
    );
    expect(mail[0]!.text_body).toContain(
      `${nurse.name} entered telephone order #${verbal.id} from ${ines.name}`,
    );
    // Minimum necessary: no patient name or record number leaves by e-mail.
    expect(mail[0]!.text_body).not.toMatch(/Testcase|TST/);

    const supersede = (await ledgerFor("order", signed.id)).find(
      (r) => r.action === "order.supersede",
    );
    expect(supersede?.rationale).toBe(
      `Superseded by order #${verbal.id}; its prescriber, ${oldPrescriber.name}, is e-mailed`,
    );
    const entered = (await appDb()("ledger_entries")
      .where({ entity_type: "order", entity_id: String(verbal.id), action: "order.verbal" })
      .first("after_json")) as { after_json: string };
    expect(JSON.parse(entered.after_json)).toMatchObject({
      supersededPrescriberNotice: {
        orderId: signed.id,
        recipientUserId: oldPrescriber.id,
        mailed: true,
      },
    });
  });

  it("queues nothing when the replaced order was not signed, or the new one is written", async () => {
    const { patientId, unitId } = await admitTestPatient();
    const nurse = await actorByEmail(SEEDED.nurse);
    const prescriber = await newPhysician(unitId);
    const first = await writeOrderOperation.invoke(appDb(), prescriber, ventilatorOrder(patientId));
    const written = await writeOrderOperation.invoke(
      appDb(),
      prescriber,
      ventilatorOrder(patientId, { supersedesOrderId: first.id }),
    );
    const unsigned = await writeOrderOperation.invoke(
      appDb(),
      nurse,
      verbalOrder(patientId, prescriber.id, { supersedesOrderId: written.id }),
    );
    expect((await supersedeMail(written.id)).map((m) => m.recipient_user_id)).toEqual([
      prescriber.id,
    ]);
    await writeOrderOperation.invoke(
      appDb(),
      nurse,
      verbalOrder(patientId, prescriber.id, { supersedesOrderId: unsigned.id }),
    );
    expect(await supersedeMail(first.id)).toEqual([]);
    expect(await supersedeMail(unsigned.id)).toEqual([]);
  });
});
