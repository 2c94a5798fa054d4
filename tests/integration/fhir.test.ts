import { recordAdjustmentOperation } from "@/lib/adjustments/operations";
import { recordBloodGasOperation } from "@/lib/blood-gases/operations";
import { writeOrderOperation } from "@/lib/orders/operations";
import { chartReadingOperation } from "@/lib/readings/operations";
import type * as fhir4 from "fhir/r4";
import { afterAll, describe, expect, it } from "vitest";
import { closeDb } from "@/lib/db";
import { NotFoundError } from "@/lib/errors";
import { exportPatientFhir } from "@/lib/fhir/queries";
import type { OrderInput } from "@/lib/orders/schema";
import { actorByEmail, admitTestPatient, appDb, SEEDED } from "../helpers/db";
import { hfncOrder } from "../helpers/orders";
import { exportProblems, loincCodes, r4SchemaProblems, resourcesOf } from "../helpers/fhir";

afterAll(async () => {
  await closeDb();
});

const INSTALLATION = "http://localhost:3000";
const minutesAgo = (m: number) => new Date(Date.now() - m * 60_000);

/** Invented care through the real services: two orders, a reading, a gas and an adjustment. */
async function patientWithCare() {
  const { patientId } = await admitTestPatient("MICU");
  const physician = await actorByEmail(SEEDED.physician);
  const therapist = await actorByEmail(SEEDED.therapist);
  const nurse = await actorByEmail(SEEDED.nurse);
  const first = await writeOrderOperation.invoke(
    appDb(),
    physician,
    hfncOrder(patientId, { rationale: "Hypoxaemic after aspiration, trial of high flow" }),
    minutesAgo(50),
  );
  const reading = await chartReadingOperation.invoke(appDb(), nurse, {
    patientId,
    takenAt: minutesAgo(40).toISOString(),
    spo2: 90,
    respiratoryRate: 26,
    pulseRate: 112,
    device: "hfnc",
    flow: 40,
    fio2: 0.4,
  });
  const gas = await recordBloodGasOperation.invoke(appDb(), therapist, {
    patientId,
    sampledAt: minutesAgo(35).toISOString(),
    sampleType: "arterial",
    ph: 7.36,
    pao2: 61,
    paco2: 44,
    hco3: 24.5,
    baseExcess: -0.5,
    sao2: 91,
    hemoglobin: 12.4,
    device: "hfnc",
    flow: 40,
    fio2: 0.4,
  });
  const adjustment = await recordAdjustmentOperation.invoke(appDb(), therapist, {
    patientId,
    settingsVersion: 1,
    toFio2: 0.5,
    toFlow: 50,
    reason: "below_band",
    rationale: "SpO2 90 % on 0.40 and PaO2 61",
    appliedAt: minutesAgo(30).toISOString(),
  });
  const second = await writeOrderOperation.invoke(
    appDb(),
    physician,
    {
      entryMode: "written",
      password: "tidemark-demo",
      patientId,
      device: "niv",
      spo2Lower: 90,
      spo2Upper: 94,
      fio2Min: 0.4,
      fio2Max: 0.8,
      peepMin: 5,
      peepMax: 12,
      initialFio2: 0.5,
      initialPeep: 8,
      ventMode: "pressure_support",
      vtTarget: 7,
      vtMin: 5,
      vtMax: 9,
      rateMin: 12,
      rateMax: 30,
      reassessMinutes: 15,
      rationale: "Tiring on high flow; move to NIV",
      supersedesOrderId: first.id,
    } as OrderInput,
    minutesAgo(10),
  );
  return { patientId, first, second, reading, gas, adjustment };
}

const byId = <T extends { id?: string }>(list: T[], id: string): T => {
  const found = list.find((r) => r.id === id);
  if (!found) throw new Error(`No resource ${id}; have ${list.map((r) => r.id).join(", ")}`);
  return found;
};

