// A small, strict HL7 v2 (ER7, "pipe and hat") reader for ORU^R01 results.
//
// Why not a package: of the HL7 v2 parsers on npm, @medplum/core's Hl7Message
// is well kept but its current releases need Node 22 (Tidemark runs on Node 20)
// and bring a whole FHIR client; simple-hl7 is an MLLP server that pulls in
// moment and a file watcher; hl7-standard and the smaller ones are lenient by
// design and do not tell a truncated message from a short one. Tidemark needs
// the opposite: refuse anything incomplete, with the segment and field named.
// The syntax (HL7 v2.5 chapter 2: segments, fields, components, repetitions,
// escapes) is small enough to read here in full.

/** Refusal of a whole message: nothing in it is imported. */
export class Hl7MessageError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "Hl7MessageError";
  }
}

export type Encoding = {
  field: string;
  component: string;
  repetition: string;
  escape: string;
  subcomponent: string;
};

export type Hl7Segment = { name: string; index: number; fields: string[] };

export type Hl7Observation = {
  /** 1-based position of the OBX segment in the message, and its set id. */
  segmentIndex: number;
  setId: string;
  valueType: string;
  code: string;
  codeSystem: string;
  codeText: string;
  value: string;
  units: string;
  status: string;
  observedAt: string;
};

export type Hl7ResultGroup = {
  /** 1-based number of the OBR in the message ("OBR 2"). */
  obrNumber: number;
  segmentIndex: number;
  observedAt: string;
  observations: Hl7Observation[];
};

export type Hl7Result = {
  controlId: string;
  sendingApplication: string;
  sendingFacility: string;
  version: string;
  mrn: string;
  groups: Hl7ResultGroup[];
};

function unescape(text: string, enc: Encoding): string {
  if (!text.includes(enc.escape)) return text;
  const e = enc.escape.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");
  return text.replace(new RegExp(`${e}([FSTRE])${e}`, "g"), (_, code: string) => {
    switch (code) {
      case "F":
        return enc.field;
      case "S":
        return enc.component;
      case "T":
        return enc.subcomponent;
      case "R":
        return enc.repetition;
      default:
        return enc.escape;
    }
  });
}

/** Splits a message into segments and fields, checking the MSH and each segment name. */
export function splitHl7(text: string): { encoding: Encoding; segments: Hl7Segment[] } {
  // MLLP framing (VT … FS CR) may survive a copy from an interface engine's log.
  const body = text.replace(/^\u000b/, "").replace(/\u001c\r?$/, "");
  const lines = body.split(/\r\n|\r|\n/).filter((l) => l.trim() !== "");
  const first = lines[0];
  if (!first) throw new Hl7MessageError("The message is empty.");
  if (!first.startsWith("MSH") || first.length < 8) {
    throw new Hl7MessageError(
      "The message does not start with an MSH segment; it is not HL7 v2 (ER7).",
    );
  }
  const fieldSep = first[3]!;
  if (/[A-Za-z0-9\s]/.test(fieldSep)) {
    throw new Hl7MessageError(`MSH-1 field separator '${fieldSep}' is not a valid separator.`);
  }
  const encodingChars = first.slice(4).split(fieldSep)[0] ?? "";
  if (encodingChars.length < 4 || new Set(encodingChars).size !== encodingChars.length) {
    throw new Hl7MessageError(
      "MSH-2 must give four distinct encoding characters (component, repetition, escape, subcomponent).",
    );
  }
  const encoding: Encoding = {
    field: fieldSep,
    component: encodingChars[0]!,
    repetition: encodingChars[1]!,
    escape: encodingChars[2]!,
    subcomponent: encodingChars[3]!,
  };
  const segments = lines.map((line, i) => {
    const name = line.slice(0, 3);
    if (!/^[A-Z][A-Z0-9]{2}$/.test(name) || (line.length > 3 && line[3] !== fieldSep)) {
      throw new Hl7MessageError(
        `Segment ${i + 1} ('${line.slice(0, 12)}') is not a valid segment; the message looks truncated or corrupted.`,
      );
    }
    // For MSH, field 1 is the separator itself, so MSH-n is fields[n] as for any segment.
    const parts = line.split(fieldSep);
    const fields = name === "MSH" ? ["MSH", fieldSep, ...parts.slice(1)] : parts;
    return { name, index: i + 1, fields };
  });
  return { encoding, segments };
}

export const field = (s: Hl7Segment, n: number): string => s.fields[n] ?? "";

