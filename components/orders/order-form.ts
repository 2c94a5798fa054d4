import { DEVICE_DEFAULTS, DEVICE_PROFILES, stepTableFitsDevice, type Device } from "@/lib/devices";
import { TARGET_BAND_PRESETS } from "@/lib/orders/wording";
import type { OrderView } from "@/lib/orders/queries";
import { toNumber } from "@/lib/number-input";
import {
  defaultModeFor,
  isVentilatorDevice,
  VENT_DEFAULTS,
  type VentMode,
} from "@/lib/ventilation/settings";
import {
  betweenWords,
  fromMmHg,
  RANGES,
  restatePressureRange,
  toMmHg,
  type PressureUnit,
} from "@/lib/oxygen";

// ---------------------------------------------------------------------------
// Form values, defaults and the mapping onto the shared order schema
// ---------------------------------------------------------------------------

/** What the composer holds: text as typed (kept on refusal), choices as chosen. */
export type ComposerValues = {
  device: Device | "";
  bandChoice: string;
  spo2Lower: string;
  spo2Upper: string;
  pao2Lower: string;
  pao2Upper: string;
  fio2Min: string;
  fio2Max: string;
  initialFio2: string;
  peepMin: string;
  peepMax: string;
  initialPeep: string;
  flowMin: string;
  flowMax: string;
  initialFlow: string;
  /** Ventilator orders only (invasive ventilation, NIV). */
  ventMode: VentMode | "";
  vtTarget: string;
  vtMin: string;
  vtMax: string;
  rateMin: string;
  rateMax: string;
  plateauLimit: string;
  drivingLimit: string;
  stepTableId: string;
  reassessChoice: string;
  reassessCustom: string;
  rationale: string;
  password: string;
  entryMode: "verbal" | "telephone";
  prescriberId: string;
  readBackConfirmed: boolean;
};
export type FormField = keyof ComposerValues;
type NumericField =
  | "pao2Lower"
  | "pao2Upper"
  | "peepMin"
  | "peepMax"
  | "initialPeep"
  | "flowMin"
  | "flowMax"
  | "initialFlow"
  | VentNumericField;
type VentNumericField =
  "vtTarget" | "vtMin" | "vtMax" | "rateMin" | "rateMax" | "plateauLimit" | "drivingLimit";

/** The ventilator fields with their labels, in the schema's words. */
export const VENT_FIELD_LABELS: Record<VentNumericField, string> = {
  vtTarget: "Tidal volume target",
  vtMin: "Tidal volume minimum",
  vtMax: "Tidal volume maximum",
  rateMin: "Rate minimum",
  rateMax: "Rate maximum",
  plateauLimit: "Plateau pressure limit",
  drivingLimit: "Driving pressure limit",
};
const VENT_NUMERIC = Object.keys(VENT_FIELD_LABELS) as VentNumericField[];

export const BAND_CHOICES = TARGET_BAND_PRESETS.map((p) => ({
  value: `${p.lower}-${p.upper}`,
  lower: p.lower,
  upper: p.upper,
  label: p.label,
}));
export const CUSTOM = "custom";
export const REASSESS_PRESETS = [
  { minutes: 30, label: "30 min" },
  { minutes: 60, label: "1 h" },
  { minutes: 120, label: "2 h" },
  { minutes: 240, label: "4 h" },
] as const;

export const fio2Text = (v: number) => v.toFixed(2);
const plainText = (v: number | null | undefined) =>
  v === null || v === undefined ? "" : String(v);

/** The limit fields a device choice fills in, blank where the device has no such setting. */
export function limitValuesFor(
  device: Device,
): Pick<
  ComposerValues,
  | "fio2Min"
  | "fio2Max"
  | "initialFio2"
  | "peepMin"
  | "peepMax"
  | "initialPeep"
  | "flowMin"
  | "flowMax"
  | "initialFlow"
  | "ventMode"
  | VentNumericField
