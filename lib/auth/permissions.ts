import { ForbiddenError } from "../errors";
import type { Actor } from "./actor";
import type { Role } from "./roles";

/**
 * The one permission table: every action of the product and the roles that may
 * take it (DEVELOPERS.md "Roles"). Route handlers, server actions, services and
 * pages ask this table — `requirePermission` / `pagePermission` at the door,
 * `assertCan` in the service, `can` for which buttons to show — instead of
 * writing role lists of their own. Unit access (another unit's records answer
 * 404) is checked where the record is loaded; predicates that depend on the
 * record (a nurse and the device) are the functions below the table.
 */
const CLINICAL = ["physician", "therapist", "nurse"] as const satisfies readonly Role[];
const EVERYONE = [
  "physician",
  "therapist",
  "nurse",
  "reviewer",
  "admin",
] as const satisfies readonly Role[];

export const PERMISSIONS = {
  /** Physicians write and sign; nurses and therapists enter verbal or telephone orders with read-back. */
  "order.write": CLINICAL,
  /** Write and sign an order directly (the others enter verbal or telephone orders). */
  "order.sign": ["physician"],
  /** Only the named prescriber or a designated co-signer (lib/orders/cosigners). */
  "order.cosign": ["physician"],
  "order.discontinue": ["physician"],
  /** Ask the responsible physician for a new order (lib/order-requests). */
  "order_request.send": ["therapist", "nurse"],
  /** Answer an order request without an order, with a reason. */
  "order_request.answer": ["physician"],
  /** Record that one has read a change of a bed's order. */
  "order.acknowledge_change": CLINICAL,
  /** Nurses on low-flow devices only: see {@link mayAdjustDevice}. */
  "adjustment.record": CLINICAL,
  "reading.chart": CLINICAL,
  "blood_gas.record": CLINICAL,
  /** A ventilator check (measured volumes and pressures): therapists and physicians. */
  "ventilator_check.record": ["physician", "therapist"],
  "alert.act": CLINICAL,
  "import.upload": ["therapist", "admin"],
  /** Admit, transfer and discharge patients of one's units. */
  "admission.manage": ["physician", "nurse", "admin"],
  /** Create and edit units; add, rename and retire beds. */
  "unit.manage": ["admin"],
  /**
   * Set a shift's bed assignments and charge nurse: admins, and nurses who
   * hold the unit's charge duty (see lib/assignments/may-assign.ts).
   */
  "assignment.manage": ["nurse", "admin"],
  /** The incoming nurse acknowledges the handoff of a bed. */
  "handoff.acknowledge": ["nurse"],
  "user.manage": ["admin"],
  "api_token.manage": ["admin"],
  "step_table.manage": ["admin"],
  /** Run a protocol rehearsal for one's unit (everyone on the unit reads the results). */
  "rehearsal.run": ["physician", "admin"],
  /** The records of one's own units: Board, Chart, ledger, alerts, FHIR export. */
  "record.read": EVERYONE,
  /** Ledger rows and breaks outside any one unit (administration, every unit). */
  "ledger.oversee": ["reviewer", "admin"],
  /** One's own settings: e-mail choices, the unit the Board shows. */
  "account.self": EVERYONE,
  /** Change one's own password: the one action open while an administrator-set password awaits its change. */
  "account.password": EVERYONE,
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof PERMISSIONS;

export function rolesFor(permission: Permission): readonly Role[] {
  return PERMISSIONS[permission];
}

export function can(actor: Pick<Actor, "role">, permission: Permission): boolean {
  return (PERMISSIONS[permission] as readonly Role[]).includes(actor.role);
}

export function assertCan(actor: Pick<Actor, "role">, permission: Permission): void {
  if (!can(actor, permission)) throw new ForbiddenError();
}

/** Nurses record changes on low-flow devices only; therapists and physicians on any. */
export function mayAdjustDevice(actor: Pick<Actor, "role">, device: { lowFlow: boolean }): boolean {
  return can(actor, "adjustment.record") && (actor.role !== "nurse" || device.lowFlow);
}