export function component(value: string, enc: Encoding, n: number): string {
  return unescape(value.split(enc.repetition)[0]!.split(enc.component)[n - 1] ?? "", enc).trim();
}

export function requireFields(s: Hl7Segment, count: number, what: string): void {
  // Fields beyond the last one with content may be left off, but a segment cut
  // before a required field is a truncated message.
  if (s.fields.length - 1 < count) {
    throw new Hl7MessageError(
      `The message is truncated or incomplete: ${s.name} (segment ${s.index}) ends after field ${s.fields.length - 1}; ${what}. Nothing was imported.`,
    );
  }
}

/**
 * Reads an ORU^R01 message: header, patient (PID-3, the MRN) and each OBR with
 * its OBX results. Throws Hl7MessageError naming the segment and field for
 * anything that makes the whole message unusable; per-result problems (units,
 * values, status) are left to the row checks.
 */
export function parseOruR01(text: string): Hl7Result {
  const { encoding: enc, segments } = splitHl7(text);
  const msh = segments[0]!;
  requireFields(msh, 12, "an MSH needs MSH-9 message type, MSH-10 control id and MSH-12 version");
  const type = component(field(msh, 9), enc, 1);
  const trigger = component(field(msh, 9), enc, 2);
  if (type !== "ORU" || trigger !== "R01") {
    throw new Hl7MessageError(
      `MSH-9 is '${type}^${trigger}'; only ORU^R01 result messages are imported.`,
    );
  }
  const controlId = component(field(msh, 10), enc, 1);
  if (!controlId)
    throw new Hl7MessageError(
      "MSH-10 message control id is empty; it is needed to import a message only once.",
    );
  if (controlId.length > 199)
    throw new Hl7MessageError("MSH-10 message control id is longer than 199 characters.");

  const pids = segments.filter((s) => s.name === "PID");
  if (pids.length === 0)
    throw new Hl7MessageError("The message has no PID segment, so no patient to match.");
  if (pids.length > 1)
    throw new Hl7MessageError("The message has more than one PID; send one patient per message.");
  const pid = pids[0]!;
  requireFields(pid, 3, "PID-3 (patient identifier list) holds the MRN");
  // PID-3 may repeat; prefer the identifier typed MR (medical record number).
  const ids = field(pid, 3)
    .split(enc.repetition)
    .map((rep) => rep.split(enc.component).map((c) => unescape(c, enc).trim()));
  const mrn = (ids.find((c) => c[4] === "MR") ?? ids[0] ?? [])[0] ?? "";
  if (!mrn) throw new Hl7MessageError("PID-3 is empty: the message names no MRN.");

  const groups: Hl7ResultGroup[] = [];
  let current: Hl7ResultGroup | undefined;
  for (const s of segments) {
    if (s.name === "OBR") {
      requireFields(s, 4, "an OBR needs OBR-4 universal service identifier");
      current = {
        obrNumber: groups.length + 1,
        segmentIndex: s.index,
        observedAt: component(field(s, 7), enc, 1),
        observations: [],
      };
      groups.push(current);
    } else if (s.name === "OBX") {
      if (!current) {
        throw new Hl7MessageError(
          `OBX (segment ${s.index}) comes before any OBR; results must follow their OBR.`,
        );
      }
      requireFields(
        s,
        11,
        "an OBX needs OBX-2 value type, OBX-3 code, OBX-5 value and OBX-11 result status",
      );
      const identifier = field(s, 3);
      current.observations.push({
        segmentIndex: s.index,
        setId: component(field(s, 1), enc, 1),
        valueType: component(field(s, 2), enc, 1),
        code: component(identifier, enc, 1),
        codeText: component(identifier, enc, 2),
        codeSystem: component(identifier, enc, 3),
        value: unescape(field(s, 5).split(enc.repetition)[0] ?? "", enc).trim(),
        units: component(field(s, 6), enc, 1),
        status: component(field(s, 11), enc, 1),
        observedAt: component(field(s, 14), enc, 1),
      });
    }
  }
  if (groups.length === 0)
    throw new Hl7MessageError("The message has no OBR segment, so no results.");
  const empty = groups.find((g) => g.observations.length === 0);
  if (empty) {
    throw new Hl7MessageError(
      `OBR ${empty.obrNumber} (segment ${empty.segmentIndex}) has no OBX results; the message looks truncated.`,
    );
  }
  return {
    controlId,
    sendingApplication: component(field(msh, 3), enc, 1),
    sendingFacility: component(field(msh, 4), enc, 1),
    version: component(field(msh, 12), enc, 1),
    mrn,
    groups,
  };
}
