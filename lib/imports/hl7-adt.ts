import type { Disposition } from "../admissions/schema";
import { component, field, Hl7MessageError, type Hl7Segment, requireFields, splitHl7 } from "./hl7";

// HL7 v2 ADT (admit, discharge, transfer) as an interface engine sends it:
// A01 admit, A02 transfer, A03 discharge, A08 update patient information. The
// reader is strict like the results reader: anything that makes the message
// unusable is refused whole, naming the segment and field (HL7 v2.5 ch. 3).

export const ADT_TRIGGERS = ["A01", "A02", "A03", "A08"] as const;
export type AdtTrigger = (typeof ADT_TRIGGERS)[number];

export type AdtMessage = {
  trigger: AdtTrigger;
  controlId: string;
  /** EVN-2 (recorded date/time), else MSH-7: when the event happened, as sent. */
  eventTime: string;
  patient: {
    mrn: string;
    familyName: string;
    givenName: string;
    /** YYYY-MM-DD from PID-7. */
    birthDate: string;
    sex: "female" | "male";
  };
  /** PV1-3: point of care (the unit's code) and bed (its label). */
  location: { unitCode: string; bedLabel: string } | null;
  /** PV1-36 discharge disposition, mapped from HL7 table 0112. */
  disposition: Disposition | null;
};

/** MSH-9 of any message, to route it before reading it as a kind. */
export function messageTypeOf(text: string): { type: string; trigger: string } {
  const { encoding, segments } = splitHl7(text);
  const msh = segments[0]!;
  return {
    type: component(field(msh, 9), encoding, 1),
    trigger: component(field(msh, 9), encoding, 2),
  };
}

/**
 * PV1-36 discharge disposition. HL7 leaves table 0112 to the site; registration
 * systems commonly fill it with the UB-04 patient discharge status codes, of
 * which these map to Tidemark's three (codes recalled from memory; a site
 * with its own table changes this map): 01 home or self care, 06 home with a
 * home health service; 02 a short-term general hospital, 05 another type of
 * institution, 43 a federal hospital; 20 expired, 41 expired in a medical facility.
 */
const DISPOSITION_CODES: Record<string, Disposition> = {
  "01": "home",
  "06": "home",
  "02": "other_hospital",
  "05": "other_hospital",
  "43": "other_hospital",
  "20": "death",
  "41": "death",
};

function one(segments: Hl7Segment[], name: string, needed: boolean): Hl7Segment | undefined {
  const found = segments.filter((s) => s.name === name);
  if (found.length > 1)
    throw new Hl7MessageError(`The message has more than one ${name}; send one event per message.`);
  if (needed && found.length === 0)
    throw new Hl7MessageError(`The message has no ${name} segment.`);
  return found[0];
}

/** Reads an ADT^A01/A02/A03/A08 message; throws Hl7MessageError naming the segment and field. */
export function parseAdt(text: string): AdtMessage {
  const { encoding: enc, segments } = splitHl7(text);
  const msh = segments[0]!;
  requireFields(msh, 12, "an MSH needs MSH-9 message type, MSH-10 control id and MSH-12 version");
  const type = component(field(msh, 9), enc, 1);
  const trigger = component(field(msh, 9), enc, 2);
  if (type !== "ADT" || !(ADT_TRIGGERS as readonly string[]).includes(trigger)) {
    throw new Hl7MessageError(
      `MSH-9 is '${type}^${trigger}'; the ADT events read are A01 admit, A02 transfer, A03 discharge and A08 update.`,
    );
  }
  const controlId = component(field(msh, 10), enc, 1);
  if (!controlId)
    throw new Hl7MessageError(
      "MSH-10 message control id is empty; it is needed to apply a message only once.",
    );
  if (controlId.length > 199)
    throw new Hl7MessageError("MSH-10 message control id is longer than 199 characters.");

  const evn = one(segments, "EVN", false);
  const eventTime =
    (evn ? component(field(evn, 2), enc, 1) : "") || component(field(msh, 7), enc, 1);

  const pid = one(segments, "PID", true)!;
  requireFields(pid, 8, "PID needs PID-3 MRN, PID-5 name, PID-7 birth date and PID-8 sex");
  const ids = field(pid, 3)
    .split(enc.repetition)
    .map((rep) => rep.split(enc.component).map((c) => c.trim()));
  const mrn = ((ids.find((c) => c[4] === "MR") ?? ids[0] ?? [])[0] ?? "").toUpperCase();
  if (!/^[A-Z0-9-]{4,20}$/.test(mrn))
    throw new Hl7MessageError(
      `PID-3 MRN '${mrn}' must be 4 to 20 letters, digits or dashes (segment ${pid.index}).`,
    );
  const familyName = component(field(pid, 5), enc, 1);
  const givenName = component(field(pid, 5), enc, 2);
  if (!familyName || !givenName || familyName.length > 80 || givenName.length > 80)
    throw new Hl7MessageError(
      `PID-5 patient name needs a family and a given name of at most 80 characters (segment ${pid.index}).`,
    );
  const dob = /^(\d{4})(\d{2})(\d{2})/.exec(component(field(pid, 7), enc, 1));
  const birthDate = dob ? `${dob[1]}-${dob[2]}-${dob[3]}` : "";
  const birth = new Date(`${birthDate}T00:00:00Z`);
  if (!dob || Number.isNaN(birth.getTime()) || birth.toISOString().slice(0, 10) !== birthDate)
    throw new Hl7MessageError(
      `PID-7 date of birth must be a date (YYYYMMDD) (segment ${pid.index}).`,
    );
  const sexCode = component(field(pid, 8), enc, 1).toUpperCase();
  if (sexCode !== "F" && sexCode !== "M")
    throw new Hl7MessageError(
      `PID-8 administrative sex '${sexCode}' must be F or M; the predicted body weight needs it (segment ${pid.index}).`,
    );

  const pv1 = one(segments, "PV1", trigger !== "A08");
  let location: AdtMessage["location"] = null;
  let disposition: Disposition | null = null;
  if (pv1) {
    if (trigger === "A01" || trigger === "A02") {
      requireFields(pv1, 3, "PV1-3 assigned patient location names the unit and bed");
      const unitCode = component(field(pv1, 3), enc, 1).toUpperCase();
      const bedLabel = component(field(pv1, 3), enc, 3);
      if (!unitCode || !bedLabel)
        throw new Hl7MessageError(
          `PV1-3 assigned patient location needs the point of care (unit code, component 1) and the bed (component 3) (segment ${pv1.index}).`,
        );
      location = { unitCode, bedLabel };
    }
    if (trigger === "A03") {
      const code = component(field(pv1, 36), enc, 1);
      disposition = DISPOSITION_CODES[code] ?? null;
      if (!disposition)
        throw new Hl7MessageError(
          `PV1-36 discharge disposition '${code}' is not one Tidemark maps (01 home, 02 another hospital, 20 expired) (segment ${pv1.index}).`,
        );
    }
  }
  return {
    trigger: trigger as AdtTrigger,
    controlId,
    eventTime,
    patient: {
      mrn,
      familyName,
      givenName,
      birthDate,
      sex: sexCode === "F" ? "female" : "male",
    },
    location,
    disposition,
  };
}
