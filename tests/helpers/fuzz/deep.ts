import { readFileSync } from "node:fs";
import { join } from "node:path";
import fc from "fast-check";
import type { Knex } from "knex";
import { DEMO_PASSWORD } from "../browser";
import { hfncOrder } from "../orders";
import { type BodySpec, type Field, nearValidObject } from "./bodies";
import { describeCase, type FuzzCase, type Part, type Who } from "./case";
import type { BodySpecs } from "./specs";
import { oddString, Raw, toJson } from "./values";

/**
 * The sampled phase: valid-looking requests with a field or two perturbed,
 * aimed at the fuzz's own patient, import and account, so that many are
 * accepted and the rest are refused deep in the services (a stale version, a
 * conflict, a row the importer rejects). Versions and ids that change as the
 * phase goes are written as placeholders and read from the database just
 * before each request is sent (see `late`).
 */

export type Own = {
  patientId: number;
  mrn: string;
  bed: string;
  unitId: number;
  unitCode: string;
  victimUserId: number;
  victimEmail: string;
  therapistId: number;
  /** A unit of the fuzz's own (its admin a member) and one of its beds: unit writes change only these. */
  fuzzUnitId: number;
  fuzzBedId: number;
};

type Late =
  | "ORDER_ID"
  | "ORDER_VERSION"
  | "ACTIVE_ORDER_ID"
  | "SETTINGS_VERSION"
  | "ALERT_ID"
  | "GAS_IMPORT_ID"
  | "GAS_IMPORT_ACCEPTED"
  | "USER_VERSION"
  | "UNIT_VERSION"
  | "REQUEST_ID";
const late = (name: Late) => new Raw(`__${name}__`);

/** The placeholders' values now: the own patient's latest order and alert, the own import, the victim's version. */
export async function lateValues(knex: Knex, own: Own): Promise<Record<Late, number | null>> {
  const order = (await knex("orders")
    .where({ patient_id: own.patientId })
    .orderBy("id", "desc")
    .first("id", "version")) as { id: number; version: number } | undefined;
  const active = (await knex("orders")
    .where({ patient_id: own.patientId })
    .whereIn("status", ["active", "awaiting_cosign"])
    .first("id")) as { id: number } | undefined;
  const settings = (await knex("bedside_settings")
    .where({ patient_id: own.patientId })
    .first("version")) as { version: number } | undefined;
  const alert = (await knex("alerts")
    .where({ patient_id: own.patientId })
    .orderBy("id", "desc")
    .first("id")) as { id: number } | undefined;
  const imp = (await knex("imports")
    .where({ created_by: own.therapistId, kind: "blood_gas_csv" })
    .orderBy("id", "desc")
    .first("id", "rows_accepted")) as { id: number; rows_accepted: number } | undefined;
  const user = (await knex("users").where({ id: own.victimUserId }).first("version")) as {
    version: number;
  };
  const unit = (await knex("units").where({ id: own.fuzzUnitId }).first("version")) as {
    version: number;
  };
  const request = (await knex("order_requests")
    .where({ patient_id: own.patientId })
    .orderBy("id", "desc")
    .first("id")) as { id: number } | undefined;
  // 999999999 names nothing: the request is then refused as not found.
  return {
    ORDER_ID: order?.id ?? 999_999_999,
    ORDER_VERSION: order?.version ?? 1,
    ACTIVE_ORDER_ID: active?.id ?? null,
    SETTINGS_VERSION: settings?.version ?? 1,
    ALERT_ID: alert?.id ?? 999_999_999,
    GAS_IMPORT_ID: imp?.id ?? 999_999_999,
    GAS_IMPORT_ACCEPTED: imp?.rows_accepted ?? 0,
    USER_VERSION: user.version,
    UNIT_VERSION: unit.version,
    REQUEST_ID: request?.id ?? 999_999_999,
  };
}

export function fillLate(text: string, values: Record<Late, number | null>): string {
  return text.replace(/__([A-Z_]+)__/g, (m, name: string) =>
    name in values ? String(values[name as Late]) : m,
  );
}

const fixed = (valid: unknown): Field => ({
  kind: "coerced",
  valid: fc.constant(valid),
  pin: "fixed",
});
const pinId = (f: Field): Field => ({ ...f, pin: "invalid" });

