/** The alert vocabulary (DEVELOPERS.md, "The product's words"), shared by the service, API and screens. */
export const ALERT_KINDS = [
  "below_band",
  "above_band",
  "limits_exhausted",
  "reassessment_overdue",
  "signal_loss",
  "pao2_above_band",
  "lung_protection",
] as const;
export type AlertKind = (typeof ALERT_KINDS)[number];

export const ALERT_KIND_LABELS: Record<AlertKind, string> = {
  below_band: "SpO2 below target",
  above_band: "SpO2 above target on oxygen",
  limits_exhausted: "Order limits reached",
  reassessment_overdue: "Reassessment overdue",
  signal_loss: "Monitor signal lost",
  pao2_above_band: "PaO2 above target on oxygen",
  lung_protection: "Lung protection",
};

/** What a user chooses e-mail for: each alert kind, and notices of order changes on their beds. */
export const EMAIL_PREFERENCE_KINDS = [...ALERT_KINDS, "order_change"] as const;
export type EmailPreferenceKind = (typeof EMAIL_PREFERENCE_KINDS)[number];

export const EMAIL_PREFERENCE_LABELS: Record<EmailPreferenceKind, string> = {
  ...ALERT_KIND_LABELS,
  order_change: "Order changes on my beds",
};

export const ALERT_STATES = [
  "opened",
  "notified",
  "acknowledged",
  "escalated",
  "resolved",
] as const;
export type AlertState = (typeof ALERT_STATES)[number];

export const ALERT_STATE_LABELS: Record<AlertState, string> = {
  opened: "Opened",
  notified: "Notified",
  acknowledged: "Acknowledged",
  escalated: "Escalated",
  resolved: "Resolved",
};

/** Who each escalation level reaches. */
export const ESCALATION_DUTIES = ["nurse", "therapist", "physician"] as const;
export type EscalationDuty = (typeof ESCALATION_DUTIES)[number];

export const ESCALATION_LABELS: Record<number, string> = {
  0: "assigned nurse",
  1: "assigned therapist",
  2: "responsible physician",
};
