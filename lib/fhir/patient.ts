import type * as fhir4 from "fhir/r4";
import { FHIR_SYSTEMS } from "./codes";
import type { FhirPatientRow } from "./records";

export function patientResource(p: FhirPatientRow): fhir4.Patient {
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
