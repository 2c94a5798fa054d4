import { describe, expect, it } from "vitest";
import { Hl7MessageError, parseOruR01, splitHl7 } from "@/lib/imports/hl7";
import { hl7Candidates } from "@/lib/imports/hl7-results";
import { checkBloodGasCandidate, checkReadingCandidate } from "@/lib/imports/rows";

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
      expect(m).toMatchObject({
        controlId: "M1",
        sendingApplication: "LAB",
        sendingFacility: "WARD",
        version: "2.5.1",
        mrn: "KH000123",
      });
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
    [
      "another message type",
      MSG.replace("ORU^R01", "ADT^A01"),
      "only ORU^R01 result messages are imported",
    ],
    ["no control id", MSG.replace("|M1|", "||"), "MSH-10 message control id is empty"],
    ["a cut OBX", MSG.slice(0, MSG.indexOf("|41|")), "OBX (segment 5) ends after field 4"],
    ["a cut segment name", `${MSG}\rOB`, "Segment 7 ('OB') is not a valid segment"],
    [
      "an OBR without results",
      `${MSG}\rOBR|2||G2|24336-0^Gas^LN`,
      "OBR 2 (segment 7) has no OBX results",
    ],
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
    expect(c.bloodGases[0]!.values).toEqual({
      pao2: { text: "9.5", unit: "kPa" },
      paco2: { text: "41", unit: "mm[Hg]" },
    });
    expect(c.bloodGases[0]!.sampledAt).toBe("202611200800");
    expect(c.ignored).toEqual([expect.stringContaining("9999-9")]);
  });
});

// Codes as LOINC names them: 2703-7 "Oxygen [Partial pressure] in Arterial blood",
// 2019-8 "Carbon dioxide [Partial pressure] in Arterial blood", 2708-6 "Oxygen
// saturation in Arterial blood", 59408-5 "Oxygen saturation in Arterial blood by
// Pulse oximetry", 19994-3 "Oxygen/Inspired gas setting [Volume Fraction]
// Ventilator", 19996-8 "Oxygen/Inspired gas Respiratory system --on ventilator",
// 30313-1 "Hemoglobin [Mass/volume] in Arterial blood", 3150-0 "Inhaled oxygen
// concentration". The FHIR R4 Oxygen Saturation profile codes SpO2 as 2708-6 and
// US Core Pulse Oximetry as 59408-5 with 2708-6, so a sender may use either.
const HEADER = [
  "MSH|^~\\&|LAB|WARD|TDM|WARD|202611200805||ORU^R01|M2|P|2.5.1",
  "PID|1||KH000123^^^KESTREL^MR||Doe^Ann",
];
const message = (...groups: string[][]) => parseOruR01([...HEADER, ...groups.flat()].join("\r"));
const obr = (n: number, code: string, at = "202611200800") => `OBR|${n}||X${n}|${code}|||${at}`;
const obx = (n: number, code: string, value: string, unit: string, status = "F") =>
  `OBX|${n}|NM|${code}^^LN||${value}|${unit}|||||${status}`;

