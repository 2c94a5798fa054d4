import { defineRead, defineWrite } from "../boundary/operation";
import { acknowledgeAlert, resolveAlert } from "./clinician-steps";
import { z } from "zod";
import { alertSummary, listAlerts, setEmailPreferences } from "./queries";
import {
  acknowledgeSchema,
  alertFilterSchema,
  emailPreferencesSchema,
  resolveSchema,
} from "./schema";

/** A clinician has seen the alert and is acting: escalation stops. */
export const acknowledgeAlertOperation = defineWrite({
  permission: "alert.act",
  schema: acknowledgeSchema,
  run: (knex, actor, input, now) => acknowledgeAlert(knex, actor, input, now),
});

/** A clinician closes the alert with a reason. */
export const resolveAlertOperation = defineWrite({
  permission: "alert.act",
  schema: resolveSchema,
  run: (knex, actor, input, now) => resolveAlert(knex, actor, input, now),
});

/** The signed-in user's own e-mail choices per alert kind. */
export const saveEmailPreferencesOperation = defineWrite({
  permission: "account.self",
  schema: emailPreferencesSchema,
  run: (knex, actor, input, now) => setEmailPreferences(knex, actor, input, now),
});

/**
 * Alerts on the caller's units. Filters: `status` (open — the default —,
 * unacknowledged, resolved, all), `kind`, `unitId`, `patientId`, `alertId`, `limit`.
 */
export const listAlertsOperation = defineRead({
  permission: "record.read",
  schema: alertFilterSchema,
  run: (knex, actor, filter) => listAlerts(knex, actor, filter),
});

/** The header badge: counts of unresolved alerts on the caller's units. */
export const alertSummaryOperation = defineRead({
  permission: "record.read",
  schema: z.object({}),
  run: (knex, actor) => alertSummary(knex, actor),
});
