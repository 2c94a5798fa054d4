import { describe, expect, it } from "vitest";
import { Hl7MessageError, parseOruR01, splitHl7 } from "@/lib/imports/hl7";
import { hl7Candidates } from "@/lib/imports/hl7-results";

const MSG = [
  "MSH|^~\\&|LAB|WARD|TDM|WARD|202611200805||ORU^R01|M1|P|2.5.1",
  "PID|1||OTHER1^^^X^PI~KH000123^^^KESTREL^MR||Doe^Ann",
  "OBR|1||G1|24336-0^Gas^LN|||202611200800",
  "OBX|1|NM|2703-7^pO2^LN||9.5|kPa|||||F",
  "OBX|2|NM|2019-8^pCO2^LN||41|mm[Hg]|||||F",
  "OBX|3|ST|9999-9^Comment^LN||a\\F\\b||||||F",
].join("\r");

describe("parseOruR01", () => {
  it("reads the header, the MR-typed PID-3 identifier and each OBR's results, splitting on CR or LF", () => {
    for (const text of [MSG, MSG.replaceAll("\r", "\n"), MSG.replaceAll("\r", "\r\n")]) {
      const m = parseOruR01(text);
      expect(m).toMatchObject({ controlId: "M1", sendingApplication: "LAB", sendingFacility: "WARD", version: "2.5.1", mrn: "KH000123" });
      expect(m.groups).toHaveLength(1);
      expect(m.groups[0]!.observations.map((o) => [o.code, o.value, o.units, o.status])).toEqual([
        ["2703-7", "9.5", "kPa", "F"],
        ["2019-8", "41", "mm[Hg]", "F"],
        ["9999-9", "a|b", "", "F"],
      ]);
    }
  });

  it.each([
    ["an empty body", "", "The message is empty."],
    ["no MSH", "PID|1||X", "does not start with an MSH segment"],
    ["another message type", MSG.replace("ORU^R01", "ADT^A01"), "only ORU^R01 result messages are imported"],
    ["no control id", MSG.replace("|M1|", "||"), "MSH-10 message control id is empty"],
    ["a cut OBX", MSG.slice(0, MSG.indexOf("|41|")), "OBX (segment 5) ends after field 4"],
    ["a cut segment name", `${MSG}\rOB`, "Segment 7 ('OB') is not a valid segment"],
    ["an OBR without results", `${MSG}\rOBR|2||G2|24336-0^Gas^LN`, "OBR 2 (segment 7) has no OBX results"],
    ["two patients", `${MSG}\rPID|1||KH2^^^K^MR`, "more than one PID"],
  ])("refuses %s with a message naming the problem", (_, text, expected) => {
    expect(() => parseOruR01(text)).toThrow(Hl7MessageError);
    expect(() => parseOruR01(text)).toThrow(expected);
  });

  it("takes the separators from MSH-1 and MSH-2", () => {
    const custom = MSG.replaceAll("|", "#").replaceAll("^", "$").replace("MSH#$~\\&", "MSH#$~\\&");
    expect(splitHl7(custom).encoding).toMatchObject({ field: "#", component: "$" });
    expect(parseOruR01(custom).mrn).toBe("KH000123");
  });
});

describe("hl7Candidates", () => {
  it("makes one blood gas per OBR with gas codes and lists unused codes instead of dropping them", () => {
    const c = hl7Candidates(parseOruR01(MSG));
    expect(c.bloodGases).toHaveLength(1);
    expect(c.bloodGases[0]!.values).toEqual({ pao2: { text: "9.5", unit: "kPa" }, paco2: { text: "41", unit: "mm[Hg]" } });
    expect(c.bloodGases[0]!.sampledAt).toBe("202611200800");
    expect(c.ignored).toEqual([expect.stringContaining("9999-9")]);
  });
});
