"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useEffect, useId, useRef } from "react";
import { useForm, useWatch } from "react-hook-form";
import useSWRMutation from "swr/mutation";
import { NumberField, useHydrated } from "@/components/bedside/BedsideFormParts";
import { Button } from "@/components/ui/Button";
import { EmptyState } from "@/components/ui/EmptyState";
import { IconWarning } from "@/components/ui/icons";
import { SelectField } from "@/components/ui/SelectField";
import type { FieldErrors } from "@/lib/errors";
import { emptyToUndefined } from "@/lib/number-input";
import { fromMmHg, type PressureUnit } from "@/lib/oxygen";
import { formatUnitTime } from "@/lib/time/zone";
import type { AssessResponse } from "@/lib/oxygenation/evaluate";
import {
  type AssessFormOutput,
  type AssessFormValues,
  assessFormSchema,
  type AssessRequest,
  assessRequestFromForm,
  FIELD_LABELS,
  formFieldOf,
  HEMOGLOBIN_UNITS,
  PRESSURE_UNITS,
  RESPIRATORY_SUPPORTS,
  SUPPORT_LABELS,
} from "@/lib/oxygenation/schema";
import { BasisDisclosure } from "./BasisDisclosure";
import { formatPressureNumber } from "./format";
import { OxygenationPanel } from "./OxygenationPanel";

const ASSESS_URL = "/api/v1/oxygenation/assess";

/** A refusal from the JSON API, with the fields it names. */
class ApiRequestError extends Error {
  constructor(
    message: string,
    readonly status: number,
    readonly fieldErrors: FieldErrors = {},
  ) {
    super(message);
    this.name = "ApiRequestError";
  }
}

function readApiError(body: unknown): { message?: string; fieldErrors?: FieldErrors } {
  if (typeof body !== "object" || body === null || !("error" in body)) return {};
  const error = (body as { error: unknown }).error;
  if (typeof error !== "object" || error === null) return {};
  const { message, fieldErrors } = error as { message?: unknown; fieldErrors?: unknown };
  return {
    message: typeof message === "string" ? message : undefined,
    fieldErrors:
      typeof fieldErrors === "object" && fieldErrors !== null
        ? (fieldErrors as FieldErrors)
        : undefined,
  };
}

async function postAssessment(
  url: string,
  { arg }: { arg: AssessRequest },
): Promise<AssessResponse> {
  let response: Response;
  try {
    response = await fetch(url, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify(arg),
    });
  } catch {
    throw new ApiRequestError(
      "Tidemark could not be reached. Check the connection and try again; your values are kept.",
      0,
    );
  }
  const body: unknown = await response.json().catch(() => null);
  if (!response.ok) {
    const { message, fieldErrors } = readApiError(body);
    const fallback =
      response.status === 401
        ? "Your session has ended. Sign in again; your values are kept here until you leave."
        : "The evaluation failed; try again.";
    throw new ApiRequestError(
      response.status === 401 ? fallback : (message ?? fallback),
      response.status,
      fieldErrors,
    );
  }
  return body as AssessResponse;
}

/** The admission's latest arterial gas as the Chart loads it (engine units). */
export type LatestGas = {
  sampledAt: string;
  pao2: number;
  paco2: number;
  hb: number | null;
  fio2: number;
  peep: number | null;
};

/** The form's values for a recorded gas, pressures in the user's unit, FiO2 in %. */
export function latestGasValues(gas: LatestGas, unit: PressureUnit): AssessFormValues {
  const pressure = (mmHg: number) => Math.round(fromMmHg(mmHg, unit) * 100) / 100;
  return {
    pressureUnit: unit,
    hemoglobinUnit: "g/dL",
    pao2: pressure(gas.pao2),
    paco2: pressure(gas.paco2),
    fio2Percent: Math.round(gas.fio2 * 1000) / 10,
    ...(gas.hb === null ? {} : { hemoglobin: gas.hb }),
    ...(gas.peep === null ? {} : { peep: gas.peep }),
  } as AssessFormValues;
}

/**
 * The Chart's "Evaluate a blood gas": a keyboard-complete form over the shared
 * schema that posts to api/v1/oxygenation/assess and shows the oxygenation
 * panel. Refusals land beside the fields and what was typed stays.
 */
