import type * as fhir4 from "fhir/r4";
import { DEVICE_PROFILES, estimateFio2, type Device } from "../orders/devices";
import type { OrderStatus, OrderView } from "../orders/queries";
import type { ReadingView } from "../readings/service";
import {
  BLOOD_GAS_LOINC,
  CATEGORY,
  type BloodGasMember,
  type Code,
  FHIR_SYSTEMS,
  LOINC,
  SNOMED_OXYGEN_THERAPY,
  UCUM,
  type UcumUnit,
} from "./codes";
import { resourceFullUrl } from "./ids";

// Pure mapping from Tidemark's rows to FHIR R4 resources: no framework,
// database or I/O imports, so it is tested without either.

/** The patient as the export names them. */
export type FhirPatientRow = {
  id: number;
  mrn: string;
  familyName: string;
  givenName: string;
  /** YYYY-MM-DD */
  birthDate: string;
  sex: "female" | "male";
};

export type FhirReadingRow = ReadingView & { recordedBy: string | null };

export type FhirBloodGasRow = {
  id: number;
  sampledAt: string;
  sampleType: "arterial" | "venous";
  ph: number | null;
  po2MmHg: number;
  pco2MmHg: number;
  hco3MmolL: number | null;
  baseExcessMmolL: number | null;
  so2Pct: number | null;
  hbGDl: number | null;
  device: Device;
  fio2: number;
  fio2Estimated: boolean;
  peepCmH2O: number | null;
  recordedBy: string;
};

export type FhirAdjustmentRow = {
  id: number;
  orderId: number;
  appliedAt: string;
  device: Device;
  fio2: number;
  peepCmH2O: number | null;
  flowLMin: number | null;
  reasonLabel: string;
  rationale: string;
  recordedBy: string;
};

/** Everything one export holds, oldest first within each kind. */
export type FhirPatientRecord = {
  patient: FhirPatientRow;
  orders: OrderView[];
  readings: FhirReadingRow[];
  bloodGases: FhirBloodGasRow[];
  adjustments: FhirAdjustmentRow[];
};

export type FhirExportOptions = {
  /** The installation's own address (NEXTAUTH_URL): part of every fullUrl's name. */
  installation: string;
  exportedAt: Date;
  /** Settings, readings and gases from this time on; orders are always all included. */
  since?: Date;
};

/**
 * The order's state in FHIR's request status. An order awaiting co-sign is in
 * effect at the bedside (the team titrates within it), so it is "active", not
 * "on-hold"; the exact Tidemark state travels in meta.tag. A superseded order
 * ran until its successor replaced it ("completed"; the successor names it in
 * `replaces`); a discontinued one was stopped by a decision ("revoked").
 */
export function serviceRequestStatus(status: OrderStatus): fhir4.ServiceRequest["status"] {
  switch (status) {
    case "draft":
      return "draft";
    case "awaiting_cosign":
    case "active":
      return "active";
    case "superseded":
      return "completed";
    case "discontinued":
      return "revoked";
    default: {
      const unreachable: never = status;
      throw new Error(`Unknown order status ${String(unreachable)}`);
    }
  }
}

const STATUS_WORDS: Record<OrderStatus, string> = {
  draft: "Draft",
  awaiting_cosign: "Awaiting co-sign",
  active: "Active",
  superseded: "Superseded",
  discontinued: "Discontinued",
};

/**
 * FiO2 is stored as a fraction; the export sends it in %, as the HL7 SANER IG's
 * 19994-3 example Observations do ("value: 100 %"); 3150-0 in %: recollection.
 */
export function fio2Percent(fio2: number): number {
  return Math.round(fio2 * 1000) / 10;
}

const fio2Text = (fio2: number) => fio2.toFixed(2);
const deviceLabel = (device: Device) => DEVICE_PROFILES[device].label;

function quantity(value: number, unit: UcumUnit): fhir4.Quantity {
  return { value, unit: unit.unit, system: FHIR_SYSTEMS.ucum, code: unit.code };
}

function loincConcept(...codes: Code[]): fhir4.CodeableConcept {
  return {
    coding: codes.map((c) => ({ system: FHIR_SYSTEMS.loinc, code: c.code, display: c.display })),
    text: codes[0]?.display ?? "",
  };
}

function category(c: Code): fhir4.CodeableConcept[] {
  return [
    { coding: [{ system: FHIR_SYSTEMS.observationCategory, code: c.code, display: c.display }] },
  ];
}