/** The bulk specs re-aimed: ids at the own rows (perturbed only to refused values), passwords right. */
function deepSpecs(s: BodySpecs, own: Own): Record<string, BodySpec> {
  const patientId = pinId({ ...s.reading.fields.patientId!, valid: fc.constant(own.patientId) });
  const aim = (spec: BodySpec, extra: Record<string, Field>): BodySpec => ({
    ...spec,
    fields: { ...spec.fields, ...(spec.fields.patientId ? { patientId } : {}), ...extra },
  });
  const order = hfncOrder(own.patientId) as unknown as Record<string, unknown>;
  // A plausible gas in mmHg and g/dL (random values in range rarely fit the alveolar gas equation);
  // the optional fields stay out unless perturbed.
  const between = (f: Field, min: number, max: number): Field => ({
    ...f,
    valid: fc.double({ min, max, noNaN: true }),
  });
  const absent = (spec: BodySpec) =>
    Object.fromEntries(
      Object.entries(spec.fields)
        .filter(([, f]) => !f.required)
        .map(([k, f]) => [k, { ...f, valid: fc.constant(undefined) }]),
    );
  const gas = (spec: BodySpec) => ({
    ...absent(spec),
    fio2: between(spec.fields.fio2!, 0.35, 0.5),
    pao2: between(spec.fields.pao2!, 65, 95),
    paco2: between(spec.fields.paco2!, 35, 45),
    ...(spec.fields.nextFio2 ? { nextFio2: between(spec.fields.nextFio2, 0.3, 0.6) } : {}),
    ...(spec.fields.hemoglobin?.required
      ? { hemoglobin: between(spec.fields.hemoglobin, 10, 14) }
      : {}),
  });
  // The high-flow order of the other tests; fields it leaves out stay out unless perturbed.
  const orderFields = Object.fromEntries(
    Object.entries(s.writtenOrder.fields).map(([k, f]) => [
      k,
      { ...f, valid: fc.constant(order[k]) },
    ]),
  );
  return {
    reading: aim(s.reading, {
      device: { ...s.reading.fields.device!, valid: fc.constant("room_air") },
    }),
    bloodGas: aim(s.bloodGas, {
      sampleType: { ...s.bloodGas.fields.sampleType!, valid: fc.constant("arterial") },
      sao2: { ...s.bloodGas.fields.sao2!, valid: fc.double({ min: 40, max: 100, noNaN: true }) },
    }),
    // Pressures in their order (PEEP < plateau ≤ peak); the own patient is on high flow, so
    // a check is refused deep in the service (no ventilator order) unless perturbed earlier.
    ventilatorCheck: aim(s.ventilatorCheck, {
      totalPeep: between(s.ventilatorCheck.fields.totalPeep!, 5, 8),
      plateau: between(s.ventilatorCheck.fields.plateau!, 20, 28),
      peak: between(s.ventilatorCheck.fields.peak!, 28, 35),
      checkedAt: {
        kind: "coerced",
        required: true,
        valid: fc
          .integer({ min: 1, max: 30 })
          .map((m) => new Date(Date.now() - m * 60_000).toISOString()),
      },
    }),
    height: s.height,
    adjustment: aim(s.adjustment, {
      settingsVersion: fixed(late("SETTINGS_VERSION")),
      toFio2: {
        ...s.adjustment.fields.toFio2!,
        valid: fc.double({ min: 0.3, max: 0.6, noNaN: true }),
      },
      toFlow: { ...s.adjustment.fields.toFlow!, valid: fc.integer({ min: 30, max: 60 }) },
      toPeep: { ...s.adjustment.fields.toPeep!, valid: fc.constant(undefined) },
      // After the order and any earlier change: a few seconds ago.
      appliedAt: {
        kind: "coerced",
        required: true,
        valid: fc
          .integer({ min: 1, max: 5 })
          .map((sec) => new Date(Date.now() - sec * 1000).toISOString()),
      },
    }),
    order: aim(
      { fields: orderFields },
      {
        supersedesOrderId: fixed(late("ACTIVE_ORDER_ID")),
        stepTableId: fixed(undefined),
        password: fixed(DEMO_PASSWORD),
      },
    ),
    cosign: aim(s.cosign, {
      version: fixed(late("ORDER_VERSION")),
      password: fixed(DEMO_PASSWORD),
    }),
    discontinue: aim(s.discontinue, {
      version: fixed(late("ORDER_VERSION")),
      password: fixed(DEMO_PASSWORD),
    }),
    acknowledge: s.acknowledge,
    resolve: s.resolve,
    orderRequest: aim(s.orderRequest, {}),
    orderRequestReply: s.orderRequestReply,
    orderRead: { fields: {} },
    confirm: {
      fields: {
        expectedAccepted: {
          ...s.confirm.fields.expectedAccepted!,
          valid: fc.constant(late("GAS_IMPORT_ACCEPTED")),
        },
      },
    },
    assess: aim(s.assess, {
      ...gas(s.assess),
      unitId: pinId({ ...s.assess.fields.unitId!, valid: fc.constant(own.unitId) }),
    }),
    forecast: aim(s.forecast, {
      ...gas(s.forecast),
      unitId: pinId({ ...s.forecast.fields.unitId!, valid: fc.constant(own.unitId) }),
    }),
    // The next shift of the own unit, written with nothing to change.
    assignmentSet: aim(s.assignmentSet, {
      shift: { ...s.assignmentSet.fields.shift!, valid: fc.constant("next") },
      // Perturbed only to refused values, so no seeded charge nurse or cell changes.
      chargeNurseId: fixed(undefined),
      copyFrom: pinId({ ...s.assignmentSet.fields.copyFrom!, valid: fc.constant(undefined) }),
      cells: pinId({ ...s.assignmentSet.fields.cells!, valid: fc.constant([]) }),
    }),
    userCreate: aim(s.userCreate, {
      unitIds: pinId({ ...s.userCreate.fields.unitIds!, valid: fc.constant([own.unitId]) }),
      currentPassword: fixed(DEMO_PASSWORD),
    }),
    userUpdate: aim(s.userUpdate, {
      email: fixed(own.victimEmail),
      unitIds: pinId({ ...s.userUpdate.fields.unitIds!, valid: fc.constant([own.unitId]) }),
      version: fixed(late("USER_VERSION")),
      currentPassword: fixed(DEMO_PASSWORD),
    }),
    userActive: aim(s.userActive, {
      version: fixed(late("USER_VERSION")),
      currentPassword: fixed(DEMO_PASSWORD),
    }),
    // The victim has a password of their own: an invitation is refused (409), writing nothing.
    invite: { fields: { currentPassword: fixed(DEMO_PASSWORD) } },
    // The fuzz physician "changes" to the same password (allowed: not set by an admin), so the
    // account keeps signing in; the repeat is perturbed only to refused values.
    passwordChange: {
      fields: {
        currentPassword: fixed(DEMO_PASSWORD),
        password: fixed(DEMO_PASSWORD),
        confirmPassword: pinId({
          ...s.passwordChange.fields.confirmPassword!,
          valid: fc.constant(DEMO_PASSWORD),
        }),
      },
    },
    unitCreate: s.unitCreate,
    unitUpdate: aim(s.unitUpdate, { version: fixed(late("UNIT_VERSION")) }),
    bedCreate: s.bedCreate,
    bedUpdate: s.bedUpdate,
  };
}

