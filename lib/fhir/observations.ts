import type * as fhir4 from "fhir/r4";
import { DEVICE_PROFILES, estimateFio2, type Device } from "../devices";
import type { OrderView } from "../orders/queries";
import type { BundleBuilder } from "./builder";
import {
  BLOOD_GAS_LOINC,
  CATEGORY,
  type BloodGasMember,
  type Code,
  FHIR_SYSTEMS,
  LOINC,
  UCUM,
  type UcumUnit,
} from "./codes";
import {
  category,
  deviceLabel,
  fio2Percent,
  fio2Text,
  loincConcept,
  person,
  quantity,
} from "./datatypes";
import type { FhirAdjustmentRow, FhirBloodGasRow, FhirReadingRow } from "./records";

// Readings, blood gases and applied bedside settings as FHIR Observations:
// pure mapping, no framework, database or I/O imports.

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

export function readingObservations(
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
export function bloodGasObservations(
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

export type SettingsEvent = {
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
export function settingsObservations(
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
export function orderStartingSettings(o: OrderView): SettingsEvent | null {
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

export function adjustmentSettings(a: FhirAdjustmentRow): SettingsEvent {
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