describe("hl7Candidates — FiO2, Hb and saturation codes", () => {
  it.each(["19994-3", "19996-8"])(
    "reads FiO2 sent as %s and Hb sent as 30313-1 into the gas",
    (fio2Code) => {
      const c = hl7Candidates(
        message([
          obr(1, "24336-0"),
          obx(1, "2703-7", "9.5", "kPa"),
          obx(2, "2019-8", "41", "mm[Hg]"),
          obx(3, fio2Code, "45", "%"),
          obx(4, "30313-1", "13.2", "g/dL"),
        ]),
      );
      expect(c.ignored).toEqual([]);
      expect(c.readings).toEqual([]);
      expect(c.bloodGases).toHaveLength(1);
      expect(c.bloodGases[0]!.values).toMatchObject({
        fio2: { text: "45", unit: "%" },
        hemoglobin: { text: "13.2", unit: "g/dL" },
      });
      const checked = checkBloodGasCandidate(c.bloodGases[0]!, "UTC");
      // 45 % is FiO2 0.45; 13.2 g/dL is stored as is.
      expect(checked).toMatchObject({ ok: true, row: { fio2: 0.45, hemoglobin: 13.2 } });
    },
  );

  it("makes an OBR with only an SpO2 (59408-5) a reading, not a blood gas", () => {
    const c = hl7Candidates(message([obr(1, "59408-5"), obx(1, "59408-5", "94", "%")]));
    expect(c.bloodGases).toEqual([]);
    expect(c.readings).toHaveLength(1);
    expect(checkReadingCandidate(c.readings[0]!, "UTC")).toMatchObject({
      ok: true,
      row: { spo2: 94, mrn: "KH000123" },
    });
  });

  it("makes a 2708-6 saturation in an OBR without PaO2 a pulse-oximetry reading, not a rejected gas", () => {
    const c = hl7Candidates(
      message([obr(1, "59408-5"), obx(1, "2708-6", "92", "%"), obx(2, "3150-0", "30", "%")]),
    );
    expect(c.bloodGases).toEqual([]);
    expect(c.readings).toHaveLength(1);
    expect(c.readings[0]!.label).toBe("OBR 1 OBX 1");
    expect(checkReadingCandidate(c.readings[0]!, "UTC")).toMatchObject({
      ok: true,
      row: { spo2: 92 },
    });
    // The FiO2 beside it is not imported on its own, and says so.
    expect(c.ignored).toEqual([expect.stringContaining("FiO2 without a blood gas")]);
  });

  it("imports an SpO2 sent both as 59408-5 and 2708-6 (same value and time) once", () => {
    const c = hl7Candidates(
      message([obr(1, "59408-5"), obx(1, "59408-5", "95", "%"), obx(2, "2708-6", "95", "%")]),
    );
    expect(c.bloodGases).toEqual([]);
    expect(c.readings.map((r) => r.spo2)).toEqual([{ text: "95", unit: "%" }]);
    expect(c.ignored).toEqual([
      expect.stringMatching(/2708-6 repeats the SpO2 of OBX 1 \(59408-5\)/),
    ]);
  });

  it("keeps 2708-6 as the gas's SaO2 when the OBR has a PaO2", () => {
    const c = hl7Candidates(
      message([
        obr(1, "24336-0"),
        obx(1, "2703-7", "70", "mm[Hg]"),
        obx(2, "2019-8", "40", "mm[Hg]"),
        obx(3, "2708-6", "93", "%"),
      ]),
    );
    expect(c.readings).toEqual([]);
    expect(c.bloodGases).toHaveLength(1);
    expect(checkBloodGasCandidate(c.bloodGases[0]!, "UTC")).toMatchObject({
      ok: true,
      row: { pao2: 70, sao2: 93 },
    });
  });

  it("keeps 2708-6 with a gas that lacks only its PaO2: a blood sample's SaO2 is not made an SpO2", () => {
    const c = hl7Candidates(
      message([obr(1, "24336-0"), obx(1, "2019-8", "40", "mm[Hg]"), obx(2, "2708-6", "93", "%")]),
    );
    expect(c.readings).toEqual([]);
    const checked = checkBloodGasCandidate(c.bloodGases[0]!, "UTC");
    expect(checked.ok).toBe(false);
    if (!checked.ok)
      expect(checked.rejected.reasons).toEqual([
        expect.objectContaining({ code: "missing", field: "pao2" }),
      ]);
  });

  it("gives a pulse-oximetry 2708-6 with a preliminary status a status reason on its reading", () => {
    const c = hl7Candidates(message([obr(1, "59408-5"), obx(1, "2708-6", "92", "%", "P")]));
    const checked = checkReadingCandidate(c.readings[0]!, "UTC");
    expect(checked.ok).toBe(false);
    if (!checked.ok) expect(checked.rejected.reasons.map((r) => r.code)).toEqual(["status"]);
  });
});