const ORIGIN_HEADERS = (origin: string) => ({ origin, "content-type": "application/json" });

function make(route: string, c: Omit<FuzzCase, "route" | "write">): FuzzCase {
  const full: FuzzCase = { route, write: false, ...c };
  return Object.assign(full, { [fc.toStringMethod]: () => describeCase(full) });
}

const recentStamp = (minutesAgo: number, hl7 = false) => {
  const iso = new Date(Date.now() - minutesAgo * 60_000).toISOString();
  return hl7 ? `${iso.slice(0, 16).replace(/[-T:]/g, "")}+0000` : `${iso.slice(0, 19)}Z`;
};

/** Text with, one time in three, one value swapped for an odd one. */
const sometimes = <T>(a: fc.Arbitrary<T>, weight: number) =>
  fc.oneof({ weight: 10 - weight, arbitrary: fc.constant(null) }, { weight, arbitrary: a });
const perturbLines = (text: string) =>
  fc.tuple(fc.nat(), sometimes(oddString, 3)).map(([i, odd]) => {
    if (odd === null) return text;
    const lines = text.split(/(\r|\n)/);
    const at = (i % Math.max(1, lines.length >> 1)) * 2;
    const cells = lines[at]!.split(/([,|])/);
    cells[(i >> 4) % cells.length] = odd;
    lines[at] = cells.join("");
    return lines.join("");
  });

function fixture(name: string, own: Own): string {
  return readFileSync(join(process.cwd(), "tests/fixtures/imports", name), "utf8")
    .replaceAll("{{MRN}}", own.mrn)
    .replaceAll("{{MRN2}}", `${own.mrn}X`);
}

