"use client";

import { useState, useSyncExternalStore, type ReactNode } from "react";
import type { FieldValues, Path, UseFormRegisterReturn, UseFormReturn } from "react-hook-form";
import { z } from "zod";
import { Field, inputClasses } from "@/components/ui/Field";
import { IconCheck, IconWarning } from "@/components/ui/icons";
import type { FieldErrors } from "@/lib/errors";
import { toNumber } from "@/lib/number-input";
import { DEVICE_PROFILES, DEVICES, estimateFio2, type Device } from "@/lib/devices";
import { formatUnitTime, wallTimeToInstant, zoneOffsetMs } from "@/lib/time/zone";

// Pieces the bedside forms (adjustment, reading, blood gas) and the blood-gas
// evaluator share: number inputs, the unit's wall-clock time, the idempotency
// key, the hydration guard, refusals and the status line.

const noSubscription = () => () => {};

/**
 * False on the server and while hydrating, true once React owns the form. The
 * forms keep their controls disabled until then: values typed earlier would be
 * overwritten by the form's defaults, and Enter would submit natively, putting
 * the values into the URL.
 */
export function useHydrated(): boolean {
  return useSyncExternalStore(
    noSubscription,
    () => true,
    () => false,
  );
}

/** A number as a text input's first value (server-rendered before the form takes over). */
export const textDefault = (value: unknown): string | undefined =>
  typeof value === "number" && Number.isFinite(value) ? String(value) : undefined;

/**
 * A number typed as text: no scroll-wheel changes, a decimal comma accepted.
 * Register it with `setValueAs: toNumber`.
 */
function NumberInput({
  id,
  registration,
  describedBy,
  invalid,
  defaultValue,
  inputMode = "decimal",
}: {
  id: string;
  registration: UseFormRegisterReturn;
  describedBy: string | undefined;
  invalid: boolean;
  /** Shown by the server-rendered page before the form takes over. */
  defaultValue?: number;
  inputMode?: "decimal" | "numeric";
}) {
  return (
    <input
      id={id}
      type="text"
      inputMode={inputMode}
      autoComplete="off"
      className={`${inputClasses} tabular`}
      aria-invalid={invalid}
      aria-describedby={describedBy}
      defaultValue={textDefault(defaultValue)}
      {...registration}
    />
  );
}

/** One key per form mount: a retried or double-clicked submit is recorded once. */
export function useIdempotencyKey(): string {
  const [key] = useState(newIdempotencyKey);
  return key;
}

export function newIdempotencyKey(): string {
  if (typeof crypto.randomUUID === "function") return crypto.randomUUID();
  // randomUUID needs a secure context; getRandomValues does not.
  const bytes = crypto.getRandomValues(new Uint8Array(16));
  return Array.from(bytes, (b) => b.toString(16).padStart(2, "0")).join("");
}

/**
 * A labelled number field of a form (Field around NumberInput), with the id
 * `${id}-${name}`, its error from the form, and `toNumber` as its parser.
 */
export function NumberField<T extends FieldValues>({
  form,
  id,
  name,
  label,
  hint,
  defaultValue,
  inputMode,
  describedBy,
}: {
  form: Pick<UseFormReturn<T>, "register" | "getFieldState" | "formState">;
  /** The form's useId prefix. */
  id: string;
  name: Path<T>;
  label: string;
  hint?: string;
  defaultValue?: number;
  inputMode?: "decimal" | "numeric";
  /** More ids that describe the input (a warning), after the hint and error. */
  describedBy?: string;
}) {
  const fieldId = `${id}-${name}`;
  const error = form.getFieldState(name, form.formState).error?.message;
  return (
    <Field id={fieldId} label={label} hint={hint} error={error}>
      {(d, invalid) => (
        <NumberInput
          id={fieldId}
          registration={form.register(name, { setValueAs: toNumber })}
          describedBy={[d, describedBy].filter(Boolean).join(" ") || undefined}
          invalid={invalid}
          defaultValue={defaultValue}
          inputMode={inputMode}
        />
      )}
    </Field>
  );
}

