import fc from "fast-check";
import type { z } from "zod";
import { ADJUSTMENT_REASONS, adjustmentSchema } from "@/lib/adjustments/schema";
import {
  admitSchema,
  BODY_RANGES,
  dischargeSchema,
  DISPOSITIONS,
  transferSchema,
} from "@/lib/admissions/schema";
import { acknowledgeSchema, resolveSchema } from "@/lib/alerts/schema";
import { ROLES } from "@/lib/auth/roles";
import { BLOOD_GAS_RANGES, bloodGasSchema } from "@/lib/blood-gases/schema";
import { confirmSchema } from "@/lib/imports/upload-rules";
import { DEVICES } from "@/lib/devices";
import { handoffAcknowledgeSchema } from "@/lib/handoff/schema";
import {
  ORDER_REQUEST_SOURCES,
  orderRequestReplySchema,
  orderRequestSchema,
} from "@/lib/order-requests/schema";
import {
  cosignSchema,
  discontinueSchema,
  verbalOrderSchema,
  writtenOrderSchema,
} from "@/lib/orders/schema";
import { RANGES } from "@/lib/oxygen/ranges";
import {
  assessRequestSchema,
  forecastRequestSchema,
  HEMOGLOBIN_UNITS,
  PRESSURE_UNITS,
  RESPIRATORY_SUPPORTS,
} from "@/lib/oxygenation/schema";
import { readingSchema } from "@/lib/readings/schema";
import { heightSchema } from "@/lib/admissions/schema";
import { VENT_MODES } from "@/lib/ventilation/settings";
import { ventilatorCheckSchema } from "@/lib/ventilator-checks/schema";
import { rehearsalCreateSchema } from "@/lib/rehearsal/schema";
import {
  bedCreateSchema,
  bedUpdateSchema,
  UNIT_KINDS,
  unitCreateSchema,
  unitUpdateSchema,
} from "@/lib/units/schema";
import { assignmentWriteSchema } from "@/lib/assignments/schema";
import { userActiveSchema, userCreateSchema, userUpdateSchema } from "@/lib/users/schema";
import { changePasswordSchema, inviteSchema } from "@/lib/accounts/schema";
import type { BodySpec, Field } from "./bodies";

/**
 * Each JSON write's body, field by field, after its zod schema in lib/<noun>/schema.ts.
 * `schemaKeys(schema)` must equal the spec's keys (checked by the fuzz test), so
 * a field added to a schema without a line here fails the run.
 */

/** Ids the valid-looking values point at, gathered from the test database. */
export type Ids = {
  patients: number[];
  orders: number[];
  units: number[];
  physicians: number[];
  orderVersion: number[];
};

const pick = (xs: number[]) => fc.constantFrom(...(xs.length ? xs : [1]));
const num = (min: number, max: number, extra: Partial<Field> = {}): Field =>
  ({
    kind: "number",
    min,
    max,
    required: true,
    valid: fc.double({ min, max, noNaN: true }),
    ...extra,
  }) as Field;
/** `max` only where the schema has one: a larger value must be one the schema refuses. */
const int = (
  min: number,
  max?: number,
  valid?: fc.Arbitrary<unknown>,
): Extract<Field, { kind: "number" }> => ({
  kind: "number",
  min,
  max,
  int: true,
  required: true,
  valid: valid ?? fc.integer({ min, max: max ?? 2 ** 31 - 1 }),
});
const optional = (f: Field): Field => ({ ...f, required: false });
const str = (min: number, max: number, trim = true, valid?: fc.Arbitrary<unknown>): Field => ({
  kind: "string",
  min,
  max,
  trim,
  required: true,
  valid:
    valid ??
    fc
      .string({ minLength: Math.max(min, 1) + 1, maxLength: Math.min(max, 40) })
      .map((s) => `ok ${s}`.slice(0, max)),
});
const oneOf = (values: readonly string[], required = true): Field => ({
  kind: "enum",
  values,
  required,
  valid: fc.constantFrom(...values),
});
const recent = (hours: number): Field => ({
  kind: "coerced",
  required: true,
  valid: fc
    .integer({ min: 1, max: hours * 60 - 1 })
    .map((m) => new Date(Date.now() - m * 60_000).toISOString()),
});
const idempotencyKey: Field = {
  kind: "string",
  valid: fc.stringMatching(/^[A-Za-z0-9-]{8,64}$/),
};
/** Never the right password: should a body ever pass its schema, the signature is still refused. */
const wrongPassword = (min: number) =>
  str(min, 200, false, fc.constantFrom("not-the-password", "x".repeat(min || 1)));

