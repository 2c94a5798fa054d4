import type * as fhir4 from "fhir/r4";
import type { OrderStatus, OrderView } from "../orders/queries";
import type { BundleBuilder } from "./builder";
import { FHIR_SYSTEMS, SNOMED_OXYGEN_THERAPY } from "./codes";
import { deviceLabel, fio2Text } from "./datatypes";

// Oxygen orders as FHIR ServiceRequests: pure mapping, no framework, database
// or I/O imports.

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

export function serviceRequest(
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
