"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useEffect } from "react";
import { useForm } from "react-hook-form";
import { z } from "zod";
import { Button } from "@/components/ui/Button";
import { Field, inputClasses } from "@/components/ui/Field";
import { LEDGER_ACTIONS } from "@/lib/ledger/vocabulary";
import { actionLabel, roleLabel } from "./LedgerLabels";
import { LOCAL_DATE_TIME, utcToZonedLocal, zonedLocalToUtc } from "./LedgerTime";

/** The filters as typed: strings, empty meaning "any". */
export type LedgerFilterValues = {
  /** From a link (the Chart's "Ledger"); not typed: people look patients up by MRN. */
  patientId: string;
  mrn: string;
  actorId: string;
  action: string;
  from: string;
  to: string;
};

export const EMPTY_FILTERS: LedgerFilterValues = {
  patientId: "",
  mrn: "",
  actorId: "",
  action: "",
  from: "",
  to: "",
};
const FILTER_KEYS = ["patientId", "mrn", "actorId", "action", "from", "to"] as const;
type FilterKey = (typeof FILTER_KEYS)[number];
export type LedgerFilterErrors = Partial<Record<FilterKey, string>>;

const ID = /^[1-9]\d{0,9}$/;
const optionalId = (message: string) =>
  z
    .string()
    .trim()
    .refine((v) => v === "" || ID.test(v), message);
const optionalLocalTime = (message: string) =>
  z
    .string()
    .refine(
      (v) => v === "" || (LOCAL_DATE_TIME.test(v) && zonedLocalToUtc(v, "UTC") !== undefined),
      message,
    );
// Both ends typed in one zone, so comparing them as UTC wall times orders them.
const wallTime = (local: string) => zonedLocalToUtc(local, "UTC")?.getTime();

/**
 * The filter form's schema; the address bar is read with it too, so a shared
 * link with a mistyped filter gets the same words beside the same field.
 */
export const ledgerFilterFormSchema = z
  .object({
    patientId: optionalId("Patient id must be a whole number above 0, such as 12."),
    mrn: z
      .string()
      .trim()
      .refine(
        (v) => v === "" || /^[A-Za-z0-9-]{1,32}$/.test(v),
        "MRN must be 1 to 32 letters, digits or dashes, such as KH402150.",
      ),
    actorId: optionalId("Choose an actor from the list."),
    action: z
      .string()
      .refine(
        (v) => v === "" || (LEDGER_ACTIONS as readonly string[]).includes(v),
        "Choose an action from the list.",
      ),
    from: optionalLocalTime("From must be a date and time, such as 2025-03-04 08:00."),
    to: optionalLocalTime("To must be a date and time, such as 2025-03-04 20:00."),
  })
  .refine(
    (v) => {
      const from = wallTime(v.from);
      const to = wallTime(v.to);
      return from === undefined || to === undefined || from < to;
    },
    {
      path: ["to"],
      message: "To must be later than From.",
    },
  );

/** Form values from the address bar; from/to travel as UTC instants and are shown in the zone. */
export function filterValuesFromSearch(
  params: URLSearchParams,
  timeZone: string,
): LedgerFilterValues {
  const read = (key: FilterKey) => params.get(key)?.trim() ?? "";
  const time = (key: "from" | "to") => {
    const raw = read(key);
    if (raw === "") return "";
    const instant = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}/.test(raw)
      ? new Date(raw)
      : new Date(Number.NaN);
    // An unreadable time stays as typed, so the schema names it beside its field.
    return Number.isNaN(instant.getTime()) ? raw : utcToZonedLocal(instant, timeZone);
  };
  return {
    patientId: read("patientId"),
    mrn: read("mrn"),
    actorId: read("actorId"),
    action: read("action"),
    from: time("from"),
    to: time("to"),
  };
}

/** The address-bar (and API) query for valid values: empty filters left out, times as UTC. */
export function searchFromFilterValues(
  values: LedgerFilterValues,
  timeZone: string,
): URLSearchParams {
  const params = new URLSearchParams();
  for (const key of FILTER_KEYS) {
    const value = values[key].trim();
    if (value === "") continue;
    if (key === "from" || key === "to") {
      const instant = zonedLocalToUtc(value, timeZone);
      if (instant) params.set(key, instant.toISOString());
    } else {
      params.set(key, value);
    }
  }
  return params;
}

/** The schema's messages by field, first message each. */
export function checkFilterValues(values: LedgerFilterValues): LedgerFilterErrors {
  const result = ledgerFilterFormSchema.safeParse(values);
  if (result.success) return {};
  const errors: LedgerFilterErrors = {};
  for (const issue of result.error.issues) {
    const key = FILTER_KEYS.find((k) => k === issue.path[0]);
    if (key && !errors[key]) errors[key] = issue.message;
  }
  return errors;
}

