/** The ledger's action vocabulary: one constant per kind of write. */
export const LEDGER_ACTIONS = [
  "user.create",
  "user.update",
  "user.deactivate",
  "user.reactivate",
  "order.write",
  "order.verbal",
  "order.supersede",
  "order.cosign",
  "order.discontinue",
  "adjustment.record",
  "reading.chart",
  "blood_gas.record",
  "step_table.create",
  "step_table.update",
  "step_table.deactivate",
  "step_table.reactivate",
] as const;

export type LedgerAction = (typeof LEDGER_ACTIONS)[number];

export const LEDGER_ENTITY_TYPES = [
  "user",
  "unit",
  "bed",
  "patient",
  "admission",
  "order",
  "adjustment",
  "reading",
  "blood_gas",
  "step_table",
] as const;
export type LedgerEntityType = (typeof LEDGER_ENTITY_TYPES)[number];