const ranged = (key: keyof typeof BLOOD_GAS_RANGES) => {
  const { min, max } = BLOOD_GAS_RANGES[key];
  return num(min, max);
};
const engine = (key: keyof typeof RANGES) => {
  const { min, max } = RANGES[key];
  return num(min, max);
};

/** A pressure or haemoglobin whose range depends on the unit beside it: broken by type only. */
const inUnit = (key: "pao2" | "paco2" | "hemoglobin" | "barometricPressure"): Field => {
  const { min, max } = RANGES[key];
  return { kind: "number", required: true, valid: fc.double({ min, max, noNaN: true }) };
};

export function bodySpecs(ids: Ids) {
  const patientId = int(1, undefined, pick(ids.patients));
  const devices = oneOf(DEVICES);

  const reading: BodySpec = {
    fields: {
      patientId,
      takenAt: recent(72),
      spo2: num(RANGES.spo2.min, RANGES.spo2.max),
      respiratoryRate: optional(int(2, 80)),
      pulseRate: optional(int(20, 250)),
      device: devices,
      flow: optional(num(0.5, 70)),
      fio2: optional(num(0.21, 1)),
      idempotencyKey,
    },
  };

  const bloodGas: BodySpec = {
    fields: {
      patientId,
      sampledAt: recent(72),
      sampleType: oneOf(["arterial", "venous"]),
      ph: optional(ranged("ph")),
      pao2: ranged("pao2"),
      paco2: ranged("paco2"),
      hco3: optional(ranged("hco3")),
      baseExcess: optional(ranged("baseExcess")),
      sao2: optional(num(0, 100)),
      hemoglobin: optional(ranged("hemoglobin")),
      device: devices,
      flow: optional(ranged("flow")),
      fio2: optional(ranged("fio2")),
      peep: optional(ranged("peep")),
      idempotencyKey,
    },
  };

  const adjustment: BodySpec = {
    fields: {
      patientId,
      settingsVersion: int(1),
      toFio2: num(0.21, 1),
      toPeep: optional(num(0, 30)),
      toFlow: optional(num(0.5, 70)),
      reason: oneOf(ADJUSTMENT_REASONS.map((r) => r.value)),
      rationale: str(3, 1000),
      appliedAt: recent(24),
      useStaleBloodGas: { kind: "boolean", valid: fc.boolean() },
      idempotencyKey,
    },
  };

  const orderFields: Record<string, Field> = {
    patientId,
    device: devices,
    spo2Lower: int(70, 100, fc.integer({ min: 85, max: 94 })),
    spo2Upper: int(70, 100, fc.integer({ min: 95, max: 100 })),
    pao2Lower: optional(num(40, 300)),
    pao2Upper: optional(num(40, 300)),
    fio2Min: num(0.21, 1),
    fio2Max: num(0.21, 1),
    peepMin: optional(num(0, 30)),
    peepMax: optional(num(0, 30)),
    flowMin: optional(num(0.5, 70)),
    flowMax: optional(num(0.5, 70)),
    initialFio2: num(0.21, 1),
    initialPeep: optional(num(0, 30)),
    initialFlow: optional(num(0.5, 70)),
    stepTableId: optional(int(1)),
    ventMode: oneOf(VENT_MODES, false),
    vtTarget: optional(engine("tidalVolumeTarget")),
    vtMin: optional(engine("tidalVolumeTarget")),
    vtMax: optional(engine("tidalVolumeTarget")),
    rateMin: optional(int(RANGES.ventilatorRate.min, RANGES.ventilatorRate.max)),
    rateMax: optional(int(RANGES.ventilatorRate.min, RANGES.ventilatorRate.max)),
    plateauLimit: optional(engine("plateauLimit")),
    drivingLimit: optional(engine("drivingLimit")),
    reassessMinutes: int(15, 1440),
    rationale: str(5, 2000),
    supersedesOrderId: {
      ...int(1, undefined, fc.oneof(fc.constant(null), pick(ids.orders))),
      nullable: true,
    },
    idempotencyKey,
  };
  const writtenOrder: BodySpec = {
    fields: { ...orderFields, entryMode: oneOf(["written"]), password: wrongPassword(1) },
  };
  const verbalOrder: BodySpec = {
    fields: {
      ...orderFields,
      entryMode: oneOf(["verbal", "telephone"]),
      prescriberId: int(1, undefined, pick(ids.physicians)),
      readBackConfirmed: { kind: "boolean", required: true, valid: fc.constant(true) },
    },
  };

  const ventilatorCheck: BodySpec = {
    fields: {
      patientId,
      checkedAt: recent(72),
      setVt: optional(int(RANGES.tidalVolumeMl.min, RANGES.tidalVolumeMl.max)),
      measuredVt: int(RANGES.tidalVolumeMl.min, RANGES.tidalVolumeMl.max),
      setRate: optional(int(RANGES.respiratoryRate.min, RANGES.respiratoryRate.max)),
      measuredRate: int(RANGES.respiratoryRate.min, RANGES.respiratoryRate.max),
      minuteVentilation: optional(engine("minuteVentilation")),
      peak: optional(engine("peakPressure")),
      plateau: optional(engine("plateauPressure")),
      totalPeep: engine("peep"),
      idempotencyKey,
    },
  };
  const height: BodySpec = { fields: { heightCm: engine("heightCm"), idempotencyKey } };

  const version = int(1, undefined, pick(ids.orderVersion));
  const cosign: BodySpec = { fields: { version, password: wrongPassword(1) } };
  const discontinue: BodySpec = {
    fields: { version, reason: str(5, 1000), password: wrongPassword(1) },
  };
  const acknowledge: BodySpec = { fields: { note: { ...str(0, 500), required: "typed" } } };
  const resolve: BodySpec = { fields: { reason: str(3, 500) } };
  const confirm: BodySpec = {
    fields: { expectedAccepted: int(0, undefined, fc.integer({ min: 0, max: 50 })) },
  };

  const pressure = { ...oneOf(PRESSURE_UNITS, false) };
  const hemoglobinUnit = { ...oneOf(HEMOGLOBIN_UNITS, false) };
  const unitId = optional(int(1, undefined, pick(ids.units)));
  const assess: BodySpec = {
    strict: true,
    fields: {
      pressureUnit: pressure,
      hemoglobinUnit,
      pao2: inUnit("pao2"),
      paco2: inUnit("paco2"),
      hemoglobin: optional(inUnit("hemoglobin")),
      spo2: optional(engine("spo2")),
      sao2: optional(num(0, 100)),
      support: oneOf(RESPIRATORY_SUPPORTS, false),
      peep: optional(engine("peep")),
      flow: optional(engine("flow")),
      meanAirwayPressure: optional(engine("meanAirwayPressure")),
      respiratoryRate: optional(engine("respiratoryRate")),
      barometricPressure: optional(inUnit("barometricPressure")),
      fio2: engine("fio2"),
      ageYears: optional(engine("ageYears")),
      cardiacOutput: optional(engine("cardiacOutput")),
      unitId,
    },
  };
  const forecast: BodySpec = {
    strict: true,
    fields: {
      pressureUnit: pressure,
      hemoglobinUnit,
      fio2: engine("fio2"),
      pao2: inUnit("pao2"),
      paco2: inUnit("paco2"),
      hemoglobin: inUnit("hemoglobin"),
      nextFio2: engine("fio2"),
      barometricPressure: optional(inUnit("barometricPressure")),
      unitId,
    },
  };

  const email = str(
    3,
    254,
    true,
    fc.uuid().map((u) => `fuzz-${u.slice(0, 8)}@test.kestrel.example`),
  );
  const userFields: Record<string, Field> = {
    email,
    name: str(2, 120),
    role: oneOf(ROLES),
    unitIds: { kind: "array", required: true, valid: fc.subarray(ids.units, { minLength: 1 }) },
    pressureUnit: oneOf(["mmHg", "kPa"]),
    rationale: optional(str(0, 500)),
    password: str(12, 200, false, fc.constant("a-long-enough-password")),
    currentPassword: wrongPassword(1),
  };
  const userCreate: BodySpec = {
    fields: {
      ...userFields,
      invite: optional({ kind: "boolean", required: false, valid: fc.boolean() }),
    },
  };
  const userUpdate: BodySpec = {
    fields: {
      ...userFields,
      // "" keeps the password on an edit, so this field is never the broken one.
      password: {
        ...userFields.password!,
        required: false,
        valid: fc.constantFrom("", "a-long-enough-password"),
      },
      version: int(1),
    },
  };
  const invite: BodySpec = { fields: { currentPassword: wrongPassword(1) } };
  const passwordChange: BodySpec = {
    fields: {
      currentPassword: wrongPassword(1),
      password: str(12, 200, false, fc.constant("a-long-enough-password")),
      confirmPassword: str(0, 200, false, fc.constant("a-long-enough-password")),
    },
  };
  const userActive: BodySpec = {
    fields: {
      version: int(1),
      active: { kind: "boolean", required: true, valid: fc.boolean() },
      currentPassword: wrongPassword(1),
      rationale: str(3, 500),
    },
  };

  const admit: BodySpec = {
    fields: {
      mrn: str(4, 20, true, fc.stringMatching(/^[A-Z0-9]{4,20}$/)),
      familyName: str(1, 80),
      givenName: str(1, 80),
      birthDate: {
        kind: "string",
        required: true,
        valid: fc.constantFrom("1948-07-30", "1970-02-03", "2001-11-09"),
      },
      sex: oneOf(["female", "male"]),
      heightCm: optional(num(BODY_RANGES.heightCm.min, BODY_RANGES.heightCm.max)),
      weightKg: optional(num(BODY_RANGES.weightKg.min, BODY_RANGES.weightKg.max)),
      bedId: int(1),
      admittedAt: optional(recent(24)),
      rationale: optional(str(0, 500)),
      idempotencyKey,
    },
  };
  const transfer: BodySpec = {
    fields: { bedId: int(1), rationale: str(3, 500), idempotencyKey },
  };
  const discharge: BodySpec = {
    fields: {
      disposition: oneOf(DISPOSITIONS),
      dischargedAt: optional(recent(24)),
      rationale: optional(str(0, 500)),
      idempotencyKey,
    },
  };
  const unitFields: Record<string, Field> = {
    name: str(2, 120),
    kind: oneOf(UNIT_KINDS),
    altitudeM: int(-500, 5500),
    timeZone: str(1, 64, true, fc.constantFrom("UTC", "Europe/Amsterdam", "America/Chicago")),
    shiftStart: str(5, 5, false, fc.constantFrom("07:00", "19:30", "00:00")),
    shiftHours: { ...int(6, 24), valid: fc.constantFrom(6, 8, 12, 24) },
    allowedDevices: {
      kind: "array",
      required: true,
      valid: fc.subarray([...DEVICES], { minLength: 1 }),
    },
    fallbackEmail: optional(str(0, 254, true, fc.constantFrom("", "desk@kestrel.example"))),
    rationale: optional(str(0, 500)),
  };
  const unitCreate: BodySpec = {
    fields: {
      ...unitFields,
      code: str(2, 16, true, fc.stringMatching(/^FZ[A-Z0-9]{6,10}$/)),
      initialBeds: optional(int(0, 60, fc.integer({ min: 0, max: 3 }))),
      idempotencyKey,
    },
  };
  const unitUpdate: BodySpec = { fields: { ...unitFields, version: int(1) } };
  const bedLabel = str(1, 16, true, fc.stringMatching(/^FZ[A-Z0-9]{2,8}$/));
  const bedCreate: BodySpec = { fields: { label: bedLabel, idempotencyKey } };
  // Both optional, but one of the two is needed; a wrong type or length is refused.
  const bedUpdate: BodySpec = {
    fields: {
      label: { ...bedLabel, required: "typed" },
      active: { kind: "boolean", required: "typed", valid: fc.boolean() },
    },
  };

  // Cells and the charge nurse are optional (an empty list and null are valid): never the broken field.
  const assignmentSet: BodySpec = {
    fields: {
      shift: oneOf(["current", "next"]),
      chargeNurseId: {
        ...int(1, undefined, fc.constant(null)),
        nullable: true,
        required: false,
      },
      cells: { kind: "array", required: false, valid: fc.constant([]) },
      copyFrom: { ...oneOf(["previous"]), required: "typed" },
      idempotencyKey,
    },
  };
  // A shift is "next" or an ISO start; anything else, and an empty or oversized list, is refused.
  const handoffAcknowledge: BodySpec = {
    fields: {
      shift: { ...oneOf(["next"]), required: "typed" },
      admissionIds: {
        kind: "array",
        required: true,
        max: 100,
        valid: fc.array(fc.integer({ min: 1, max: 2 ** 31 - 1 }), { minLength: 1, maxLength: 5 }),
      },
      idempotencyKey,
    },
  };

  // A request for a new order: what and why; the device and maxima only proposed.
  const orderRequest: BodySpec = {
    fields: {
      patientId,
      source: oneOf(ORDER_REQUEST_SOURCES),
      alertId: optional(int(1)),
      need: str(5, 500),
      reason: str(5, 1000),
      device: { ...devices, required: "typed" },
      fio2Max: optional(num(0.21, 1)),
      peepMax: optional(num(0, 30)),
      flowMax: optional(num(0.5, 70)),
      idempotencyKey,
    },
  };
  const orderRequestReply: BodySpec = { fields: { reply: str(5, 1000) } };

  // Valid values keep every pair in order (lower < upper, urgent below the band).
  const rehearsal: BodySpec = {
    fields: {
      unitId: int(1, undefined, pick(ids.units)),
      label: str(1, 80),
      ventilatedTableId: int(1),
      hfncTableId: optional(int(1)),
      spo2Lower: int(70, 100, fc.integer({ min: 88, max: 92 })),
      spo2Upper: int(70, 100, fc.integer({ min: 94, max: 100 })),
      ventilatedFio2Min: num(0.21, 1, { valid: fc.constantFrom(0.21, 0.3) }),
      ventilatedFio2Max: num(0.21, 1, { valid: fc.constantFrom(0.8, 1) }),
      peepMin: num(0, 30, { valid: fc.constantFrom(0, 5) }),
      peepMax: num(0, 30, { valid: fc.constantFrom(18, 24) }),
      hfncFio2Min: num(0.21, 1, { valid: fc.constant(0.21) }),
      hfncFio2Max: num(0.21, 1, { valid: fc.constantFrom(0.6, 1) }),
      sustainSeconds: int(10, 600),
      sustainSharePct: int(50, 100),
      urgentBelowPct: int(70, 92, fc.integer({ min: 70, max: 87 })),
      urgentSustainSeconds: int(5, 120),
      escalateAfterMinutes: int(1, 60),
      nurseResponseMinutes: num(0.5, 60),
      therapistMinutes: num(0.5, 60),
      checkEveryMinutes: int(15, 240),
      patients: int(1, 200, fc.integer({ min: 1, max: 3 })),
      hours: int(1, 168, fc.integer({ min: 1, max: 3 })),
      seed: optional(int(1, 2_147_483_647)),
    },
  };

  return {
    orderRequest,
    orderRequestReply,
    rehearsal,
    admit,
    transfer,
    discharge,
    unitCreate,
    unitUpdate,
    bedCreate,
    bedUpdate,
    assignmentSet,
    handoffAcknowledge,
    reading,
    bloodGas,
    ventilatorCheck,
    height,
    adjustment,
    writtenOrder,
    verbalOrder,
    cosign,
    discontinue,
    acknowledge,
    resolve,
    confirm,
    assess,
    forecast,
    userCreate,
    userUpdate,
    userActive,
    invite,
    passwordChange,
  };
}
export type BodySpecs = ReturnType<typeof bodySpecs>;

