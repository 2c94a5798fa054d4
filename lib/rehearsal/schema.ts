import { z } from "zod";
import { optionalNumber, rangedNumber } from "../number-input";
import { betweenWords, RANGES, type InputRange } from "../oxygen";

// One schema for the rehearsal form and POST /api/v1/rehearsals.

/** The bounds of the figures a rehearsal takes, beyond the range table's settings. */
export const REHEARSAL_RANGES = {
  patients: { min: 1, max: 200, unit: "patients" },
  hours: { min: 1, max: 168, unit: "h" },
  sustainSeconds: { min: 10, max: 600, unit: "s" },
  sustainSharePct: { min: 50, max: 100, unit: "%" },
  urgentBelowPct: { min: 70, max: 92, unit: "%" },
  urgentSustainSeconds: { min: 5, max: 120, unit: "s" },
  escalateAfterMinutes: { min: 1, max: 60, unit: "min" },
  responseMinutes: { min: 0.5, max: 60, unit: "min" },
  checkEveryMinutes: { min: 15, max: 240, unit: "min" },
  seed: { min: 1, max: 2_147_483_647, unit: "" },
} as const satisfies Record<string, InputRange>;

const whole = (label: string, range: InputRange) =>
  rangedNumber(label, range).int(`${label} must be a whole number ${betweenWords(range)}.`);
const spo2Bound = (label: string) => whole(label, RANGES.spo2Target);
const fio2 = (label: string) => rangedNumber(label, RANGES.fio2);
const peep = (label: string) => rangedNumber(label, RANGES.peep);
const R = REHEARSAL_RANGES;

export const rehearsalCreateSchema = z
  .object({
    unitId: z.number({ error: "Choose a unit." }).int().positive("Choose a unit."),
    label: z
      .string({ error: "Name the run." })
      .trim()
      .min(1, "Name the run, e.g. “Lower PEEP table, 92–96 %”.")
      .max(80, "The run's name must be at most 80 characters."),
    /** The ventilated patients' table (FiO2/PEEP): a built-in published table or the unit's own. */
    ventilatedTableId: z
      .number({ error: "Choose the ventilated patients' step table." })
      .int()
      .positive("Choose the ventilated patients' step table."),
    /** The high-flow patients' table (flow/FiO2); empty: the default ladder (FiO2 in 0.05 steps at 40 L/min). */
    hfncTableId: optionalNumber(z.number().int().positive()).transform((v) => v ?? null),
    spo2Lower: spo2Bound("SpO2 lower bound"),
    spo2Upper: spo2Bound("SpO2 upper bound"),
    ventilatedFio2Min: fio2("Ventilated FiO2 minimum"),
    ventilatedFio2Max: fio2("Ventilated FiO2 maximum"),
    peepMin: peep("PEEP minimum"),
    peepMax: peep("PEEP maximum"),
    hfncFio2Min: fio2("High-flow FiO2 minimum"),
    hfncFio2Max: fio2("High-flow FiO2 maximum"),
    sustainSeconds: whole("Sustain window", R.sustainSeconds),
    sustainSharePct: whole("Share out of band", R.sustainSharePct),
    urgentBelowPct: whole("Urgent threshold", R.urgentBelowPct),
    urgentSustainSeconds: whole("Urgent window", R.urgentSustainSeconds),
    escalateAfterMinutes: whole("Escalation after", R.escalateAfterMinutes),
    nurseResponseMinutes: rangedNumber("Nurse response (median)", R.responseMinutes),
    therapistMinutes: rangedNumber("Therapist delay (median)", R.responseMinutes),
    checkEveryMinutes: whole("Routine check interval", R.checkEveryMinutes),
    patients: whole("Cohort size", R.patients),
    hours: whole("Length", R.hours),
    /** Empty: the server draws one (and records it, so the run repeats). */
    seed: optionalNumber(whole("Seed", R.seed)),
  })
  .superRefine((o, ctx) => {
    const issue = (path: string, message: string) =>
      ctx.addIssue({ code: "custom", path: [path], message });
    if (o.spo2Lower >= o.spo2Upper)
      issue("spo2Upper", "SpO2 upper bound must be above the lower bound.");
    if (o.ventilatedFio2Min > o.ventilatedFio2Max)
      issue("ventilatedFio2Max", "Ventilated FiO2 maximum must not be below the minimum.");
    if (o.peepMin > o.peepMax) issue("peepMax", "PEEP maximum must not be below the minimum.");
    if (o.hfncFio2Min > o.hfncFio2Max)
      issue("hfncFio2Max", "High-flow FiO2 maximum must not be below the minimum.");
    if (o.urgentBelowPct >= o.spo2Lower)
      issue("urgentBelowPct", "Urgent threshold must be below the SpO2 lower bound.");
  });

export type RehearsalCreateInput = z.input<typeof rehearsalCreateSchema>;
export type RehearsalCreateData = z.output<typeof rehearsalCreateSchema>;
/** What a stored run was asked for: the form's figures with the seed it ran on. */
export type RehearsalSettings = Omit<RehearsalCreateData, "seed"> & { seed: number };

export const rehearsalListSchema = z.object({
  unitId: z.coerce
    .number({ error: "unitId must be a positive whole number." })
    .int("unitId must be a positive whole number.")
    .positive("unitId must be a positive whole number."),
});

export const rehearsalReadSchema = z.object({ rehearsalId: z.number().int().positive() });