> {
  const d = DEVICE_DEFAULTS[device];
  const vent = isVentilatorDevice(device);
  const v = (n: number) => (vent ? String(n) : "");
  return {
    ventMode: defaultModeFor(device) ?? "",
    vtTarget: v(VENT_DEFAULTS.vtTarget),
    vtMin: v(VENT_DEFAULTS.vtMin),
    vtMax: v(VENT_DEFAULTS.vtMax),
    rateMin: v(VENT_DEFAULTS.rateMin),
    rateMax: v(VENT_DEFAULTS.rateMax),
    plateauLimit: v(VENT_DEFAULTS.plateauLimit),
    drivingLimit: v(VENT_DEFAULTS.drivingLimit),
    fio2Min: fio2Text(d.fio2[0]),
    fio2Max: fio2Text(d.fio2[1]),
    initialFio2: fio2Text(d.fio2[2]),
    peepMin: plainText(d.peep?.[0]),
    peepMax: plainText(d.peep?.[1]),
    initialPeep: plainText(d.peep?.[2]),
    flowMin: plainText(d.flow?.[0]),
    flowMax: plainText(d.flow?.[1]),
    initialFlow: plainText(d.flow?.[2]),
  };
}

/** A new order starts from the one in effect (the usual change is a small one), or blank. */
export function initialValues(
  current: OrderView | null,
  pressureUnit: PressureUnit,
): ComposerValues {
  const pao2 = (v: number | undefined) =>
    v === undefined ? "" : pressureUnit === "mmHg" ? String(v) : fromMmHg(v, "kPa").toFixed(1);
  const base: ComposerValues = {
    device: "",
    bandChoice: BAND_CHOICES[0]!.value,
    spo2Lower: "",
    spo2Upper: "",
    pao2Lower: "",
    pao2Upper: "",
    fio2Min: "",
    fio2Max: "",
    initialFio2: "",
    peepMin: "",
    peepMax: "",
    initialPeep: "",
    flowMin: "",
    flowMax: "",
    initialFlow: "",
    ventMode: "",
    vtTarget: "",
    vtMin: "",
    vtMax: "",
    rateMin: "",
    rateMax: "",
    plateauLimit: "",
    drivingLimit: "",
    stepTableId: "",
    reassessChoice: "60",
    reassessCustom: "",
    rationale: "",
    password: "",
    entryMode: "verbal",
    prescriberId: "",
    readBackConfirmed: false,
  };
  if (!current) return base;
  const preset = BAND_CHOICES.find(
    (b) => b.lower === current.spo2Band.lower && b.upper === current.spo2Band.upper,
  );
  const reassessPreset = REASSESS_PRESETS.some((p) => p.minutes === current.reassessMinutes);
  return {
    ...base,
    device: current.device,
    bandChoice: preset ? preset.value : CUSTOM,
    spo2Lower: String(current.spo2Band.lower),
    spo2Upper: String(current.spo2Band.upper),
    pao2Lower: pao2(current.pao2Band?.lower),
    pao2Upper: pao2(current.pao2Band?.upper),
    fio2Min: fio2Text(current.limits.fio2Min),
    fio2Max: fio2Text(current.limits.fio2Max),
    initialFio2: fio2Text(current.initial.fio2),
    peepMin: plainText(current.limits.peepMin),
    peepMax: plainText(current.limits.peepMax),
    initialPeep: plainText(current.initial.peep),
    flowMin: plainText(current.limits.flowMin),
    flowMax: plainText(current.limits.flowMax),
    initialFlow: plainText(current.initial.flow),
    ...(current.ventilator
      ? {
          ventMode: current.ventilator.mode,
          vtTarget: String(current.ventilator.vtTargetMlKg),
          vtMin: String(current.ventilator.vtMinMlKg),
          vtMax: String(current.ventilator.vtMaxMlKg),
          rateMin: String(current.ventilator.rateMin),
          rateMax: String(current.ventilator.rateMax),
          plateauLimit: String(current.ventilator.plateauLimit),
          drivingLimit: String(current.ventilator.drivingLimit),
        }
      : {}),
    stepTableId: current.stepTableId === null ? "" : String(current.stepTableId),
    reassessChoice: reassessPreset ? String(current.reassessMinutes) : CUSTOM,
    reassessCustom: reassessPreset ? "" : String(current.reassessMinutes),
  };
}