const LOCAL_PATTERN = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})$/;

/** An instant as the unit's wall-clock time, in the form a datetime-local input holds. */
export function toZonedLocalInput(date: Date, timeZone: string): string {
  const wall = new Date(date.getTime() + zoneOffsetMs(date.getTime(), timeZone));
  return wall.toISOString().slice(0, 16);
}

/** A datetime-local value read as the unit's wall-clock time; null when it is not one. */
export function fromZonedLocalInput(local: string, timeZone: string): Date | null {
  const m = LOCAL_PATTERN.exec(local);
  if (!m) return null;
  const [, y, mo, d, h, mi] = m.map(Number) as [number, number, number, number, number, number];
  const wall = Date.UTC(y, mo - 1, d, h, mi);
  if (Number.isNaN(wall)) return null;
  return wallTimeToInstant(wall, timeZone);
}

/** The datetime-local field of a form: required, a real date and time. */
export const localDateTimeSchema = (label: string) =>
  z
    .string({ error: `${label} must be a date and time.` })
    .regex(LOCAL_PATTERN, `${label} must be a date and time.`);

/** The time-zone words shown beside a time field. */
export function timeZoneNote(timeZone: string): string {
  return timeZone === "UTC" ? "Unit time (UTC)" : `Unit time (${timeZone})`;
}

/** A date and time typed on the unit's clock, with the zone named beside it; id `${id}-${name}`. */
export function UnitTimeField<T extends FieldValues>({
  form,
  id,
  name,
  label,
  timeZone,
}: {
  form: Pick<UseFormReturn<T>, "register" | "getFieldState" | "formState">;
  /** The form's useId prefix. */
  id: string;
  name: Path<T>;
  label: string;
  timeZone: string;
}) {
  const fieldId = `${id}-${name}`;
  const error = form.getFieldState(name, form.formState).error?.message;
  return (
    <Field id={fieldId} label={label} hint={timeZoneNote(timeZone)} error={error}>
      {(d, invalid) => (
        <input
          id={fieldId}
          type="datetime-local"
          className={`${inputClasses} tabular`}
          aria-invalid={invalid}
          aria-describedby={d}
          {...form.register(name)}
        />
      )}
    </Field>
  );
}

/**
 * Hands each server field error to the form field it belongs to; returns the
 * ones no field shows, so the summary can list them.
 */
export function placeServerErrors<F extends string>(
  fieldErrors: FieldErrors | undefined,
  fieldOf: (path: string) => F | undefined,
  setError: (field: F, error: { type: string; message: string }) => void,
): string[] {
  const unplaced: string[] = [];
  for (const [path, messages] of Object.entries(fieldErrors ?? {})) {
    const field = fieldOf(path);
    if (field) setError(field, { type: "server", message: messages.join(" ") });
    else unplaced.push(...messages);
  }
  return unplaced;
}

export type FormNotice = { kind: "error" | "success" | "info"; text: string; details?: string[] };

/**
 * The notice for a save the server refused: an ended session, or the message
 * with its field errors placed beside their fields and the rest listed.
 */
export function refusalNotice<F extends string>(
  refusal: { status: number; message: string; fieldErrors?: FieldErrors },
  fields: readonly F[],
  setError: (field: F, error: { type: string; message: string }) => void,
  words: {
    /** What to do when the session has ended, and that the values are kept. */
    sessionEnded: string;
    /** Appended to the message when some errors sit beside their fields. */
    besideFields?: string;
  },
): FormNotice {
  if (refusal.status === 401) return { kind: "error", text: words.sessionEnded };
  const unplaced = placeServerErrors(
    refusal.fieldErrors,
    (path) => fields.find((f) => f === path),
    setError,
  );
  const besideFields =
    words.besideFields ?? "See the message beside each field; nothing you typed was lost.";
  return {
    kind: "error",
    text:
      Object.keys(refusal.fieldErrors ?? {}).length > unplaced.length
        ? `${refusal.message} ${besideFields}`
        : refusal.message,
    details: unplaced,
  };
}

