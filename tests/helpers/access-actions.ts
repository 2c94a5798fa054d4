import { randomUUID } from "node:crypto";
import {
  OWN,
  apiToken,
  newUser,
  openAlert,
  stepTable,
  stepTableFields,
  verbalOrder,
  writtenOrder,
} from "./access-fixtures";
import type { ActionEntry } from "./access-matrix";
import { ACCOUNT_ACTIONS } from "./access-routes-accounts";
import { ADT_ACTIONS } from "./access-routes-adt";
import { HANDOFF_ACTIONS } from "./access-routes-handoff";
import { LOOP_ACTIONS } from "./access-routes-loops";
import { UNIT_ACTIONS } from "./access-routes-units";
import { ASSIGNMENT_ACTIONS } from "./access-routes-assignments";
import { VENTILATION_ACTIONS } from "./access-routes-ventilation";
import {
  adjustmentAllows,
  adjustmentBody,
  gasBody,
  newUserBody,
  orderBody,
  readingBody,
} from "./access-routes";
import { DEMO_PASSWORD } from "./browser";
import { uniqueEmail } from "./db";

// The server actions by export name, each with the argument a form would send.
// Account, token and step-table administration and one's own e-mail choices
// are not about one unit's records: one cell per role.

const ACTIONS: Omit<ActionEntry, "via">[] = [
  {
    name: "createApiTokenAction",
    permission: "api_token.manage",
    scope: "none",
    ok: 200,
    arg: (w) => ({
      name: `Matrix ${randomUUID().slice(0, 8)}`,
      scope: "read",
      unitIds: [w.unitId[OWN]],
      validDays: 30,
      currentPassword: DEMO_PASSWORD,
    }),
  },
  {
    name: "revokeApiTokenAction",
    permission: "api_token.manage",
    scope: "none",
    ok: 200,
    arg: async (w) => ({
      id: await apiToken(w),
      rationale: "Access matrix",
      currentPassword: DEMO_PASSWORD,
    }),
  },
  {
    name: "createUserAction",
    permission: "user.manage",
    scope: "none",
    ok: 200,
    arg: (w) => newUserBody(uniqueEmail("matrix-action"), w.unitId[OWN]),
  },
  {
    name: "updateUserAction",
    permission: "user.manage",
    scope: "none",
    ok: 200,
    arg: async (w) => {
      const user = await newUser("nurse", "matrix-edit");
      return {
        ...newUserBody(user.email, w.unitId[OWN]),
        id: user.id,
        version: user.version,
        password: "",
        name: "Matrix Renamed",
      };
    },
  },
  {
    name: "setUserActiveAction",
    permission: "user.manage",
    scope: "none",
    ok: 200,
    arg: async () => {
      const user = await newUser("nurse", "matrix-off");
      return {
        id: user.id,
        version: user.version,
        active: false,
        rationale: "Access matrix",
        currentPassword: DEMO_PASSWORD,
      };
    },
  },
  {
    name: "createStepTableAction",
    permission: "step_table.manage",
    scope: "none",
    ok: 200,
    arg: (w) => stepTableFields(w.unitId[OWN]),
  },
  {
    name: "updateStepTableAction",
    permission: "step_table.manage",
    scope: "none",
    ok: 200,
    arg: async (w) => {
      const table = await stepTable(w.unitId[OWN]);
      return { ...stepTableFields(w.unitId[OWN]), id: table.id, version: table.version };
    },
  },
  {
    name: "setStepTableActiveAction",
    permission: "step_table.manage",
    scope: "none",
    ok: 200,
    arg: async (w) => {
      const table = await stepTable(w.unitId[OWN]);
      return { id: table.id, version: table.version, active: false, rationale: "Access matrix" };
    },
  },
  {
    name: "recordAdjustmentAction",
    permission: "adjustment.record",
    allows: adjustmentAllows,
    shareWhenDenied: true,
    scope: "unit",
    ok: 200,
    arg: (w, c) => adjustmentBody(w, c.unit),
  },
  {
    name: "chartReadingAction",
    permission: "reading.chart",
    scope: "unit",
    ok: 200,
    arg: (w, c) => readingBody(w, c.unit),
  },
  {
    name: "recordBloodGasAction",
    permission: "blood_gas.record",
    scope: "unit",
    ok: 200,
    arg: (w, c) => gasBody(w, c.unit),
  },
  // Choosing a unit to show is one's own setting; another unit's is "Unknown unit." (404).
  {
    name: "selectUnitAction",
    permission: "account.self",
    scope: "unit",
    ok: 200,
    arg: (w, c) => w.unitId[c.unit],
  },
  {
    name: "writeOrderAction",
    permission: "order.write",
    scope: "unit",
    serial: true,
    ok: 200,
    arg: (w, c) => orderBody(w, c),
  },
  {
    name: "cosignOrderAction",
    permission: "order.cosign",
    shareWhenDenied: true,
    scope: "unit",
    ok: 200,
    arg: async (w, c) => {
      const { orderId, version } = await verbalOrder(w, c.unit);
      return { orderId, version, password: DEMO_PASSWORD };
    },
  },
  {
    name: "discontinueOrderAction",
    permission: "order.discontinue",
    shareWhenDenied: true,
    scope: "unit",
    ok: 200,
    arg: async (w, c) => {
      const { orderId, version } = await writtenOrder(w, c.unit);
      return { orderId, version, reason: "Access matrix: weaned off", password: DEMO_PASSWORD };
    },
  },
  {
    name: "acknowledgeAlertAction",
    permission: "alert.act",
    shareWhenDenied: true,
    scope: "unit",
    ok: 200,
    arg: async (w, c) => ({ alertId: await openAlert(w, c.unit), note: "Access matrix" }),
  },
  {
    name: "resolveAlertAction",
    permission: "alert.act",
    shareWhenDenied: true,
    scope: "unit",
    ok: 200,
    arg: async (w, c) => ({
      alertId: await openAlert(w, c.unit),
      reason: "Access matrix: probe repositioned",
    }),
  },
  {
    name: "saveEmailPreferencesAction",
    permission: "account.self",
    scope: "none",
    ok: 200,
    arg: () => ({
      below_band: true,
      above_band: true,
      limits_exhausted: true,
      reassessment_overdue: true,
      signal_loss: true,
      pao2_above_band: true,
      order_change: true,
      lung_protection: true,
    }),
  },
  ...ASSIGNMENT_ACTIONS,
];

export const ACTION_ENTRIES: ActionEntry[] = [
  ...ACTIONS,
  ...ADT_ACTIONS,
  ...UNIT_ACTIONS,
  ...HANDOFF_ACTIONS,
  ...ACCOUNT_ACTIONS,
  ...LOOP_ACTIONS,
  ...VENTILATION_ACTIONS,
].map((e) => ({
  ...e,
  via: "action",
}));
