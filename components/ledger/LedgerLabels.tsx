import { isRole, ROLE_LABELS } from "@/lib/auth/roles";
import type { LedgerAction, LedgerEntityType } from "@/lib/ledger/vocabulary";

// Every action in the vocabulary must have a label (a missing one fails the
// type check); codes written by a newer release still read, as their code.
const ACTION_LABELS: Record<LedgerAction, string> & Record<string, string | undefined> = {
  "user.create": "User created",
  "user.update": "User changed",
  "user.deactivate": "User deactivated",
  "user.reactivate": "User reactivated",
  "order.write": "Order written and signed",
  "order.verbal": "Verbal/telephone order entered",
  "order.supersede": "Order superseded",
  "order.cosign": "Verbal order co-signed",
  "order.cosign_remind": "Co-sign reminder sent",
  "order.cosign_escalate": "Co-sign escalated",
  "order.discontinue": "Order discontinued",
  "order.notice": "Order change noticed to the bed's team",
  "order.read": "Order change read",
  "order_request.send": "New order requested",
  "order_request.notify": "Order request e-mail delivered",
  "order_request.escalate": "Order request escalated",
  "order_request.close": "Order request closed by an order",
  "order_request.reply": "Order request answered",
  "adjustment.record": "Adjustment recorded",
  "reading.chart": "Reading charted",
  "blood_gas.record": "Blood gas recorded",
  "ventilator_check.record": "Ventilator check recorded",
  "step_table.create": "Step table created",
  "step_table.update": "Step table changed",
  "step_table.deactivate": "Step table withdrawn",
  "step_table.reactivate": "Step table restored",
  "alert.open": "Alert opened",
  "alert.upgrade": "Alert now urgent",
  "alert.notify": "Alert e-mail delivered",
  "alert.escalate": "Alert escalated",
  "alert.acknowledge": "Alert acknowledged",
  "alert.resolve": "Alert resolved",
  "user.alert_email_preferences": "Alert e-mail choices changed",
  "user.reauth_refused": "Password re-entry refused",
  "user.sign_out": "Signed out",
  "user.invite": "Invitation sent",
  "user.reset_request": "Password reset link sent",
  "user.password_set": "Password set from an e-mailed link",
  "user.password_change": "Own password changed",
  "user.account_link_refused": "E-mailed link refused",
  "import.blood_gas_csv": "Blood gas file imported",
  "import.hl7": "HL7 results imported",
  "import.monitor_csv": "Monitor file imported",
  "api_token.create": "API token created",
  "api_token.revoke": "API token revoked",
  "patient.admit": "Patient admitted",
  "patient.transfer": "Patient transferred",
  "patient.discharge": "Patient discharged",
  "patient.update": "Patient details changed",
  "unit.create": "Unit created",
  "unit.update": "Unit changed",
  "bed.create": "Bed added",
  "bed.update": "Bed changed",
  "assignment.set": "Shift assignments set",
  "handoff.acknowledge": "Handoff acknowledged",
  "rehearsal.request": "Rehearsal requested",
  "rehearsal.finish": "Rehearsal finished",
};

const ENTITY_LABELS: Record<LedgerEntityType, string> & Record<string, string | undefined> = {
  user: "User",
  unit: "Unit",
  bed: "Bed",
  patient: "Patient",
  admission: "Admission",
  order: "Order",
  adjustment: "Adjustment",
  reading: "Reading",
  blood_gas: "Blood gas",
  ventilator_check: "Ventilator check",
  step_table: "Step table",
  rehearsal: "Rehearsal",
  alert: "Alert",
  import: "Import",
  api_token: "API token",
  shift: "Shift",
  order_request: "Order request",
};

/** The human label of a ledger action code ("order.write" → "Order written and signed"). */
export function actionLabel(code: string): string {
  return ACTION_LABELS[code] ?? code;
}

export function entityLabel(type: string): string {
  return ENTITY_LABELS[type] ?? type;
}

export function roleLabel(role: string): string {
  if (role === "system") return "Tidemark (automatic)";
  if (role === "interface") return "Interface (API token)";
  return isRole(role) ? ROLE_LABELS[role] : role;
}