export type BuildContext = {
  signer: "physician" | "other";
  pressureUnit: PressureUnit;
  patientId: number;
  supersedesOrderId: number | null;
  idempotencyKey: string;
};

/**
 * Turns what was typed into the shared schema's input. Errors the schema
 * cannot see (a non-number in an optional field, a kPa value out of range)
 * come back beside their fields; half a PaO2 band is the schema's to refuse.
 */
export function buildOrderInput(
  values: ComposerValues,
  ctx: BuildContext,
): { input: Record<string, unknown>; errors: Partial<Record<FormField, string>> } {
  const errors: Partial<Record<FormField, string>> = {};
  const profile = values.device === "" ? null : DEVICE_PROFILES[values.device];
  const optional = (field: NumericField, label: string): number | undefined => {
    const n = toNumber(values[field]);
    if (n !== undefined && !Number.isFinite(n)) {
      errors[field] = `${label} must be a number.`;
      return undefined;
    }
    return n;
  };
  const band = BAND_CHOICES.find((b) => b.value === values.bandChoice);
  const pao2 = (field: "pao2Lower" | "pao2Upper", label: string): number | undefined => {
    const n = optional(field, label);
    if (n === undefined) return undefined;
    if (ctx.pressureUnit === "mmHg") return n;
    try {
      // One decimal, as stored (DECIMAL(5,1) mmHg).
      return Math.round(toMmHg(n, "kPa") * 10) / 10;
    } catch {
      errors[field] = pao2RangeMessage(label, "kPa");
      return undefined;
    }
  };
  const pao2Lower = pao2("pao2Lower", "PaO2 lower bound");
  const pao2Upper = pao2("pao2Upper", "PaO2 upper bound");
  const peep = profile?.uses.peep ?? false;
  const flow = profile?.uses.flow ?? false;
  const vent = values.device !== "" && isVentilatorDevice(values.device);
  const ventilator: Record<string, unknown> = vent
    ? {
        ventMode: values.ventMode === "" ? undefined : values.ventMode,
        ...Object.fromEntries(VENT_NUMERIC.map((f) => [f, optional(f, VENT_FIELD_LABELS[f])])),
      }
    : {};
  const input: Record<string, unknown> = {
    patientId: ctx.patientId,
    device: values.device === "" ? undefined : values.device,
    spo2Lower: band ? band.lower : toNumber(values.spo2Lower),
    spo2Upper: band ? band.upper : toNumber(values.spo2Upper),
    pao2Lower,
    pao2Upper,
    fio2Min: toNumber(values.fio2Min),
    fio2Max: toNumber(values.fio2Max),
    initialFio2: toNumber(values.initialFio2),
    peepMin: peep ? optional("peepMin", "PEEP minimum") : undefined,
    peepMax: peep ? optional("peepMax", "PEEP maximum") : undefined,
    initialPeep: peep ? optional("initialPeep", "Starting PEEP") : undefined,
    flowMin: flow ? optional("flowMin", "Flow minimum") : undefined,
    flowMax: flow ? optional("flowMax", "Flow maximum") : undefined,
    initialFlow: flow ? optional("initialFlow", "Starting flow") : undefined,
    stepTableId: values.stepTableId === "" ? undefined : Number(values.stepTableId),
    ...ventilator,
    reassessMinutes:
      values.reassessChoice === CUSTOM
        ? toNumber(values.reassessCustom)
        : Number(values.reassessChoice),
    rationale: values.rationale,
    supersedesOrderId: ctx.supersedesOrderId,
    idempotencyKey: ctx.idempotencyKey,
    ...(ctx.signer === "physician"
      ? { entryMode: "written", password: values.password }
      : {
          entryMode: values.entryMode,
          prescriberId: values.prescriberId === "" ? undefined : Number(values.prescriberId),
          readBackConfirmed: values.readBackConfirmed,
        }),
  };
  return { input, errors };
}

