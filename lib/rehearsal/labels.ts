import type { CareModel } from "./care";
import type { RehearsalSettings } from "./schema";
import type { RehearsalStatus, RehearsalView } from "./views";

/**
 * The rehearsal's words on screen, in one place: the care models, the
 * statuses and every setting of a run with its unit, grouped as the form
 * shows them. The form's labels, the basis view's settings and the side by
 * side's "what differs" all read this table, so they always agree. Pure.
 */

export const CARE_MODEL_LABELS: Record<CareModel, string> = {
  "fixed-interval": "Fixed-interval routine",
  tidemark: "Tidemark workflow",
  reference: "Instant reference",
};

export const CARE_MODEL_NOTES: Record<CareModel, string> = {
  "fixed-interval": "A routine check at a fixed interval; the therapist moves one step after it.",
  tidemark:
    "The app's alerts reach a nurse (escalated when unanswered); the therapist applies the proposal.",
  reference: "An instant response every 30 s: an upper bound, not a workflow.",
};

/** The care models in the order the page shows them. */
export const CARE_MODEL_ORDER: readonly CareModel[] = ["fixed-interval", "tidemark", "reference"];

export const STATUS_LABELS: Record<RehearsalStatus, string> = {
  queued: "Queued",
  running: "Running",
  done: "Done",
  failed: "Failed",
};

/** True while the worker has not finished with the run: the page keeps asking. */
export const isActive = (status: RehearsalStatus) => status === "queued" || status === "running";

export type SettingGroup = "protocol" | "alerts" | "response" | "cohort";

export const SETTING_GROUPS: { key: SettingGroup; legend: string }[] = [
  { key: "protocol", legend: "Protocol" },
  { key: "alerts", legend: "Alert settings" },
  { key: "response", legend: "Response times" },
  { key: "cohort", legend: "Cohort" },
];

/** A number a run is asked for: its label with the unit, as the form and the basis show it. */
export type NumberSetting = {
  name: Exclude<keyof RehearsalSettings, "unitId" | "label" | "ventilatedTableId" | "hfncTableId">;
  label: string;
  group: SettingGroup;
  inputMode: "decimal" | "numeric";
  hint?: string;
};

export const NUMBER_SETTINGS: readonly NumberSetting[] = [
  { name: "spo2Lower", label: "SpO2 lower bound (%)", group: "protocol", inputMode: "numeric" },
  { name: "spo2Upper", label: "SpO2 upper bound (%)", group: "protocol", inputMode: "numeric" },
  {
    name: "ventilatedFio2Min",
    label: "Ventilated FiO2 minimum (0.21–1)",
    group: "protocol",
    inputMode: "decimal",
  },
  {
    name: "ventilatedFio2Max",
    label: "Ventilated FiO2 maximum (0.21–1)",
    group: "protocol",
    inputMode: "decimal",
  },
  { name: "peepMin", label: "PEEP minimum (cmH2O)", group: "protocol", inputMode: "decimal" },
  { name: "peepMax", label: "PEEP maximum (cmH2O)", group: "protocol", inputMode: "decimal" },
  {
    name: "hfncFio2Min",
    label: "High-flow FiO2 minimum (0.21–1)",
    group: "protocol",
    inputMode: "decimal",
  },
  {
    name: "hfncFio2Max",
    label: "High-flow FiO2 maximum (0.21–1)",
    group: "protocol",
    inputMode: "decimal",
  },
  {
    name: "sustainSeconds",
    label: "Sustain window (s)",
    group: "alerts",
    inputMode: "numeric",
    hint: "How long SpO2 is watched before a monitor excursion opens an alert.",
  },
  {
    name: "sustainSharePct",
    label: "Share out of band (%)",
    group: "alerts",
    inputMode: "numeric",
    hint: "Of the monitored part of the window.",
  },
  {
    name: "urgentBelowPct",
    label: "Urgent threshold (SpO2 %)",
    group: "alerts",
    inputMode: "numeric",
    hint: "Below it the shorter urgent window applies.",
  },
  {
    name: "urgentSustainSeconds",
    label: "Urgent window (s)",
    group: "alerts",
    inputMode: "numeric",
  },
  {
    name: "escalateAfterMinutes",
    label: "Escalation after (min)",
    group: "alerts",
    inputMode: "numeric",
    hint: "An alert nobody acknowledges goes to the next level after this long.",
  },
  {
    name: "nurseResponseMinutes",
    label: "Nurse response, median (min)",
    group: "response",
    inputMode: "decimal",
  },
  {
    name: "therapistMinutes",
    label: "Therapist delay, median (min)",
    group: "response",
    inputMode: "decimal",
  },
  {
    name: "checkEveryMinutes",
    label: "Routine check interval (min)",
    group: "response",
    inputMode: "numeric",
    hint: "The fixed-interval routine's check.",
  },
  { name: "patients", label: "Patients", group: "cohort", inputMode: "numeric" },
  { name: "hours", label: "Length of each stay (h)", group: "cohort", inputMode: "numeric" },
  {
    name: "seed",
    label: "Seed (optional)",
    group: "cohort",
    inputMode: "numeric",
    hint: "Empty: a new seed is drawn and recorded. The same seed meets the same patients.",
  },
];

/** The default high-flow ladder's option (no stored table: the empty choice), as a run names it. */
export const DEFAULT_HFNC_OPTION = "Default high-flow ladder (FiO2 0.21–1, 40 L/min)";

/** A setting's value as the basis view writes it (FiO2 with two places). */
export function settingValue(setting: NumberSetting, value: number): string {
  if (setting.name.toLowerCase().includes("fio2")) return value.toFixed(2);
  return String(value);
}

export type SettingLine = { key: string; label: string; value: string };

/** Every setting of a run, tables first, as label and value (the basis view's list). */
export function settingLines(view: Pick<RehearsalView, "settings" | "tables">): SettingLine[] {
  return [
    { key: "ventilatedTable", label: "Ventilated step table", value: view.tables.ventilated.name },
    { key: "hfncTable", label: "High-flow step table", value: view.tables.hfnc.name },
    ...NUMBER_SETTINGS.map((s) => ({
      key: s.name,
      // A stored run always has its seed.
      label: s.label.replace(" (optional)", ""),
      value: settingValue(s, view.settings[s.name]),
    })),
  ];
}

/** "12 patients × 24 h" */
export function cohortWords(settings: Pick<RehearsalSettings, "patients" | "hours">): string {
  return `${settings.patients} patient${settings.patients === 1 ? "" : "s"} × ${settings.hours} h`;
}