const person = (name: string | null): fhir4.Reference[] | undefined =>
  name === null ? undefined : [{ display: name }];

/** Builds the bundle's resources and the references between them. */
class BundleBuilder {
  readonly entries: fhir4.BundleEntry[] = [];
  private readonly fullUrls = new Map<string, string>();

  constructor(private readonly installation: string) {}

  fullUrl(resourceType: string, id: string): string {
    const key = `${resourceType}/${id}`;
    let url = this.fullUrls.get(key);
    if (!url) {
      url = resourceFullUrl(this.installation, resourceType, id);
      this.fullUrls.set(key, url);
    }
    return url;
  }

  ref(resourceType: string, id: string): fhir4.Reference {
    return { reference: this.fullUrl(resourceType, id) };
  }

  add(resource: fhir4.FhirResource & { id: string }): void {
    this.entries.push({ fullUrl: this.fullUrl(resource.resourceType, resource.id), resource });
  }
}

function patientResource(p: FhirPatientRow): fhir4.Patient {
  return {
    resourceType: "Patient",
    id: `patient-${p.id}`,
    identifier: [
      {
        use: "usual",
        type: {
          coding: [
            { system: FHIR_SYSTEMS.identifierType, code: "MR", display: "Medical record number" },
          ],
        },
        system: FHIR_SYSTEMS.mrn,
        value: p.mrn,
      },
    ],
    name: [{ use: "official", family: p.familyName, given: [p.givenName] }],
    gender: p.sex,
    birthDate: p.birthDate,
  };
}

type ObservationBase = Pick<fhir4.Observation, "subject" | "effectiveDateTime" | "performer">;

function observation(
  id: string,
  base: ObservationBase,
  fields: Omit<
    fhir4.Observation,
    "resourceType" | "id" | "status" | "identifier" | keyof ObservationBase
  >,
): fhir4.Observation & { id: string } {
  return {
    resourceType: "Observation",
    id,
    identifier: [{ system: FHIR_SYSTEMS.observation, value: id }],
    status: "final",
    ...fields,
    ...base,
  };
}

function readingObservations(
  subject: fhir4.Reference,
  r: FhirReadingRow,
): (fhir4.Observation & { id: string })[] {
  const base: ObservationBase = {
    subject,
    effectiveDateTime: r.takenAt,
    ...(r.recordedBy !== null ? { performer: person(r.recordedBy)! } : {}),
  };
  const notes = [`Oxygen delivery device: ${deviceLabel(r.device)}.`];
  if (r.fio2Estimated) notes.push(`FiO2 ${fio2Text(r.fio2)} is estimated from the flow.`);
  if (r.source === "monitor") notes.push("Imported from a monitor.");
  const components: fhir4.ObservationComponent[] = [
    {
      code: loincConcept(LOINC.inhaledOxygenConcentration),
      valueQuantity: quantity(fio2Percent(r.fio2), UCUM.percent),
    },
  ];
  if (r.flow !== null) {
    components.push({
      code: loincConcept(LOINC.inhaledOxygenFlowRate),
      valueQuantity: quantity(r.flow, UCUM.litresPerMinute),
    });
  }
  const out = [
    observation(`reading-${r.id}-spo2`, base, {
      category: category(CATEGORY.vitalSigns),
      code: loincConcept(LOINC.spo2, LOINC.oxygenSaturationArterial),
      valueQuantity: quantity(r.spo2, UCUM.percent),
      component: components,
      note: notes.map((text) => ({ text })),
    }),
  ];
  if (r.respiratoryRate !== null) {
    out.push(
      observation(`reading-${r.id}-rr`, base, {
        category: category(CATEGORY.vitalSigns),
        code: loincConcept(LOINC.respiratoryRate),
        valueQuantity: quantity(r.respiratoryRate, UCUM.perMinute),
      }),
    );
  }
  if (r.pulseRate !== null) {
    out.push(
      observation(`reading-${r.id}-pulse`, base, {
        category: category(CATEGORY.vitalSigns),
        code: loincConcept(LOINC.pulseRate),
        valueQuantity: quantity(r.pulseRate, UCUM.perMinute),
      }),
    );
  }
  return out;
}

/**
 * A blood gas as a panel Observation whose members (pH, PCO2, PO2, SO2, HCO3,
 * base excess, Hb) are Observations of their own; FiO2 and PEEP at sampling are
 * components of the panel, since they describe the sample, not the blood. The
 * FiO2 component is 3150-0 on every device: it records the FiO2 the sample was
 * taken on, beside the blood; the setting itself is the settings Observation.
 */