function pao2RangeMessage(label: string, unit: PressureUnit): string {
  const range = RANGES.pao2Target;
  if (unit === "mmHg") return `${label} must be ${betweenWords(range)}.`;
  // To the one decimal the field takes, rounded inward so every value it allows is accepted.
  const kpa = restatePressureRange(range, "kPa", 1);
  return `${label} must be between ${kpa.min.toFixed(1)} and ${kpa.max.toFixed(1)} kPa (${range.min}–${range.max} mmHg).`;
}

const DIRECT_FIELDS = new Set<string>([
  "device",
  "fio2Min",
  "fio2Max",
  "initialFio2",
  "peepMin",
  "peepMax",
  "initialPeep",
  "flowMin",
  "flowMax",
  "initialFlow",
  "ventMode",
  ...VENT_NUMERIC,
  "stepTableId",
  "rationale",
  "password",
  "entryMode",
  "prescriberId",
  "readBackConfirmed",
  "pao2Lower",
  "pao2Upper",
]);

/** Where an error on a schema path (client or server) is shown in the composer. */
export function formFieldOf(path: string, values: ComposerValues): FormField | null {
  if (path === "spo2Lower" || path === "spo2Upper")
    return values.bandChoice === CUSTOM ? path : "bandChoice";
  if (path === "reassessMinutes")
    return values.reassessChoice === CUSTOM ? "reassessCustom" : "reassessChoice";
  return DIRECT_FIELDS.has(path) ? (path as FormField) : null;
}

/** Messages in mmHg are restated in kPa for a kPa user, who typed kPa. */
export function restate(path: string, message: string, unit: PressureUnit): string {
  if (
    unit === "kPa" &&
    (path === "pao2Lower" || path === "pao2Upper") &&
    message.includes(betweenWords(RANGES.pao2Target))
  ) {
    return pao2RangeMessage(path === "pao2Lower" ? "PaO2 lower bound" : "PaO2 upper bound", "kPa");
  }
  return message;
}

export type StepTableChoice = {
  id: number;
  name: string;
  kind: "fio2_peep" | "flow_fio2";
  unitOwn: boolean;
};
export type PhysicianChoice = { id: number; name: string; onDuty: boolean };

export function stepTableFits(kind: StepTableChoice["kind"], device: Device | ""): boolean {
  return device !== "" && stepTableFitsDevice(kind, device);
}

export const percentOf = (text: string): string => {
  const n = toNumber(text);
  return n !== undefined && Number.isFinite(n) && n > 0 && n <= 1
    ? `${Math.round(n * 100)}\u00a0%`
    : "—";
};

/** What an order request proposes, as the composer starts from it (lib/order-requests). */
export type RequestPrefill = {
  id: number;
  requestedBy: string;
  need: string;
  reason: string;
  device: Device | null;
  fio2Max: number | null;
  peepMax: number | null;
  flowMax: number | null;
};

/**
 * The composer's values after an order request: its device (with that
 * device's starting limits if it differs), its proposed maxima, and a
 * rationale that quotes it. The physician still reviews every field.
 */
export function prefillFromRequest(values: ComposerValues, r: RequestPrefill): ComposerValues {
  const device = r.device ?? (values.device === "" ? null : values.device);
  const next: ComposerValues = {
    ...values,
    ...(device && device !== values.device ? { device, ...limitValuesFor(device) } : {}),
  };
  if (r.fio2Max !== null) next.fio2Max = fio2Text(r.fio2Max);
  if (r.peepMax !== null) next.peepMax = plainText(r.peepMax);
  if (r.flowMax !== null) next.flowMax = plainText(r.flowMax);
  next.rationale = `Order request #${r.id} from ${r.requestedBy}: ${r.need}. ${r.reason}`.slice(
    0,
    2000,
  );
  return next;
}