/** Every write route, valid-looking, aimed at the own rows. */
export function deepRequests(
  s: BodySpecs,
  own: Own,
  origin: string,
): Record<string, fc.Arbitrary<FuzzCase>> {
  const spec = deepSpecs(s, own);
  const json = (route: string, who: Who, path: string, body: BodySpec) =>
    nearValidObject(body).map((b) =>
      make(route, {
        method: route.split(" ")[0]!,
        path,
        who,
        headers: ORIGIN_HEADERS(origin),
        body: toJson(b),
      }),
    );
  const csv = perturbLines(
    fixture("blood-gas-valid.csv", own).replace(/2026-11-20[T ]\d\d:\d\d(:00Z)?/g, () =>
      recentStamp(90),
    ),
  );
  const monitorCsv = fc
    .integer({ min: 5, max: 300 })
    .chain((ago) =>
      perturbLines(
        [
          "time,spo2,pulse_rate",
          ...[0, 1, 2, 3].map(
            (k) => `${new Date(Date.now() - ago * 60_000 + k * 1000).toISOString()},${94 - k},88`,
          ),
        ].join("\n"),
      ),
    );
  const hl7 = fc.tuple(fc.uuid(), fc.integer({ min: 5, max: 300 })).chain(([id, ago]) =>
    perturbLines(
      fixture("hl7-valid.hl7", own)
        .replaceAll("{{MSGID}}", `FZ${id.slice(0, 18)}`)
        .replace(/2026112008\d\d\+0000/g, recentStamp(ago, true)),
    ),
  );
  const upload = fc
    .tuple(
      fc.constantFrom("blood_gas_csv", "monitor_csv"),
      csv,
      monitorCsv,
      sometimes(oddString, 2),
    )
    .map(([kind, gas, mon, oddField]) => {
      const parts: Part[] = [
        { name: "kind", value: kind },
        { name: "unitId", value: String(own.unitId) },
        { name: "mrn", value: kind === "monitor_csv" ? own.mrn : "" },
        { name: "bed", value: kind === "monitor_csv" ? own.bed : "" },
        {
          name: "file",
          fileName: `fuzz-${kind}.csv`,
          content: kind === "blood_gas_csv" ? gas : mon,
        },
      ];
      if (oddField !== null)
        parts[oddField.length % 4] = { name: parts[oddField.length % 4]!.name, value: oddField };
      return make("POST /api/v1/imports", {
        method: "POST",
        path: "/api/v1/imports",
        who: "therapist",
        headers: { origin },
        body: { parts },
      });
    });
  const mapping: BodySpec = {
    fields: {
      delimiter: { kind: "enum", values: [",", ";", "\t"], valid: fc.constant(",") },
      columns: {
        kind: "coerced",
        valid: fc.constant({
          mrn: "MRN",
          sampledAt: "Sampled at",
          sampleType: "Sample type",
          pao2: "PaO2 (mmHg)",
          paco2: "PaCO2 (mmHg)",
        }),
      },
      units: { kind: "coerced", valid: fc.constant({ pao2: "mm[Hg]", paco2: "mm[Hg]" }) },
    },
  };
  const token = (path: string, body: fc.Arbitrary<string>, type: string) =>
    body.map((b) =>
      make(`POST ${path.split("?")[0]}`, {
        method: "POST",
        path,
        who: "token",
        headers: { "content-type": type },
        body: b,
      }),
    );
  return {
    "POST /api/v1/readings": json(
      "POST /api/v1/readings",
      "physician",
      "/api/v1/readings",
      spec.reading!,
    ),
    "POST /api/v1/blood-gases": json(
      "POST /api/v1/blood-gases",
      "physician",
      "/api/v1/blood-gases",
      spec.bloodGas!,
    ),
    "POST /api/v1/ventilator-checks": json(
      "POST /api/v1/ventilator-checks",
      "therapist",
      "/api/v1/ventilator-checks",
      spec.ventilatorCheck!,
    ),
    "POST /api/v1/patients/[patientId]/height": json(
      "POST /api/v1/patients/[patientId]/height",
      "physician",
      `/api/v1/patients/${own.patientId}/height`,
      spec.height!,
    ),
    "POST /api/v1/adjustments": json(
      "POST /api/v1/adjustments",
      "physician",
      "/api/v1/adjustments",
      spec.adjustment!,
    ),
    "POST /api/v1/orders": json("POST /api/v1/orders", "physician", "/api/v1/orders", spec.order!),
    "POST /api/v1/orders/[orderId]/cosign": json(
      "POST /api/v1/orders/[orderId]/cosign",
      "physician",
      "/api/v1/orders/__ORDER_ID__/cosign",
      spec.cosign!,
    ),
    "POST /api/v1/orders/[orderId]/discontinue": json(
      "POST /api/v1/orders/[orderId]/discontinue",
      "physician",
      "/api/v1/orders/__ORDER_ID__/discontinue",
      spec.discontinue!,
    ),
    "POST /api/v1/alerts/[alertId]/acknowledge": json(
      "POST /api/v1/alerts/[alertId]/acknowledge",
      "physician",
      "/api/v1/alerts/__ALERT_ID__/acknowledge",
      spec.acknowledge!,
    ),
    "POST /api/v1/alerts/[alertId]/resolve": json(
      "POST /api/v1/alerts/[alertId]/resolve",
      "physician",
      "/api/v1/alerts/__ALERT_ID__/resolve",
      spec.resolve!,
    ),
    "POST /api/v1/order-requests": json(
      "POST /api/v1/order-requests",
      "therapist",
      "/api/v1/order-requests",
      spec.orderRequest!,
    ),
    "POST /api/v1/order-requests/[requestId]/reply": json(
      "POST /api/v1/order-requests/[requestId]/reply",
      "physician",
      "/api/v1/order-requests/__REQUEST_ID__/reply",
      spec.orderRequestReply!,
    ),
    "POST /api/v1/orders/[orderId]/read": json(
      "POST /api/v1/orders/[orderId]/read",
      "nurse",
      "/api/v1/orders/__ORDER_ID__/read",
      spec.orderRead!,
    ),
    "POST /api/v1/oxygenation/assess": json(
      "POST /api/v1/oxygenation/assess",
      "therapist",
      "/api/v1/oxygenation/assess",
      spec.assess!,
    ),
    "POST /api/v1/oxygenation/forecast": json(
      "POST /api/v1/oxygenation/forecast",
      "therapist",
      "/api/v1/oxygenation/forecast",
      spec.forecast!,
    ),
    "POST /api/v1/imports": upload,
    "PUT /api/v1/imports/[importId]": json(
      "PUT /api/v1/imports/[importId]",
      "therapist",
      "/api/v1/imports/__GAS_IMPORT_ID__",
      mapping,
    ),
    "POST /api/v1/imports/[importId]/confirm": json(
      "POST /api/v1/imports/[importId]/confirm",
      "therapist",
      "/api/v1/imports/__GAS_IMPORT_ID__/confirm",
      spec.confirm!,
    ),
    "POST /api/v1/imports/hl7": token(
      "/api/v1/imports/hl7?partial=accept",
      hl7,
      "x-application/hl7-v2+er7",
    ),
    "POST /api/v1/imports/monitor": token(
      `/api/v1/imports/monitor?mrn=${own.mrn}&bed=${own.bed}&unit=${own.unitCode}&partial=accept`,
      monitorCsv,
      "text/csv",
    ),
    "POST /api/v1/units": json("POST /api/v1/units", "admin", "/api/v1/units", spec.unitCreate!),
    "PATCH /api/v1/units/[unitId]": json(
      "PATCH /api/v1/units/[unitId]",
      "admin",
      `/api/v1/units/${own.fuzzUnitId}`,
      spec.unitUpdate!,
    ),
    "POST /api/v1/units/[unitId]/beds": json(
      "POST /api/v1/units/[unitId]/beds",
      "admin",
      `/api/v1/units/${own.fuzzUnitId}/beds`,
      spec.bedCreate!,
    ),
    "PATCH /api/v1/units/[unitId]/beds/[bedId]": json(
      "PATCH /api/v1/units/[unitId]/beds/[bedId]",
      "admin",
      `/api/v1/units/${own.fuzzUnitId}/beds/${own.fuzzBedId}`,
      spec.bedUpdate!,
    ),
    "PUT /api/v1/units/[unitId]/assignments": json(
      "PUT /api/v1/units/[unitId]/assignments",
      "admin",
      `/api/v1/units/${own.unitId}/assignments`,
      spec.assignmentSet!,
    ),
    "POST /api/v1/users": json("POST /api/v1/users", "admin", "/api/v1/users", spec.userCreate!),
    "PATCH /api/v1/users/[userId]": json(
      "PATCH /api/v1/users/[userId]",
      "admin",
      `/api/v1/users/${own.victimUserId}`,
      spec.userUpdate!,
    ),
    "POST /api/v1/users/[userId]/active": json(
      "POST /api/v1/users/[userId]/active",
      "admin",
      `/api/v1/users/${own.victimUserId}/active`,
      spec.userActive!,
    ),
    "POST /api/v1/users/[userId]/invite": json(
      "POST /api/v1/users/[userId]/invite",
      "admin",
      `/api/v1/users/${own.victimUserId}/invite`,
      spec.invite!,
    ),
    "POST /api/v1/me/password": json(
      "POST /api/v1/me/password",
      "physician",
      "/api/v1/me/password",
      spec.passwordChange!,
    ),
  };
}