function bloodGasObservations(
  b: BundleBuilder,
  subject: fhir4.Reference,
  g: FhirBloodGasRow,
): (fhir4.Observation & { id: string })[] {
  const codes = BLOOD_GAS_LOINC[g.sampleType];
  const base: ObservationBase = {
    subject,
    effectiveDateTime: g.sampledAt,
    performer: person(g.recordedBy)!,
  };
  const memberValues: [BloodGasMember | "hb", number | null, UcumUnit][] = [
    ["ph", g.ph, UCUM.pH],
    ["pco2", g.pco2MmHg, UCUM.mmHg],
    ["po2", g.po2MmHg, UCUM.mmHg],
    ["so2", g.so2Pct, UCUM.percent],
    ["hco3", g.hco3MmolL, UCUM.mmolPerLitre],
    ["baseExcess", g.baseExcessMmolL, UCUM.mmolPerLitre],
    ["hb", g.hbGDl, UCUM.gramsPerDecilitre],
  ];
  const members = memberValues.flatMap(([key, value, unit]) =>
    value === null
      ? []
      : [
          observation(`blood-gas-${g.id}-${key.toLowerCase()}`, base, {
            category: category(CATEGORY.laboratory),
            code: loincConcept(key === "hb" ? LOINC.hemoglobin : codes[key]),
            valueQuantity: quantity(value, unit),
          }),
        ],
  );
  const components: fhir4.ObservationComponent[] = [
    {
      code: loincConcept(LOINC.inhaledOxygenConcentration),
      valueQuantity: quantity(fio2Percent(g.fio2), UCUM.percent),
    },
  ];
  if (g.peepCmH2O !== null) {
    components.push({
      code: loincConcept(LOINC.peepSetting),
      valueQuantity: quantity(g.peepCmH2O, UCUM.cmH2O),
    });
  }
  const notes = [`Oxygen delivery device at sampling: ${deviceLabel(g.device)}.`];
  if (g.fio2Estimated) notes.push(`FiO2 ${fio2Text(g.fio2)} is estimated from the flow.`);
  const panel = observation(`blood-gas-${g.id}`, base, {
    category: category(CATEGORY.laboratory),
    code: loincConcept(codes.panel),
    hasMember: members.map((m) => b.ref("Observation", m.id)),
    component: components,
    note: notes.map((text) => ({ text })),
  });
  return [panel, ...members];
}

type SettingsEvent = {
  idPrefix: string;
  at: string;
  device: Device;
  fio2: number;
  fio2Estimated: boolean;
  peepCmH2O: number | null;
  flowLMin: number | null;
  orderId: number;
  performer: string | null;
  note: string;
};

/**
 * The code of an applied FiO2 setting. On a ventilator (invasive or NIV/CPAP)
 * the FiO2 is a ventilator setting, LOINC 19994-3. HFNC is sent the same way:
 * its FiO2 is set on the device (DEVICE_PROFILES: uses.fio2 "set"), and the
 * export sends it, like PEEP and flow, as a setting of the order; LOINC's
 * system for 19994-3 is "Ventilator", so this is our reading for a high-flow
 * generator. A low-flow device's FiO2 is an estimate of the inhaled
 * concentration and a Venturi mask is no ventilator: both stay 3150-0.
 */
const VENTILATOR_SETTING_DEVICES: ReadonlySet<Device> = new Set<Device>([
  "invasive",
  "niv",
  "hfnc",
]);

function fio2SettingCode(device: Device): Code {
  return VENTILATOR_SETTING_DEVICES.has(device)
    ? LOINC.ventilatorFio2Setting
    : LOINC.inhaledOxygenConcentration;
}