describe("the FHIR R4 export of a patient", () => {
  it("exports charted care as a bundle that the R4 schema and the export's own checks accept", async () => {
    const { patientId, first, second, reading, gas, adjustment } = await patientWithCare();
    const nurse = await actorByEmail(SEEDED.nurse);
    const { bundle, mrn } = await exportPatientFhir(appDb(), nurse, patientId, {
      installation: INSTALLATION,
    });
    expect(mrn).toMatch(/^TST/);
    expect(r4SchemaProblems(bundle)).toEqual([]);
    expect(exportProblems(bundle)).toEqual([]);

    const [patient] = resourcesOf(bundle, "Patient");
    expect(patient).toMatchObject({
      id: `patient-${patientId}`,
      identifier: [{ system: "urn:tidemark:mrn", value: mrn }],
      birthDate: "1961-05-20",
      gender: "female",
    });

    const requests = resourcesOf(bundle, "ServiceRequest");
    expect(requests.map((r) => [r.id, r.status])).toEqual([
      [`order-${first.id}`, "completed"],
      [`order-${second.id}`, "active"],
    ]);
    const fullUrlOf = new Map(
      (bundle.entry ?? []).map((e) => [`${e.resource?.resourceType}/${e.resource?.id}`, e.fullUrl]),
    );
    expect(requests[1]?.replaces).toEqual([
      { reference: fullUrlOf.get(`ServiceRequest/order-${first.id}`) },
    ]);
    expect(requests[1]?.note?.map((n) => n.text).join("\n")).toContain(
      "Limits: FiO2 0.40–0.80, PEEP 5–12 cmH2O.",
    );

    const observations = resourcesOf(bundle, "Observation");
    const spo2 = byId(observations, `reading-${reading.id}-spo2`);
    expect(loincCodes(spo2)).toContain("59408-5");
    expect(spo2.valueQuantity).toMatchObject({ value: 90, code: "%" });
    expect(byId(observations, `reading-${reading.id}-pulse`).valueQuantity).toMatchObject({
      value: 112,
      code: "/min",
    });
    expect(byId(observations, `reading-${reading.id}-rr`).valueQuantity).toMatchObject({
      value: 26,
      code: "/min",
    });

    const panel = byId(observations, `blood-gas-${gas.id}`);
    expect(loincCodes(panel)).toEqual(["24336-0"]);
    const urlToResource = new Map((bundle.entry ?? []).map((e) => [e.fullUrl, e.resource]));
    const members = (panel.hasMember ?? []).map(
      (m) => urlToResource.get(m.reference) as fhir4.Observation,
    );
    expect(
      Object.fromEntries(members.map((m) => [loincCodes(m)[0], m.valueQuantity?.value])),
    ).toEqual({
      "2744-1": 7.36,
      "2019-8": 44,
      "2703-7": 61,
      "2708-6": 91,
      "1960-4": 24.5,
      "1925-7": -0.5,
      "718-7": 12.4,
    });

    const fio2Setting = byId(observations, `adjustment-${adjustment.id}-fio2`);
    expect(fio2Setting.valueQuantity).toMatchObject({ value: 50, code: "%" });
    expect(fio2Setting.effectiveDateTime).toBe(new Date(adjustment.appliedAt).toISOString());
    expect(fio2Setting.basedOn).toEqual([
      { reference: fullUrlOf.get(`ServiceRequest/order-${first.id}`) },
    ]);
    const peepStart = byId(observations, `order-${second.id}-start-peep`);
    expect(peepStart.valueQuantity).toMatchObject({ value: 8, code: "cm[H2O]" });
    expect(loincCodes(peepStart)).toEqual(["20077-4"]);
  });

  it("exports the same resources again on a second export", async () => {
    const { patientId } = await patientWithCare();
    const reviewer = await actorByEmail(SEEDED.reviewer);
    const first = await exportPatientFhir(appDb(), reviewer, patientId, {
      installation: INSTALLATION,
    });
    const again = await exportPatientFhir(appDb(), reviewer, patientId, {
      installation: INSTALLATION,
      exportedAt: new Date(Date.now() + 60_000),
    });
    expect(again.bundle.entry).toEqual(first.bundle.entry);
  });

  it("limits readings, gases and settings to `since`, keeping the orders", async () => {
    const { patientId, first, second, reading, adjustment } = await patientWithCare();
    const reviewer = await actorByEmail(SEEDED.reviewer);
    const { bundle } = await exportPatientFhir(appDb(), reviewer, patientId, {
      installation: INSTALLATION,
      since: minutesAgo(32),
    });
    expect(exportProblems(bundle)).toEqual([]);
    const ids = resourcesOf(bundle, "Observation").map((o) => o.id);
    expect(ids).not.toContain(`reading-${reading.id}-spo2`);
    expect(ids).toContain(`adjustment-${adjustment.id}-fio2`);
    expect(ids).toContain(`order-${second.id}-start-fio2`);
    expect(ids).not.toContain(`order-${first.id}-start-fio2`);
    expect(resourcesOf(bundle, "ServiceRequest")).toHaveLength(2);
  });

  it("exports every demo patient the reviewer can see as a valid bundle", async () => {
    // The seeded scenario covers every device, monitor imports and venous gases.
    const reviewer = await actorByEmail(SEEDED.reviewer);
    const seeded = (await appDb()("admissions as a")
      .join("patients as p", "p.id", "a.patient_id")
      .join("beds as b", "b.id", "a.bed_id")
      .whereNull("a.discharged_at")
      .whereIn("b.unit_id", reviewer.unitIds)
      .whereNot("p.family_name", "Testcase")
      .select("a.patient_id")) as { patient_id: number }[];
    expect(seeded.length).toBeGreaterThan(0);
    for (const { patient_id: patientId } of seeded) {
      const { bundle } = await exportPatientFhir(appDb(), reviewer, patientId, {
        installation: INSTALLATION,
      });
      expect({
        patientId,
        problems: [...exportProblems(bundle), ...r4SchemaProblems(bundle)],
      }).toEqual({
        patientId,
        problems: [],
      });
    }
  });

  it("lets the reviewer export, and answers another unit's patient as not found", async () => {
    const { patientId } = await patientWithCare();
    const reviewer = await actorByEmail(SEEDED.reviewer);
    const { bundle } = await exportPatientFhir(appDb(), reviewer, patientId, {
      installation: INSTALLATION,
    });
    expect(resourcesOf(bundle, "Patient")).toHaveLength(1);
    // A RESP-only nurse of the demo scenario.
    const outsider = await actorByEmail("greta.sorensen@kestrel.example");
    await expect(
      exportPatientFhir(appDb(), outsider, patientId, { installation: INSTALLATION }),
    ).rejects.toBeInstanceOf(NotFoundError);
    await expect(
      exportPatientFhir(appDb(), reviewer, 999_999_999, { installation: INSTALLATION }),
    ).rejects.toBeInstanceOf(NotFoundError);
  });
});
