import type * as fhir4 from "fhir/r4";
import { beforeAll, describe, expect, it } from "vitest";
import {
  buildPatientBundle,
  fio2Percent,
  type FhirPatientRecord,
  serviceRequestStatus,
} from "@/lib/fhir/bundle";
import { UCUM } from "@/lib/fhir/codes";
import type { OrderView } from "@/lib/orders/queries";
import {
  compileR4Schema,
  exportProblems,
  loincCodes,
  r4SchemaProblems,
  resourcesOf,
  ucumProblem,
} from "../../helpers/fhir";

// Invented patient and care; nothing here comes from a real record.
const INSTALLATION = "https://tidemark.kestrel.example";

function order(
  overrides: Partial<OrderView> & Pick<OrderView, "id" | "status" | "device">,
): OrderView {
  return {
    patientId: 7,
    admissionId: 70,
    unitId: 1,
    spo2Band: { lower: 92, upper: 96 },
    pao2Band: null,
    limits: { fio2Min: 0.24, fio2Max: 0.45, peepMin: null, peepMax: null, flowMin: 1, flowMax: 6 },
    initial: { fio2: 0.29, peep: null, flow: 2 },
    stepTableId: null,
    ventilator: null,
    reassessMinutes: 60,
    rationale: "Community-acquired pneumonia, hypoxaemic on air",
    entryMode: "written",
    enteredBy: { id: 3, name: "Orla Fenwick" },
    prescriber: { id: 3, name: "Orla Fenwick" },
    readBackConfirmed: false,
    signedBy: { id: 3, name: "Orla Fenwick" },
    signedAt: "2026-12-01T08:00:00.000Z",
    signatureMeaning: "Prescribed",
    cosignedBy: null,
    cosignedAt: null,
    discontinuedBy: null,
    discontinuedAt: null,
    discontinueReason: null,
    supersededBy: null,
    replacedOrderId: null,
    version: 1,
    createdAt: "2026-12-01T08:00:00.000Z",
    ...overrides,
  };
}

function record(): FhirPatientRecord {
  return {
    patient: {
      id: 7,
      mrn: "KX-100234",
      familyName: "Marrow",
      givenName: "Tamsin",
      birthDate: "1958-03-14",
      sex: "female",
    },
    orders: [
      // Listed newest first on purpose: the bundle sorts them.
      order({
        id: 12,
        status: "active",
        device: "hfnc",
        limits: {
          fio2Min: 0.3,
          fio2Max: 0.6,
          peepMin: null,
          peepMax: null,
          flowMin: 30,
          flowMax: 60,
        },
        pao2Band: { lower: 60, upper: 90 },
        initial: { fio2: 0.4, peep: null, flow: 40 },
        entryMode: "verbal",
        enteredBy: { id: 5, name: "Piet Lindqvist" },
        readBackConfirmed: true,
        signedBy: null,
        signedAt: null,
        replacedOrderId: 11,
        createdAt: "2026-12-01T12:00:00.000Z",
      }),
      order({
        id: 11,
        status: "superseded",
        device: "nasal_cannula",
        supersededBy: { id: 12, at: "2026-12-01T12:00:00.000Z" },
      }),
    ],
    readings: [
      {
        id: 101,
        patientId: 7,
        takenAt: "2026-12-01T09:00:00.000Z",
        spo2: 91,
        respiratoryRate: 22,
        pulseRate: 104,
        device: "nasal_cannula",
        flow: 2,
        fio2: 0.29,
        fio2Estimated: true,
        source: "manual",
        recordedBy: "Piet Lindqvist",
      },
      {
        id: 102,
        patientId: 7,
        takenAt: "2026-12-01T13:00:00.000Z",
        spo2: 94.5,
        respiratoryRate: null,
        pulseRate: null,
        device: "hfnc",
        flow: 40,
        fio2: 0.4,
        fio2Estimated: false,
        source: "monitor",
        recordedBy: null,
      },
    ],
    bloodGases: [
      {
        id: 201,
        sampledAt: "2026-12-01T11:30:00.000Z",
        sampleType: "arterial",
        ph: 7.44,
        po2MmHg: 58,
        pco2MmHg: 33.5,
        hco3MmolL: 22.4,
        baseExcessMmolL: -1.5,
        so2Pct: 90.5,
        hbGDl: 11.8,
        device: "nasal_cannula",
        fio2: 0.29,
        fio2Estimated: true,
        peepCmH2O: null,
        recordedBy: "Piet Lindqvist",
      },
      {
        id: 202,
        sampledAt: "2026-12-01T14:00:00.000Z",
        sampleType: "venous",
        ph: null,
        po2MmHg: 38,
        pco2MmHg: 46,
        hco3MmolL: null,
        baseExcessMmolL: null,
        so2Pct: null,
        hbGDl: null,
        device: "niv",
        fio2: 0.5,
        fio2Estimated: false,
        peepCmH2O: 8,
        recordedBy: "Piet Lindqvist",
      },
    ],
    adjustments: [
      {
        id: 301,
        orderId: 12,
        appliedAt: "2026-12-01T13:30:00.000Z",
        device: "hfnc",
        fio2: 0.35,
        peepCmH2O: null,
        flowLMin: 50,
        reasonLabel: "SpO2 above the target band on oxygen",
        rationale: "SpO2 97 % on 0.40; wean FiO2",
        recordedBy: "Piet Lindqvist",
      },
    ],
  };
}