/** One applied set of bedside settings as one Observation per setting. */
function settingsObservations(
  b: BundleBuilder,
  subject: fhir4.Reference,
  s: SettingsEvent,
): (fhir4.Observation & { id: string })[] {
  const base: ObservationBase = {
    subject,
    effectiveDateTime: s.at,
    ...(s.performer !== null ? { performer: person(s.performer)! } : {}),
  };
  const shared = {
    category: category(CATEGORY.therapy),
    basedOn: [b.ref("ServiceRequest", `order-${s.orderId}`)],
  };
  const notes = [s.note, `Oxygen delivery device: ${deviceLabel(s.device)}.`];
  const fio2Notes = s.fio2Estimated
    ? [...notes, `FiO2 ${fio2Text(s.fio2)} is estimated from the flow.`]
    : notes;
  const out = [
    observation(`${s.idPrefix}-fio2`, base, {
      ...shared,
      code: loincConcept(fio2SettingCode(s.device)),
      valueQuantity: quantity(fio2Percent(s.fio2), UCUM.percent),
      note: fio2Notes.map((text) => ({ text })),
    }),
  ];
  if (s.peepCmH2O !== null) {
    out.push(
      observation(`${s.idPrefix}-peep`, base, {
        ...shared,
        code: loincConcept(LOINC.peepSetting),
        valueQuantity: quantity(s.peepCmH2O, UCUM.cmH2O),
        note: notes.map((text) => ({ text })),
      }),
    );
  }
  if (s.flowLMin !== null) {
    out.push(
      observation(`${s.idPrefix}-flow`, base, {
        ...shared,
        code: loincConcept(LOINC.inhaledOxygenFlowRate),
        valueQuantity: quantity(s.flowLMin, UCUM.litresPerMinute),
        note: notes.map((text) => ({ text })),
      }),
    );
  }
  return out;
}

/**
 * The settings an order put in place when it took effect, as the order
 * service applies them: a low-flow device's FiO2 is the estimate from its flow.
 */
function orderStartingSettings(o: OrderView): SettingsEvent | null {
  if (o.status === "draft") return null;
  const estimated = DEVICE_PROFILES[o.device].uses.fio2 === "estimated";
  return {
    idPrefix: `order-${o.id}-start`,
    at: o.createdAt,
    device: o.device,
    fio2: estimated ? (estimateFio2(o.device, o.initial.flow) ?? o.initial.fio2) : o.initial.fio2,
    fio2Estimated: estimated,
    peepCmH2O: o.initial.peep,
    flowLMin: o.initial.flow,
    orderId: o.id,
    performer: o.enteredBy.name,
    note: `Starting settings of order ${o.id}.`,
  };
}

function adjustmentSettings(a: FhirAdjustmentRow): SettingsEvent {
  return {
    idPrefix: `adjustment-${a.id}`,
    at: a.appliedAt,
    device: a.device,
    fio2: a.fio2,
    fio2Estimated: DEVICE_PROFILES[a.device].uses.fio2 === "estimated",
    peepCmH2O: a.peepCmH2O,
    flowLMin: a.flowLMin,
    orderId: a.orderId,
    performer: a.recordedBy,
    note: `Adjustment: ${a.reasonLabel}. ${a.rationale}`,
  };
}

function limitsText(o: OrderView): string {
  const parts = [`FiO2 ${fio2Text(o.limits.fio2Min)}–${fio2Text(o.limits.fio2Max)}`];
  if (o.limits.peepMin !== null && o.limits.peepMax !== null)
    parts.push(`PEEP ${o.limits.peepMin}–${o.limits.peepMax} cmH2O`);
  if (o.limits.flowMin !== null && o.limits.flowMax !== null)
    parts.push(`flow ${o.limits.flowMin}–${o.limits.flowMax} L/min`);
  return `Limits: ${parts.join(", ")}.`;
}

function startingText(o: OrderView): string {
  const parts = [`FiO2 ${fio2Text(o.initial.fio2)}`];
  if (o.initial.peep !== null) parts.push(`PEEP ${o.initial.peep} cmH2O`);
  if (o.initial.flow !== null) parts.push(`flow ${o.initial.flow} L/min`);
  return `Starting settings: ${parts.join(", ")}.`;
}