/** The form's status line: a refusal, a conflict or a success, read out when it changes. */
export function FormStatus({
  notice,
  children,
}: {
  notice: FormNotice | null;
  children?: ReactNode;
}) {
  return (
    <div role="status" aria-live="polite" data-testid="form-status">
      {notice ? (
        <div
          className={`flex items-start gap-2 rounded-md border px-3 py-2 text-sm ${
            notice.kind === "error"
              ? "border-below/40 bg-below-soft text-below"
              : notice.kind === "success"
                ? "border-in-band/40 bg-in-band-soft text-in-band"
                : "border-border bg-surface-muted text-ink"
          }`}
        >
          {notice.kind === "success" ? (
            <IconCheck className="mt-0.5 shrink-0" />
          ) : (
            <IconWarning className="mt-0.5 shrink-0" />
          )}
          <div className="min-w-0 space-y-1">
            <p className="font-medium">{notice.text}</p>
            {notice.details && notice.details.length > 0 ? (
              <ul className="list-disc pl-4">
                {notice.details.map((d) => (
                  <li key={d}>{d}</li>
                ))}
              </ul>
            ) : null}
            {children}
          </div>
        </div>
      ) : null}
    </div>
  );
}

/** A caution beside a field that does not block submitting (e.g. outside the order's limits). */
export function FieldWarning({ id, children }: { id: string; children: ReactNode }) {
  return (
    <p
      id={id}
      className="flex items-start gap-1.5 rounded-md border border-overdue/40 bg-overdue-soft px-2 py-1 text-xs font-medium text-overdue"
      data-testid="limit-warning"
    >
      <IconWarning className="mt-0.5 shrink-0" />
      <span>{children}</span>
    </p>
  );
}

/** The device options of a select, in the order's words. */
export function DeviceOptions() {
  return (
    <>
      {DEVICES.map((d) => (
        <option key={d} value={d}>
          {DEVICE_PROFILES[d].label}
        </option>
      ))}
    </>
  );
}

/** The flow a device takes, in words, for a hint. */
export function flowHint(device: Device): string | undefined {
  const range = DEVICE_PROFILES[device].flow;
  return range
    ? `${DEVICE_PROFILES[device].label}: typically ${range.min}–${range.max} L/min.`
    : undefined;
}

export const formatFio2Value = (fio2: number): string => fio2.toFixed(2);

/** "0.29 (estimate)" style text for a low-flow device's FiO2. */
export function describeDeviceFio2(device: Device, flow: number | undefined): string {
  const profile = DEVICE_PROFILES[device];
  switch (profile.uses.fio2) {
    case "fixed":
      return `${formatFio2Value(profile.fio2.min)} (room air)`;
    case "estimated": {
      if (flow === undefined || !Number.isFinite(flow)) return "— (type the flow to estimate it)";
      const estimate = estimateFio2(device, flow);
      return estimate === null ? "—" : `≈ ${formatFio2Value(estimate)} (estimate)`;
    }
    case "set":
      return "";
  }
}

/** A stored instant as the unit's wall-clock time ("02 Dec 14:05"), for the forms' importers. */
export { formatUnitTime };

/** The bedside context as the forms read it from api/v1 (SWR). */
export async function fetchJson<T>(url: string): Promise<T> {
  let response: Response;
  try {
    response = await fetch(url, { headers: { accept: "application/json" } });
  } catch {
    throw new Error("Tidemark could not be reached. Check the connection and try again.");
  }
  const body: unknown = await response.json().catch(() => null);
  if (!response.ok) {
    const message =
      typeof body === "object" &&
      body !== null &&
      "error" in body &&
      typeof body.error === "object" &&
      body.error !== null &&
      "message" in body.error &&
      typeof body.error.message === "string"
        ? body.error.message
        : `The request failed (${response.status}).`;
    throw new Error(response.status === 401 ? "Your session has ended. Sign in again." : message);
  }
  return body as T;
}