const build = (overrides: { since?: Date; exportedAt?: Date } = {}) =>
  buildPatientBundle(record(), {
    installation: INSTALLATION,
    exportedAt: overrides.exportedAt ?? new Date("2026-12-01T15:00:00Z"),
    ...(overrides.since ? { since: overrides.since } : {}),
  });

const byId = <T extends { id?: string }>(list: T[], id: string): T => {
  const found = list.find((r) => r.id === id);
  if (!found) throw new Error(`No resource ${id}; have ${list.map((r) => r.id).join(", ")}`);
  return found;
};

// The R4 JSON schema is several megabytes and ajv takes seconds to compile it,
// longer on a loaded machine: it is compiled once, before the tests, under a
// generous hook timeout. The tests that validate also get an explicit timeout
// above the 5 s default: validating a bundle walks its oneOf over every
// resource type, with every error collected.
const SCHEMA_COMPILE_TIMEOUT_MS = 120_000;
/** Options of each test that validates against the schema. */
const SCHEMA = { timeout: 30_000 } as const;

describe("the FHIR R4 export bundle", () => {
  beforeAll(() => {
    compileR4Schema(["Patient", "Observation", "ServiceRequest"]);
  }, SCHEMA_COMPILE_TIMEOUT_MS);

  it("validates against the official FHIR R4 JSON schema", SCHEMA, () => {
    expect(r4SchemaProblems(build())).toEqual([]);
  });

  it("codes every Observation in LOINC with UCUM quantities, and every reference resolves", () => {
    const bundle = build();
    expect(exportProblems(bundle)).toEqual([]);
    expect(resourcesOf(bundle, "Observation").length).toBeGreaterThan(10);
  });

  it("lets both validators fail on a broken bundle", SCHEMA, () => {
    const bundle = build();
    const spo2 = byId(resourcesOf(bundle, "Observation"), "reading-101-spo2");
    (spo2 as { status: string }).status = "measured";
    spo2.valueQuantity = { value: 91, system: "http://unitsofmeasure.org", code: "percent" };
    spo2.code = { coding: [{ system: "http://snomed.info/sct", code: "431314004" }] };
    spo2.subject = { reference: "urn:uuid:00000000-0000-5000-8000-000000000000" };
    expect(r4SchemaProblems(bundle).join("\n")).toMatch(/status/);
    const problems = exportProblems(bundle).join("\n");
    expect(problems).toMatch(/"percent" is not valid UCUM/);
    expect(problems).toMatch(/no LOINC coding/);
    expect(problems).toMatch(/is not in the bundle/);
  });

  it("opens with the Patient, identified by MRN", () => {
    const [first] = build().entry ?? [];
    expect(first?.resource).toMatchObject({
      resourceType: "Patient",
      id: "patient-7",
      identifier: [
        { system: "urn:tidemark:mrn", value: "KX-100234", type: { coding: [{ code: "MR" }] } },
      ],
      name: [{ family: "Marrow", given: ["Tamsin"] }],
      gender: "female",
      birthDate: "1958-03-14",
    });
  });

  it("sends a reading as SpO2 with the FiO2 (in %) and flow in use, plus RR and pulse as vital signs", () => {
    const observations = resourcesOf(build(), "Observation");
    const spo2 = byId(observations, "reading-101-spo2");
    expect(loincCodes(spo2)).toEqual(["59408-5", "2708-6"]);
    expect(spo2.category?.[0]?.coding?.[0]?.code).toBe("vital-signs");
    expect(spo2.effectiveDateTime).toBe("2026-12-01T09:00:00.000Z");
    expect(spo2.valueQuantity).toEqual({
      value: 91,
      unit: "%",
      system: "http://unitsofmeasure.org",
      code: "%",
    });
    expect(
      spo2.component?.map((c) => [
        c.code.coding?.[0]?.code,
        c.valueQuantity?.value,
        c.valueQuantity?.code,
      ]),
    ).toEqual([
      ["3150-0", 29, "%"],
      ["3151-8", 2, "L/min"],
    ]);
    expect(spo2.note?.map((n) => n.text).join(" ")).toMatch(/Nasal cannula.*estimated/);
    expect(spo2.performer).toEqual([{ display: "Piet Lindqvist" }]);
    expect(byId(observations, "reading-101-rr").valueQuantity).toMatchObject({
      value: 22,
      code: "/min",
    });
    expect(loincCodes(byId(observations, "reading-101-rr"))).toEqual(["9279-1"]);
    expect(byId(observations, "reading-101-pulse").valueQuantity).toMatchObject({
      value: 104,
      code: "/min",
    });
    expect(loincCodes(byId(observations, "reading-101-pulse"))).toEqual(["8867-4"]);
  });

  it("leaves out what a reading did not record", () => {
    const ids = resourcesOf(build(), "Observation").map((o) => o.id);
    expect(ids).toContain("reading-102-spo2");
    expect(ids).not.toContain("reading-102-rr");
    expect(ids).not.toContain("reading-102-pulse");
    const spo2 = byId(resourcesOf(build(), "Observation"), "reading-102-spo2");
    expect(spo2.performer).toBeUndefined();
    expect(spo2.valueQuantity?.value).toBe(94.5);
  });

  it("sends an arterial gas as a panel whose members carry the arterial LOINC codes", () => {
    const bundle = build();
    const observations = resourcesOf(bundle, "Observation");
    const panel = byId(observations, "blood-gas-201");
    expect(loincCodes(panel)).toEqual(["24336-0"]);
    expect(panel.valueQuantity).toBeUndefined();
    const urlOf = new Map((bundle.entry ?? []).map((e) => [e.fullUrl, e.resource]));
    const members = (panel.hasMember ?? []).map((m) => urlOf.get(m.reference) as fhir4.Observation);
    expect(
      members.map((m) => [loincCodes(m)[0], m.valueQuantity?.value, m.valueQuantity?.code]),
    ).toEqual([
      ["2744-1", 7.44, "[pH]"],
      ["2019-8", 33.5, "mm[Hg]"],
      ["2703-7", 58, "mm[Hg]"],
      ["2708-6", 90.5, "%"],
      ["1960-4", 22.4, "mmol/L"],
      ["1925-7", -1.5, "mmol/L"],
      ["718-7", 11.8, "g/dL"],
    ]);
    expect(members.every((m) => m.effectiveDateTime === "2026-12-01T11:30:00.000Z")).toBe(true);
    expect(panel.component?.map((c) => [c.code.coding?.[0]?.code, c.valueQuantity?.value])).toEqual(
      [["3150-0", 29]],
    );
  });

  it("sends a venous gas with venous codes only, without the members it lacks, and PEEP at sampling", () => {
    const observations = resourcesOf(build(), "Observation");
    const panel = byId(observations, "blood-gas-202");
    // LOINC 24339-4 "Gas panel - Venous blood"; 24338-6 is the panel for blood
    // of unspecified specimen and would not say the sample was venous.
    expect(loincCodes(panel)).toEqual(["24339-4"]);
    expect(panel.code.coding?.[0]?.display).toBe("Gas panel - Venous blood");
    expect(panel.hasMember).toHaveLength(2);
    const members = observations.filter((o) => o.id?.startsWith("blood-gas-202-"));
    expect(members.map((m) => loincCodes(m)[0]).sort()).toEqual(["2021-4", "2705-2"]);
    expect(
      panel.component?.map((c) => [
        c.code.coding?.[0]?.code,
        c.valueQuantity?.value,
        c.valueQuantity?.code,
      ]),
    ).toEqual([
      ["3150-0", 50, "%"],
      ["20077-4", 8, "cm[H2O]"],
    ]);
  });

  it("sends each applied setting as an Observation based on its order", () => {
    const bundle = build();
    const observations = resourcesOf(bundle, "Observation");
    const requests = new Map((bundle.entry ?? []).map((e) => [e.fullUrl, e.resource]));
    // HFNC's FiO2 is set on the device and sent as a setting: LOINC 19994-3.
    const fio2 = byId(observations, "adjustment-301-fio2");
    expect(loincCodes(fio2)).toEqual(["19994-3"]);
    expect(fio2.effectiveDateTime).toBe("2026-12-01T13:30:00.000Z");
    expect(fio2.valueQuantity).toMatchObject({ value: 35, code: "%" });
    expect(fio2.category?.[0]?.coding?.[0]?.code).toBe("therapy");
    expect(requests.get(fio2.basedOn?.[0]?.reference)).toMatchObject({
      resourceType: "ServiceRequest",
      id: "order-12",
    });
    expect(fio2.note?.[0]?.text).toContain("wean FiO2");
    expect(byId(observations, "adjustment-301-flow").valueQuantity).toMatchObject({
      value: 50,
      code: "L/min",
    });
    expect(observations.map((o) => o.id)).not.toContain("adjustment-301-peep");
    // Each order's starting settings, as the order service applies them.
    const start11 = byId(observations, "order-11-start-fio2");
    // A nasal cannula's FiO2 is an estimate of the inhaled concentration: 3150-0.
    expect(loincCodes(start11)).toEqual(["3150-0"]);
    expect(start11.effectiveDateTime).toBe("2026-12-01T08:00:00.000Z");
    expect(start11.valueQuantity?.value).toBe(29);
    expect(start11.note?.map((n) => n.text).join(" ")).toMatch(/estimated/);
    expect(byId(observations, "order-12-start-flow").valueQuantity?.value).toBe(40);
  });

  it("sends a ventilator's FiO2 setting as LOINC 19994-3 and its PEEP as 20077-4", SCHEMA, () => {
    // An invasively ventilated patient, then NIV after extubation; no readings or gases.
    const ventilated: FhirPatientRecord = {
      ...record(),
      readings: [],
      bloodGases: [],
      orders: [
        order({
          id: 21,
          status: "superseded",
          device: "invasive",
          limits: {
            fio2Min: 0.3,
            fio2Max: 0.8,
            peepMin: 5,
            peepMax: 14,
            flowMin: null,
            flowMax: null,
          },
          initial: { fio2: 0.5, peep: 8, flow: null },
          supersededBy: { id: 22, at: "2026-12-02T10:00:00.000Z" },
          createdAt: "2026-12-02T08:00:00.000Z",
        }),
        order({
          id: 22,
          status: "active",
          device: "niv",
          limits: {
            fio2Min: 0.3,
            fio2Max: 0.6,
            peepMin: 5,
            peepMax: 10,
            flowMin: null,
            flowMax: null,
          },
          initial: { fio2: 0.4, peep: 6, flow: null },
          replacedOrderId: 21,
          createdAt: "2026-12-02T10:00:00.000Z",
        }),
      ],
      adjustments: [
        {
          id: 401,
          orderId: 21,
          appliedAt: "2026-12-02T09:00:00.000Z",
          device: "invasive",
          fio2: 0.45,
          peepCmH2O: 10,
          flowLMin: null,
          reasonLabel: "SpO2 above the target band",
          rationale: "SpO2 97 % on 0.50; wean FiO2, raise PEEP",
          recordedBy: "Piet Lindqvist",
        },
      ],
    };
    const bundle = buildPatientBundle(ventilated, {
      installation: INSTALLATION,
      exportedAt: new Date("2026-12-02T12:00:00Z"),
    });
    expect(r4SchemaProblems(bundle)).toEqual([]);
    expect(exportProblems(bundle)).toEqual([]);
    const observations = resourcesOf(bundle, "Observation");
    const setting = (id: string) => {
      const o = byId(observations, id);
      return [
        loincCodes(o),
        o.code.coding?.[0]?.display,
        o.valueQuantity?.value,
        o.valueQuantity?.code,
      ];
    };
    const FIO2_SETTING = "Oxygen/Inspired gas setting [Volume Fraction] Ventilator";
    expect(setting("order-21-start-fio2")).toEqual([["19994-3"], FIO2_SETTING, 50, "%"]);
    expect(setting("adjustment-401-fio2")).toEqual([["19994-3"], FIO2_SETTING, 45, "%"]);
    expect(setting("order-22-start-fio2")).toEqual([["19994-3"], FIO2_SETTING, 40, "%"]);
    expect(setting("adjustment-401-peep")).toEqual([
      ["20077-4"],
      "Positive end expiratory pressure setting Ventilator",
      10,
      "cm[H2O]",
    ]);
    // No setting of a ventilated patient is sent as a measured inhaled concentration.
    expect(observations.filter((o) => loincCodes(o).includes("3150-0"))).toEqual([]);
  });

  it("sends orders as ServiceRequests with their band, limits, prescriber and the order they replace", () => {
    const bundle = build();
    const requests = resourcesOf(bundle, "ServiceRequest");
    expect(requests.map((r) => r.id)).toEqual(["order-11", "order-12"]);
    const [older, current] = requests;
    expect(older).toMatchObject({ status: "completed", intent: "order" });
    expect(current).toMatchObject({
      status: "active",
      intent: "order",
      code: {
        coding: [{ system: "http://snomed.info/sct", code: "57485005" }],
        text: "Oxygen therapy: High-flow nasal cannula",
      },
      orderDetail: [{ coding: [{ system: "urn:tidemark:device", code: "hfnc" }] }],
      authoredOn: "2026-12-01T12:00:00.000Z",
      requester: { display: "Orla Fenwick" },
      reasonCode: [{ text: "Community-acquired pneumonia, hypoxaemic on air" }],
      meta: { tag: [{ system: "urn:tidemark:order-status", code: "active" }] },
    });
    const notes = current?.note?.map((n) => n.text).join("\n") ?? "";
    expect(notes).toContain("Target band: SpO2 92–96 %, PaO2 60–90 mmHg.");
    expect(notes).toContain("Limits: FiO2 0.30–0.60, flow 30–60 L/min.");
    expect(notes).toMatch(
      /Verbal order taken by Piet Lindqvist, read back; awaiting the prescriber's co-signature/,
    );
    const fullUrlOf = new Map((bundle.entry ?? []).map((e) => [e.resource?.id, e.fullUrl]));
    expect(current?.replaces).toEqual([{ reference: fullUrlOf.get("order-11") }]);
    expect(older?.occurrencePeriod).toEqual({
      start: "2026-12-01T08:00:00.000Z",
      end: "2026-12-01T12:00:00.000Z",
    });
  });

  it("maps every order state to a FHIR request status", () => {
    expect(serviceRequestStatus("draft")).toBe("draft");
    expect(serviceRequestStatus("awaiting_cosign")).toBe("active");
    expect(serviceRequestStatus("active")).toBe("active");
    expect(serviceRequestStatus("superseded")).toBe("completed");
    expect(serviceRequestStatus("discontinued")).toBe("revoked");
  });

  it("gives the same ids and fullUrls on every export", () => {
    const first = build({ exportedAt: new Date("2026-12-01T15:00:00Z") });
    const again = build({ exportedAt: new Date("2026-12-02T09:30:00Z") });
    expect(again.entry).toEqual(first.entry);
    expect(again.timestamp).not.toBe(first.timestamp);
    const other = buildPatientBundle(record(), {
      installation: "https://elsewhere.example",
      exportedAt: new Date("2026-12-01T15:00:00Z"),
    });
    expect(other.entry?.[0]?.fullUrl).not.toBe(first.entry?.[0]?.fullUrl);
  });

  it("keeps only readings, gases and settings from `since` on, but every order", () => {
    const bundle = build({ since: new Date("2026-12-01T12:30:00Z") });
    expect(exportProblems(bundle)).toEqual([]);
    const ids = resourcesOf(bundle, "Observation").map((o) => o.id);
    expect(ids).toContain("reading-102-spo2");
    expect(ids).toContain("adjustment-301-fio2");
    expect(ids).toContain("blood-gas-202");
    expect(ids).not.toContain("reading-101-spo2");
    expect(ids).not.toContain("blood-gas-201");
    expect(ids).not.toContain("order-12-start-fio2");
    expect(resourcesOf(bundle, "ServiceRequest")).toHaveLength(2);
  });

  it("lists Observations oldest first", () => {
    const times = resourcesOf(build(), "Observation").map((o) =>
      Date.parse(o.effectiveDateTime ?? ""),
    );
    expect(times).toEqual([...times].sort((a, b) => a - b));
  });
});

describe("units of the export", () => {
  it.each(Object.values(UCUM).map((u) => u.code))("%s is valid UCUM", (code) => {
    expect(ucumProblem(code)).toBeNull();
  });

  it("refuses units that are not UCUM as written", () => {
    expect(ucumProblem("mmHg")).not.toBeNull();
    expect(ucumProblem("cmH2O")).not.toBeNull();
  });

  it("sends FiO2 as a percentage without floating-point residue", () => {
    expect(fio2Percent(0.29)).toBe(29);
    expect(fio2Percent(0.21)).toBe(21);
    expect(fio2Percent(1)).toBe(100);
    expect(fio2Percent(0.355)).toBe(35.5);
  });
});