export function BloodGasEvaluator({
  pressureUnit,
  unitId,
  ageYears,
  unitLabel,
  latest = null,
  timeZone = "UTC",
}: {
  /** The user's preferred unit: the form starts in it and the panel shows it. */
  pressureUnit: PressureUnit;
  unitId: number;
  ageYears: number;
  unitLabel: string;
  /** The admission's latest arterial gas (mmHg, g/dL, fraction): the form opens with it, evaluated. */
  latest?: LatestGas | null;
  /** The unit's clock, for the latest gas's time. */
  timeZone?: string;
}) {
  const id = useId();
  // Disabled until hydrated: an early Enter would submit natively, putting the values into the URL.
  const hydrated = useHydrated();
  const form = useForm<AssessFormValues, unknown, AssessFormOutput>({
    resolver: zodResolver(assessFormSchema),
    defaultValues: latest
      ? latestGasValues(latest, pressureUnit)
      : { pressureUnit, hemoglobinUnit: "g/dL" },
  });
  const { control, handleSubmit, setError } = form;
  const typedUnit = useWatch({ control, name: "pressureUnit" }) ?? pressureUnit;
  const { trigger, data, error, isMutating } = useSWRMutation<
    AssessResponse,
    ApiRequestError,
    string,
    AssessRequest
  >(ASSESS_URL, postAssessment);

  const onSubmit = handleSubmit(async (values) => {
    try {
      await trigger(assessRequestFromForm(values, { unitId, ageYears }));
    } catch (thrown) {
      if (!(thrown instanceof ApiRequestError)) throw thrown;
      for (const [path, messages] of Object.entries(thrown.fieldErrors)) {
        const field = formFieldOf(path);
        if (field) setError(field, { type: "server", message: messages.join(" ") });
      }
    }
  });

  // A recorded gas is evaluated as the Chart opens, so the panel shows it without a click.
  const opened = useRef(false);
  useEffect(() => {
    if (!hydrated || !latest || opened.current) return;
    opened.current = true;
    void onSubmit();
  }, [hydrated, latest, onSubmit]);

  // Errors with a field sit beside it; the rest (e.g. the unit) are listed here.
  const fieldPaths = error ? Object.keys(error.fieldErrors) : [];
  const unplaced = error
    ? Object.entries(error.fieldErrors).filter(([path]) => !formFieldOf(path))
    : [];
  const summary =
    error && fieldPaths.some((path) => formFieldOf(path))
      ? "Some values were refused: see the message beside each field. Nothing you typed was lost."
      : error?.message;

  return (
    <div className="space-y-4">
      <form
        onSubmit={onSubmit}
        noValidate
        aria-describedby={`${id}-form-note`}
        data-ready={hydrated ? "true" : undefined}
        className="rounded-card border border-border bg-surface p-4 shadow-card"
      >
        <fieldset disabled={!hydrated} className="min-w-0 space-y-3">
          <p id={`${id}-form-note`} className="text-sm text-ink-muted">
            {latest
              ? `Opened with the latest arterial gas, sampled ${formatUnitTime(latest.sampledAt, timeZone)}; change any value to see what it would mean. `
              : "Type a blood gas to see its indices and a forecast. "}
            Nothing typed here is saved. Barometric pressure comes from the altitude of {unitLabel}{" "}
            unless you give one.
          </p>
          <fieldset className="grid grid-cols-2 gap-x-3 sm:grid-cols-3 lg:grid-cols-6">
            <legend className="mb-1 text-sm font-semibold">Blood gas</legend>
            <SelectField
              form={form}
              id={id}
              name="pressureUnit"
              label="Pressures in"
              options={PRESSURE_UNITS}
            />
            <NumberField form={form} id={id} name="fio2Percent" label="FiO2 (%)" />
            <NumberField form={form} id={id} name="pao2" label={`PaO2 (${typedUnit})`} />
            <NumberField form={form} id={id} name="paco2" label={`PaCO2 (${typedUnit})`} />
            <NumberField
              form={form}
              id={id}
              name="hemoglobin"
              label="Haemoglobin"
              hint="Optional"
            />
            <SelectField
              form={form}
              id={id}
              name="hemoglobinUnit"
              label="Haemoglobin unit"
              options={HEMOGLOBIN_UNITS}
            />
          </fieldset>

          <fieldset className="grid grid-cols-2 gap-x-3 sm:grid-cols-3 lg:grid-cols-6">
            <legend className="mb-1 text-sm font-semibold">
              Oximetry and support at sampling (optional)
            </legend>
            <NumberField form={form} id={id} name="spo2" label="SpO2 (%)" />
            <NumberField form={form} id={id} name="sao2" label="SaO2 (%)" hint="Co-oximetry" />
            <SelectField
              form={form}
              id={id}
              name="support"
              label="Support"
              registerOptions={{ setValueAs: emptyToUndefined }}
              options={RESPIRATORY_SUPPORTS.map((s) => ({ value: s, label: SUPPORT_LABELS[s] }))}
              emptyLabel="Not stated"
            />
            <NumberField form={form} id={id} name="peep" label="PEEP/CPAP (cmH2O)" />
            <NumberField form={form} id={id} name="flow" label="HFNC flow (L/min)" />
            <NumberField form={form} id={id} name="respiratoryRate" label="Resp. rate (/min)" />
            <NumberField
              form={form}
              id={id}
              name="meanAirwayPressure"
              label="Mean airway pressure (cmH2O)"
            />
            <NumberField
              form={form}
              id={id}
              name="barometricPressure"
              label={`Barometric pressure (${typedUnit})`}
              hint="Empty: from the unit's altitude"
            />
          </fieldset>

          <div className="flex flex-wrap items-center gap-3">
            <Button type="submit" disabled={isMutating}>
              {isMutating ? "Evaluating…" : "Evaluate"}
            </Button>
            <div role="status" aria-live="polite" className="text-sm">
              {isMutating ? (
                <span className="text-ink-muted">Evaluating the blood gas…</span>
              ) : null}
              {error ? (
                <span className="inline-flex items-start gap-1.5 font-medium text-below">
                  <IconWarning className="mt-0.5 shrink-0" />
                  <span>
                    {summary}
                    {unplaced.map(([path, messages]) => (
                      <span key={path} className="block font-normal">
                        {FIELD_LABELS[path] ?? (path === "_form" ? "Request" : path)}:{" "}
                        {messages.join(" ")}
                      </span>
                    ))}
                  </span>
                </span>
              ) : null}
              {data && !error && !isMutating ? (
                <span className="text-in-band">Evaluated; the results are below.</span>
              ) : null}
            </div>
          </div>
        </fieldset>
      </form>

      <section aria-label="Evaluation" aria-busy={isMutating} className="space-y-3">
        {data && !error ? (
          <div className={isMutating ? "opacity-60 transition-opacity" : undefined}>
            <div className="flex flex-wrap items-baseline gap-x-4 gap-y-1 text-xs text-ink-muted">
              <p>
                Barometric pressure used:{" "}
                <span className="tabular text-ink">
                  {formatPressureNumber(data.barometricPressure.value, pressureUnit)} {pressureUnit}
                </span>
              </p>
              <BasisDisclosure
                basis={data.barometricPressure.basis}
                pressureUnit={pressureUnit}
                className=""
              />
              <p>Engine {data.engineVersion}</p>
            </div>
            <div className="mt-3">
              <OxygenationPanel
                key={JSON.stringify(data.input)}
                assessment={data.assessment}
                input={data.input}
                pressureUnit={pressureUnit}
              />
            </div>
          </div>
        ) : isMutating ? (
          <div className="space-y-3" aria-hidden>
            <div className="grid grid-cols-2 gap-3 lg:grid-cols-4">
              {Array.from({ length: 8 }, (_, i) => (
                <div key={i} className="h-24 animate-pulse rounded-card bg-surface-muted" />
              ))}
            </div>
            <div className="h-64 animate-pulse rounded-card bg-surface-muted" />
          </div>
        ) : (
          <EmptyState title="No arterial gas recorded in this admission">
            Type one above to see its indices, the ARDS oxygenation criterion and a forecast for a
            proposed FiO2, each with its basis.
          </EmptyState>
        )}
      </section>
    </div>
  );
}
