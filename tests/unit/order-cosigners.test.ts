import { describe, expect, it } from "vitest";
import { cosignersText, mayCosign, type Cosigners } from "@/lib/orders/cosigners";
import {
  composeOrderSupersededEmail,
  orderSupersededMessageId,
} from "@/lib/orders/supersede-email";

const prescriber = { id: 7, name: "Dr Ines Varga" };

describe("who may co-sign a verbal order", () => {
  const cosigners: Cosigners = {
    prescriber,
    designated: [
      { id: 2, name: "Dr Tobias Renwick" },
      { id: 9, name: "Dr Amara Obi-Lund" },
    ],
  };

  it("is the named prescriber or a designated co-signer, and no other physician", () => {
    expect(mayCosign(7, cosigners)).toBe(true);
    expect(mayCosign(9, cosigners)).toBe(true);
    expect(mayCosign(3, cosigners)).toBe(false);
    expect(mayCosign(3, { prescriber, designated: [] })).toBe(false);
  });

  it("names them in the refusal", () => {
    expect(cosignersText(cosigners)).toBe(
      "Only the prescriber named on the order, Dr Ines Varga, or a co-signer this unit designates (Dr Tobias Renwick or Dr Amara Obi-Lund) may co-sign it.",
    );
    expect(cosignersText({ prescriber, designated: [prescriber] })).toBe(
      "Only the prescriber named on the order, Dr Ines Varga, may co-sign it; this unit designates no other co-signer.",
    );
  });
});

describe("the e-mail to the prescriber of a replaced signed order", () => {
  const input = {
    oldOrderId: 41,
    newOrderId: 42,
    entryMode: "telephone" as const,
    enteredBy: "Hana Whitlock",
    newPrescriber: "Dr Ines Varga",
    fromRecipient: false,
    unitCode: "MICU",
    unitName: "Medical ICU",
    bedLabel: "I03",
    timeZone: "UTC",
    at: new Date("2026-12-03T10:15:00Z"),
    baseUrl: "https://tidemark.example/",
  };

  it("says which order replaced it, who entered it and from whom, and links the new order", () => {
    const mail = composeOrderSupersededEmail(input);
    expect(mail.subject).toBe("Your order #41 was replaced by a telephone order — MICU bed I03");
    expect(mail.text).toContain(
      "Hana Whitlock entered telephone order #42 from Dr Ines Varga, read back; it is in effect and awaits co-signature.",
    );
    expect(mail.text).toContain("When: 03 Dec, 10:15 (UTC)");
    expect(mail.text).toContain("Open the new order: https://tidemark.example/orders/42");
    expect(mail.html).toContain('href="https://tidemark.example/orders/42"');
  });

  it("asks the prescriber to check an order entered in their own name", () => {
    const mail = composeOrderSupersededEmail({ ...input, fromRecipient: true });
    expect(mail.text).toContain("telephone order #42 from you, read back");
    expect(mail.text).toContain("If you did not give this order, open it now.");
  });

  it("keeps one Message-ID per replaced order and recipient", () => {
    expect(orderSupersededMessageId(41, 7, "kestrel.example")).toBe(
      "<order-41.superseded.7@kestrel.example>",
    );
  });
});
