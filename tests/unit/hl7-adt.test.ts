import { describe, expect, it } from "vitest";
import { Hl7MessageError } from "@/lib/imports/hl7";
import { messageTypeOf, parseAdt } from "@/lib/imports/hl7-adt";

// Invented messages in the HL7 v2.5 ADT layout (MSH, EVN, PID, PV1).
const msg = (type: string, pid: string, pv1: string) =>
  [
    `MSH|^~\\&|REGSYS|KESTREL|TIDEMARK|KESTREL|202612030700||${type}|CTRL-1|P|2.5`,
    "EVN|A01|202612030655",
    pid,
    pv1,
  ].join("\r");
const PID = "PID|1||KH555001^^^KESTREL^MR~99^^^NATION^NI||Ostrander^Mila^J||19790223|F";

describe("HL7 v2 ADT reader", () => {
  it("reads an A01: the MR identifier of PID-3, name, birth date, sex, and PV1-3 unit and bed", () => {
    const m = parseAdt(msg("ADT^A01^ADT_A01", PID, "PV1|1|I|MICU^^I04"));
    expect(m).toEqual({
      trigger: "A01",
      controlId: "CTRL-1",
      eventTime: "202612030655",
      patient: {
        mrn: "KH555001",
        familyName: "Ostrander",
        givenName: "Mila",
        birthDate: "1979-02-23",
        sex: "female",
      },
      location: { unitCode: "MICU", bedLabel: "I04" },
      disposition: null,
    });
    expect(messageTypeOf(msg("ADT^A01", PID, "PV1|1|I|MICU^^I04"))).toEqual({
      type: "ADT",
      trigger: "A01",
    });
  });

  it("maps PV1-36 of an A03 to home, another hospital or death, and refuses an unmapped code", () => {
    const pv1 = (code: string) => `PV1|1|I|MICU^^I04${"|".repeat(33)}${code}`;
    expect(parseAdt(msg("ADT^A03", PID, pv1("01"))).disposition).toBe("home");
    expect(parseAdt(msg("ADT^A03", PID, pv1("02"))).disposition).toBe("other_hospital");
    expect(parseAdt(msg("ADT^A03", PID, pv1("20"))).disposition).toBe("death");
    expect(() => parseAdt(msg("ADT^A03", PID, pv1("07")))).toThrow(/PV1-36 .*'07'/);
  });

  it("names the field of what makes a message unusable", () => {
    const bad = (text: string, field: RegExp) => {
      expect(() => parseAdt(text)).toThrow(Hl7MessageError);
      expect(() => parseAdt(text)).toThrow(field);
    };
    bad(msg("ADT^A01", PID.replace("19790223", "19790230"), "PV1|1|I|MICU^^I04"), /PID-7/);
    bad(msg("ADT^A01", PID.replace("|F", "|U"), "PV1|1|I|MICU^^I04"), /PID-8/);
    bad(msg("ADT^A01", PID, "PV1|1|I|MICU"), /PV1-3/);
    bad(msg("ADT^A05", PID, "PV1|1|I|MICU^^I04"), /MSH-9 is 'ADT\^A05'/);
    bad(msg("ADT^A01", PID.replace("KH555001", "K!"), "PV1|1|I|MICU^^I04"), /PID-3/);
  });

  it("reads an A08 without a PV1", () => {
    const text = msg("ADT^A08", PID, "").replace(/\r$/, "");
    expect(parseAdt(text)).toMatchObject({ trigger: "A08", location: null });
  });
});
