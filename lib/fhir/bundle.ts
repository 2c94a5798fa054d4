import type * as fhir4 from "fhir/r4";
import { BundleBuilder } from "./builder";
import {
  adjustmentSettings,
  bloodGasObservations,
  orderStartingSettings,
  readingObservations,
  type SettingsEvent,
  settingsObservations,
} from "./observations";
import { patientResource } from "./patient";
import type { FhirExportOptions, FhirPatientRecord } from "./records";
import { serviceRequest } from "./service-request";

// Pure mapping from Tidemark's rows to FHIR R4 resources: no framework,
// database or I/O imports, so it is tested without either.

// The resource mappings live beside this file (patient.ts, service-request.ts,
// observations.ts); this file assembles them into the bundle and re-exports
// what other modules import from "./bundle".
export type {
  FhirAdjustmentRow,
  FhirBloodGasRow,
  FhirExportOptions,
  FhirPatientRecord,
  FhirPatientRow,
  FhirReadingRow,
} from "./records";
export { fio2Percent } from "./datatypes";
export { serviceRequestStatus } from "./service-request";

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