function serviceRequest(
  b: BundleBuilder,
  subject: fhir4.Reference,
  o: OrderView,
  exportedOrderIds: ReadonlySet<number>,
): fhir4.ServiceRequest & { id: string } {
  const notes = [
    `Target band: SpO2 ${o.spo2Band.lower}–${o.spo2Band.upper} %${
      o.pao2Band ? `, PaO2 ${o.pao2Band.lower}–${o.pao2Band.upper} mmHg` : ""
    }.`,
    limitsText(o),
    startingText(o),
    `Reassess every ${o.reassessMinutes} min.`,
  ];
  if (o.entryMode !== "written") {
    notes.push(
      `${o.entryMode === "verbal" ? "Verbal" : "Telephone"} order taken by ${o.enteredBy.name}${
        o.readBackConfirmed ? ", read back" : ""
      }; ${o.cosignedBy ? `co-signed by ${o.cosignedBy.name} at ${o.cosignedAt}` : "awaiting the prescriber's co-signature"}.`,
    );
  }
  if (o.discontinuedAt) {
    notes.push(
      `Discontinued at ${o.discontinuedAt}${o.discontinueReason ? `: ${o.discontinueReason}` : ""}.`,
    );
  }
  const end = o.discontinuedAt ?? o.supersededBy?.at ?? null;
  const replaces =
    o.replacedOrderId !== null && exportedOrderIds.has(o.replacedOrderId)
      ? [b.ref("ServiceRequest", `order-${o.replacedOrderId}`)]
      : undefined;
  const label = deviceLabel(o.device);
  return {
    resourceType: "ServiceRequest",
    id: `order-${o.id}`,
    meta: {
      tag: [{ system: FHIR_SYSTEMS.orderStatus, code: o.status, display: STATUS_WORDS[o.status] }],
    },
    identifier: [{ system: FHIR_SYSTEMS.order, value: String(o.id) }],
    ...(replaces ? { replaces } : {}),
    status: serviceRequestStatus(o.status),
    intent: "order",
    code: {
      coding: [
        {
          system: FHIR_SYSTEMS.snomed,
          code: SNOMED_OXYGEN_THERAPY.code,
          display: SNOMED_OXYGEN_THERAPY.display,
        },
      ],
      text: `Oxygen therapy: ${label}`,
    },
    orderDetail: [
      { coding: [{ system: FHIR_SYSTEMS.device, code: o.device, display: label }], text: label },
    ],
    subject,
    occurrencePeriod: { start: o.createdAt, ...(end ? { end } : {}) },
    authoredOn: o.signedAt ?? o.createdAt,
    requester: { display: o.prescriber.name },
    reasonCode: [{ text: o.rationale }],
    note: notes.map((text) => ({ text })),
  };
}

const effective = (r: fhir4.FhirResource): string =>
  r.resourceType === "Observation" ? (r.effectiveDateTime ?? "") : "";

/**
 * A patient's record as a FHIR R4 Bundle of type "collection": a Patient, the
 * orders as ServiceRequests, and the readings, blood gases and bedside settings
 * as Observations with LOINC codes and UCUM units. "collection" rather than
 * "searchset", because this is a package of one patient's records for
 * another system to take in, not the answer to a FHIR search.
 *
 * Resource ids (`reading-12-spo2`, `order-3`) and the `urn:uuid:` fullUrls are
 * derived from the rows, so exporting again gives the same ids and references.
 */
export function buildPatientBundle(
  record: FhirPatientRecord,
  options: FhirExportOptions,
): fhir4.Bundle {
  const b = new BundleBuilder(options.installation);
  const since = options.since?.getTime() ?? Number.NEGATIVE_INFINITY;
  const inRange = (iso: string) => Date.parse(iso) >= since;

  const patient = patientResource(record.patient);
  b.add(patient as fhir4.Patient & { id: string });
  const subject: fhir4.Reference = {
    ...b.ref("Patient", patient.id!),
    display: `${record.patient.givenName} ${record.patient.familyName}`,
  };

  const orders = [...record.orders].sort(
    (x, y) => Date.parse(x.createdAt) - Date.parse(y.createdAt) || x.id - y.id,
  );
  const orderIds = new Set(orders.map((o) => o.id));
  for (const o of orders) b.add(serviceRequest(b, subject, o, orderIds));

  const events: SettingsEvent[] = [
    ...orders.flatMap((o) => orderStartingSettings(o) ?? []),
    ...record.adjustments.filter((a) => orderIds.has(a.orderId)).map(adjustmentSettings),
  ];
  const observations = [
    ...record.readings
      .filter((r) => inRange(r.takenAt))
      .flatMap((r) => readingObservations(subject, r)),
    ...record.bloodGases
      .filter((g) => inRange(g.sampledAt))
      .flatMap((g) => bloodGasObservations(b, subject, g)),
    ...events.filter((e) => inRange(e.at)).flatMap((e) => settingsObservations(b, subject, e)),
  ];
  // Oldest first; ties by id, so the order is the same on every export.
  observations.sort(
    (x, y) =>
      Date.parse(effective(x)) - Date.parse(effective(y)) ||
      (x.id < y.id ? -1 : x.id > y.id ? 1 : 0),
  );
  for (const obs of observations) b.add(obs);

  return {
    resourceType: "Bundle",
    meta: { lastUpdated: options.exportedAt.toISOString() },
    type: "collection",
    timestamp: options.exportedAt.toISOString(),
    entry: b.entries,
  };
}