export type ActorOption = { id: number; name: string; role: string; active: boolean };

/**
 * The ledger filters. Applying them writes them into the address, so a filtered
 * view can be shared; the page reads them back from there.
 */
export function LedgerFilters({
  initial,
  initialErrors,
  actors,
  timeZone,
  onApply,
  onClear,
}: {
  initial: LedgerFilterValues;
  initialErrors: LedgerFilterErrors;
  actors: ActorOption[];
  timeZone: string;
  onApply: (search: URLSearchParams) => void;
  onClear: () => void;
}) {
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<LedgerFilterValues>({
    resolver: zodResolver(ledgerFilterFormSchema),
    defaultValues: initial,
    mode: "onSubmit",
  });

  // Filters read from a shared link are checked like typed ones.
  useEffect(() => {
    for (const key of FILTER_KEYS) {
      const message = initialErrors[key];
      if (message) setError(key, { type: "address", message });
    }
  }, [initialErrors, setError]);

  const onSubmit = handleSubmit((values) => onApply(searchFromFilterValues(values, timeZone)));
  const knownActor = actors.some((a) => String(a.id) === initial.actorId);

  return (
    <form
      onSubmit={(event) => void onSubmit(event)}
      noValidate
      aria-label="Ledger filters"
      className="rounded-card border border-border bg-surface p-4 shadow-card"
    >
      <div className="grid gap-x-4 gap-y-1 sm:grid-cols-2 lg:grid-cols-[13rem_minmax(0,1fr)_minmax(0,1fr)]">
        <Field
          id="ledger-patient"
          label="Patient MRN"
          error={errors.mrn?.message ?? errors.patientId?.message}
        >
          {(describedBy, invalid) => (
            <input
              id="ledger-patient"
              type="text"
              autoComplete="off"
              spellCheck={false}
              className={`${inputClasses} tabular`}
              aria-invalid={invalid}
              aria-describedby={describedBy}
              {...register("mrn")}
            />
          )}
        </Field>
        <Field id="ledger-actor" label="Actor" error={errors.actorId?.message}>
          {(describedBy, invalid) => (
            <select
              id="ledger-actor"
              className={inputClasses}
              aria-invalid={invalid}
              aria-describedby={describedBy}
              {...register("actorId")}
            >
              <option value="">Anyone</option>
              {actors.map((a) => (
                <option key={a.id} value={String(a.id)}>
                  {a.name} ({roleLabel(a.role)}){a.active ? "" : " — deactivated"}
                </option>
              ))}
              {initial.actorId !== "" && !knownActor ? (
                <option value={initial.actorId}>User #{initial.actorId}</option>
              ) : null}
            </select>
          )}
        </Field>
        <Field id="ledger-action" label="Action" error={errors.action?.message}>
          {(describedBy, invalid) => (
            <select
              id="ledger-action"
              className={inputClasses}
              aria-invalid={invalid}
              aria-describedby={describedBy}
              {...register("action")}
            >
              <option value="">Any action</option>
              {LEDGER_ACTIONS.map((code) => (
                <option key={code} value={code}>
                  {actionLabel(code)}
                </option>
              ))}
              {initial.action !== "" &&
              !(LEDGER_ACTIONS as readonly string[]).includes(initial.action) ? (
                <option value={initial.action}>{initial.action}</option>
              ) : null}
            </select>
          )}
        </Field>
      </div>
      <fieldset className="mt-1">
        <legend className="text-sm font-medium text-ink">
          Period <span className="font-normal text-ink-muted">(times in {timeZone})</span>
        </legend>
        <div className="mt-1 grid gap-x-4 gap-y-1 sm:grid-cols-2 lg:grid-cols-[minmax(0,1fr)_minmax(0,1fr)_auto]">
          <Field id="ledger-from" label="From" error={errors.from?.message}>
            {(describedBy, invalid) => (
              <input
                id="ledger-from"
                type="datetime-local"
                step={1}
                className={`${inputClasses} tabular`}
                aria-invalid={invalid}
                aria-describedby={describedBy}
                {...register("from")}
              />
            )}
          </Field>
          <Field id="ledger-to" label="To" hint="Rows before this time." error={errors.to?.message}>
            {(describedBy, invalid) => (
              <input
                id="ledger-to"
                type="datetime-local"
                step={1}
                className={`${inputClasses} tabular`}
                aria-invalid={invalid}
                aria-describedby={describedBy}
                {...register("to")}
              />
            )}
          </Field>
          <div className="flex items-start gap-2 sm:col-span-2 lg:col-span-1 lg:pt-6">
            <Button type="submit">Apply filters</Button>
            <Button variant="secondary" onClick={onClear}>
              Clear
            </Button>
          </div>
        </div>
      </fieldset>
    </form>
  );
}