/**
 * Each spec beside the schema it stands for, and the keys the route fills in
 * from its path (not from the body).
 */
export const SCHEMAS: Record<keyof BodySpecs, { schema: z.ZodType; fromPath?: string[] }> = {
  rehearsal: { schema: rehearsalCreateSchema },
  admit: { schema: admitSchema },
  transfer: { schema: transferSchema, fromPath: ["admissionId"] },
  discharge: { schema: dischargeSchema, fromPath: ["admissionId"] },
  assignmentSet: { schema: assignmentWriteSchema, fromPath: ["unitId"] },
  reading: { schema: readingSchema },
  bloodGas: { schema: bloodGasSchema },
  ventilatorCheck: { schema: ventilatorCheckSchema },
  height: { schema: heightSchema, fromPath: ["patientId"] },
  adjustment: { schema: adjustmentSchema },
  writtenOrder: { schema: writtenOrderSchema },
  verbalOrder: { schema: verbalOrderSchema },
  cosign: { schema: cosignSchema, fromPath: ["orderId"] },
  discontinue: { schema: discontinueSchema, fromPath: ["orderId"] },
  acknowledge: { schema: acknowledgeSchema, fromPath: ["alertId"] },
  resolve: { schema: resolveSchema, fromPath: ["alertId"] },
  confirm: { schema: confirmSchema, fromPath: ["importId"] },
  assess: { schema: assessRequestSchema },
  forecast: { schema: forecastRequestSchema },
  userCreate: { schema: userCreateSchema },
  userUpdate: { schema: userUpdateSchema, fromPath: ["id"] },
  userActive: { schema: userActiveSchema, fromPath: ["id"] },
  invite: { schema: inviteSchema, fromPath: ["id"] },
  passwordChange: { schema: changePasswordSchema },
  unitCreate: { schema: unitCreateSchema },
  unitUpdate: { schema: unitUpdateSchema, fromPath: ["unitId"] },
  bedCreate: { schema: bedCreateSchema, fromPath: ["unitId"] },
  bedUpdate: { schema: bedUpdateSchema, fromPath: ["unitId", "bedId"] },
  handoffAcknowledge: { schema: handoffAcknowledgeSchema, fromPath: ["unitId"] },
  orderRequest: { schema: orderRequestSchema },
  orderRequestReply: { schema: orderRequestReplySchema, fromPath: ["requestId"] },
};
