"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useCallback, useId, useMemo, useRef, useState } from "react";
import { useForm, useWatch, type Resolver } from "react-hook-form";
import useSWR, { SWRConfig } from "swr";
import { recordAdjustmentAction } from "@/lib/adjustments/actions";
import {
  describeDeviceFio2,
  fetchJson,
  FieldWarning,
  formatFio2Value,
  type FormNotice,
  FormStatus,
  fromZonedLocalInput,
  NumberField,
  refusalNotice,
  toZonedLocalInput,
  UnitTimeField,
  useHydrated,
  useIdempotencyKey,
} from "@/components/bedside/BedsideFormParts";
import { Button, buttonClasses } from "@/components/ui/Button";
import { OrderRequestForm } from "@/components/order-requests/OrderRequestForm";
import { requestFromRefusal } from "@/components/order-requests/request-defaults";
import { Caution } from "@/components/ui/Caution";
import { EmptyState } from "@/components/ui/EmptyState";
import { Field, inputClasses } from "@/components/ui/Field";
import { ADJUSTMENT_REASONS } from "@/lib/adjustments/schema";
import type { PressureUnit, ProposalDirection, ProposedSetting } from "@/lib/oxygen";
import { DEVICE_PROFILES, estimateFio2 } from "@/lib/devices";
import type { OrderView } from "@/lib/orders/queries";
import type { BedsideContext, BedsideSettings } from "@/lib/chart/bedside";
import type { ForecastPairView } from "@/lib/forecast-accuracy/views";
import { AdjustmentForecast } from "./AdjustmentForecast";
import { BedsideContextCards } from "./BedsideContextCards";
import {
  adjustmentFormSchema,
  asNumber,
  FIELDS,
  limitWarnings,
  reasonFor,
  type FormInput,
  type FormOutput,
} from "./adjustment-form-rules";
import { ProposalCard } from "./ProposalCard";

export { adjustmentFormSchema, limitWarnings } from "./adjustment-form-rules";

/**
 * Record one applied settings change: the order in effect, the applied
 * settings, the latest observations and the engine's proposal above; the new
 * settings with a live forecast and limit warnings below. Sends the settings
 * version it started from; a conflict keeps what was typed and offers to
 * reload the current settings.
 */
export function AdjustmentForm(props: {
  patientId: number;
  initialContext: BedsideContext;
  pressureUnit: PressureUnit;
  timeZone: string;
  /** This stay's checked forecasts: the empirical interval beside the forecast. */
  forecastPairs?: readonly ForecastPairView[];
  /** The user may ask for a new order when a change is outside the limits. */
  canRequest?: boolean;
}) {
  // A cache of this page's own: the context the server rendered is what the
  // form starts from, never one left in a shared cache by an earlier visit.
  return (
    <SWRConfig value={{ provider: () => new Map() }}>
      <AdjustmentFormWithContext {...props} />
    </SWRConfig>
  );
}

function AdjustmentFormWithContext({
  patientId,
  initialContext,
  pressureUnit,
  timeZone,
  forecastPairs,
  canRequest,
}: {
  patientId: number;
  initialContext: BedsideContext;
  pressureUnit: PressureUnit;
  timeZone: string;
  forecastPairs?: readonly ForecastPairView[];
  canRequest?: boolean;
}) {
  const bedsideUrl = `/api/v1/patients/${patientId}/bedside`;
  // A blood gas older than the site's limit drives the proposal only when the
  // clinician chooses it; every reload asks for the context with that choice.
  const [useStaleGas, setUseStaleGas] = useState(false);
  const staleChoice = useRef(false);
  const fetchContext = useCallback(
    (url: string) =>
      fetchJson<BedsideContext>(staleChoice.current ? `${url}?useStaleBloodGas=1` : url),
    [],
  );
  // No background refresh: the version sent must be the one the person saw.
  const { data, mutate, isValidating } = useSWR<BedsideContext, Error>(bedsideUrl, fetchContext, {
    fallbackData: initialContext,
    revalidateOnMount: false,
    revalidateOnFocus: false,
    revalidateOnReconnect: false,
    revalidateIfStale: false,
  });
  const context = data ?? initialContext;
  const { order, settings } = context;
  if (!order || !settings) {
    return (
      <EmptyState title="No oxygen order in effect">
        Settings can only be changed within an order. A physician must write one first (device, SpO2
        target band and limits).{" "}
        <Link href={`/patients/${patientId}`} className="text-accent underline">
          Back to the Chart
        </Link>
      </EmptyState>
    );
  }
  return (
    <AdjustmentFormBody
      // A new order on another device has other fields; on the same device what was typed stays.
      key={order.device}
      patientId={patientId}
      context={context}
      order={order}
      settings={settings}
      pressureUnit={pressureUnit}
      timeZone={timeZone}
      forecastPairs={forecastPairs}
      canRequest={canRequest ?? false}
      reload={async () => {
        await mutate();
      }}
      reloading={isValidating}
      useStaleGas={useStaleGas}
      onUseStaleGasChange={(use) => {
        staleChoice.current = use;
        setUseStaleGas(use);
        void mutate();
      }}
    />
  );
}

function AdjustmentFormBody({
  patientId,
  context,
  order,
  settings,
  pressureUnit,
  timeZone,
  reload,
  reloading,
  useStaleGas,
  onUseStaleGasChange,
  forecastPairs,
  canRequest,
}: {
  patientId: number;
  canRequest: boolean;
  context: BedsideContext;
  order: OrderView;
  settings: BedsideSettings;
  pressureUnit: PressureUnit;
  timeZone: string;
  forecastPairs?: readonly ForecastPairView[] | undefined;
  reload: () => Promise<void>;
  reloading: boolean;
  useStaleGas: boolean;
  onUseStaleGasChange: (use: boolean) => void;
}) {
  const id = useId();
  const router = useRouter();
  const idempotencyKey = useIdempotencyKey();
  const hydrated = useHydrated();
  const device = order.device;
  const profile = DEVICE_PROFILES[device];
  const uses = profile.uses;
  const [notice, setNotice] = useState<FormNotice | null>(null);
  const [conflict, setConflict] = useState<string | null>(null);
  const [saved, setSaved] = useState(false);

  const resolver = useMemo<Resolver<FormInput, unknown, FormOutput>>(
    () => zodResolver(adjustmentFormSchema(device, settings)),
    [device, settings],
  );
  const form = useForm<FormInput, unknown, FormOutput>({
    resolver,
    defaultValues: {
      toFio2: uses.fio2 === "set" ? settings.fio2 : undefined,
      toPeep: uses.peep ? (settings.peep ?? undefined) : undefined,
      toFlow: uses.flow ? (settings.flow ?? undefined) : undefined,
      reason: reasonFor(context),
      rationale: "",
      appliedAt: toZonedLocalInput(new Date(), timeZone),
    },
  });
  const {
    register,
    control,
    handleSubmit,
    setError,
    setValue,
    setFocus,
    formState: { errors, isSubmitting },
  } = form;
  // Shown by the server-rendered page too, before the form takes over.
  const initial = { toFio2: settings.fio2, toPeep: settings.peep, toFlow: settings.flow };

  const [typedFio2, typedPeep, typedFlow] = useWatch({
    control,
    name: ["toFio2", "toPeep", "toFlow"],
  });
  const fio2Estimated = uses.fio2 === "estimated";
  const nextFio2 =
    uses.fio2 === "set"
      ? asNumber(typedFio2)
      : uses.fio2 === "fixed"
        ? profile.fio2.min
        : (estimateFio2(device, asNumber(typedFlow)) ?? undefined);
  const warnings = limitWarnings(
    order,
    { fio2: nextFio2, peep: asNumber(typedPeep), flow: asNumber(typedFlow) },
    fio2Estimated,
  );
  // Outside the limits: the way out is a new order, asked for right here.
  const askFor = requestFromRefusal(
    patientId,
    order,
    { fio2: nextFio2, peep: asNumber(typedPeep), flow: asNumber(typedFlow) },
    context.latestReading?.spo2 ?? null,
  );
  const peep = asNumber(typedPeep);
  const peepChanges =
    uses.peep &&
    peep !== undefined &&
    Number.isFinite(peep) &&
    settings.peep !== null &&
    Math.abs(peep - settings.peep) > 1e-9;

  const applyProposal = (step: ProposedSetting, direction: ProposalDirection) => {
    const options = { shouldDirty: true, shouldValidate: false } as const;
    if (uses.fio2 === "set") setValue("toFio2", step.fio2, options);
    if (uses.peep && step.peep !== undefined) setValue("toPeep", step.peep, options);
    if (uses.flow && step.flow !== undefined) setValue("toFlow", step.flow, options);
    if (direction === "up") setValue("reason", "below_band", options);
    if (direction === "down") setValue("reason", "above_band", options);
    setNotice({
      kind: "info",
      text: "The proposed step is filled in. Check it, give your rationale, then record it.",
    });
    setFocus("rationale");
  };

  const onSubmit = handleSubmit(async (values) => {
    setNotice(null);
    setConflict(null);
    const appliedAt = fromZonedLocalInput(values.appliedAt, timeZone);
    if (!appliedAt) {
      setError("appliedAt", { type: "client", message: "Time applied must be a date and time." });
      return;
    }
    const toFio2 =
      uses.fio2 === "set"
        ? values.toFio2
        : uses.fio2 === "fixed"
          ? profile.fio2.min
          : (estimateFio2(device, values.toFlow) ?? undefined);
    let result: Awaited<ReturnType<typeof recordAdjustmentAction>>;
    try {
      result = await recordAdjustmentAction({
        patientId,
        settingsVersion: settings.version,
        toFio2,
        ...(uses.peep ? { toPeep: values.toPeep } : {}),
        ...(uses.flow ? { toFlow: values.toFlow } : {}),
        reason: values.reason,
        rationale: values.rationale,
        appliedAt: appliedAt.toISOString(),
        ...(useStaleGas && context.latestArterialGas && !context.latestArterialGas.freshness.fresh
          ? { useStaleBloodGas: true }
          : {}),
        idempotencyKey,
      });
    } catch {
      setNotice({
        kind: "error",
        text: "Tidemark could not be reached; nothing was recorded. Check the connection and try again — your values are kept.",
      });
      return;
    }
    if (!result.ok) {
      if (result.status === 409) {
        setConflict(result.message);
        return;
      }
      setNotice(
        refusalNotice(result, FIELDS, setError, {
          sessionEnded:
            "Your session has ended. Sign in again in another tab, then record the change; your values are kept here.",
        }),
      );
      return;
    }
    setSaved(true);
    setNotice({
      kind: "success",
      text: `Adjustment recorded: FiO2 ${formatFio2Value(result.data.to.fio2)}. Opening the Chart…`,
    });
    router.push(`/patients/${patientId}`);
  });

  const reloadSettings = async () => {
    await reload();
    setConflict(null);
    setNotice({
      kind: "info",
      text: "Current settings reloaded (see Applied settings above). Your values are kept: check them against the new settings, then record the change if it is still needed.",
    });
  };

  const warning = (name: "toFio2" | "toPeep" | "toFlow") =>
    warnings[name] ? (
      <FieldWarning id={`${id}-${name}-warning`}>{warnings[name]}</FieldWarning>
    ) : null;
  const settingField = (name: "toFio2" | "toPeep" | "toFlow", label: string, hint?: string) => (
    <div className="col-span-2 sm:col-span-1">
      <NumberField
        form={form}
        id={id}
        name={name}
        label={label}
        hint={hint}
        defaultValue={initial[name] ?? undefined}
        describedBy={warnings[name] ? `${id}-${name}-warning` : undefined}
      />
      {warning(name)}
    </div>
  );

  return (
    <div className="space-y-4">
      <BedsideContextCards context={context} pressureUnit={pressureUnit} timeZone={timeZone} />
      <ProposalCard
        proposal={context.proposal}
        proposalError={context.proposalError}
        hasReading={context.latestReading !== null}
        pressureUnit={pressureUnit}
        onUse={applyProposal}
      />

      <form
        onSubmit={onSubmit}
        noValidate
        aria-labelledby={`${id}-heading`}
        data-ready={hydrated ? "true" : undefined}
        className="grid gap-5 rounded-card border border-border bg-surface p-4 shadow-card lg:grid-cols-[minmax(0,2fr)_minmax(0,3fr)]"
      >
        <fieldset disabled={!hydrated} className="min-w-0 space-y-3">
          <h2 id={`${id}-heading`} className="text-base font-semibold">
            New settings on {profile.label}
          </h2>
          <div className="grid grid-cols-2 gap-x-3">
            {uses.fio2 === "set"
              ? settingField("toFio2", "New FiO2", "A fraction: 0.40 for 40 %.")
              : null}
            {uses.flow ? settingField("toFlow", "New flow (L/min)") : null}
            {uses.peep ? settingField("toPeep", "New PEEP (cmH2O)") : null}
            {uses.fio2 !== "set" ? (
              <div className="col-span-2 sm:col-span-1">
                <p id={`${id}-estimate-label`} className="text-sm font-medium">
                  {uses.fio2 === "estimated" ? "New FiO2 (estimated)" : "FiO2"}
                </p>
                <output
                  id={`${id}-estimate`}
                  htmlFor={`${id}-toFlow`}
                  aria-labelledby={`${id}-estimate-label`}
                  aria-describedby={errors.toFio2 ? `${id}-estimate-error` : undefined}
                  className="tabular mt-1 block rounded-md border border-dashed border-border-strong px-2.5 py-1.5 text-base"
                  data-testid="estimated-fio2"
                >
                  {describeDeviceFio2(device, asNumber(typedFlow))}
                </output>
                <p className="text-xs text-ink-muted">
                  {uses.fio2 === "estimated"
                    ? "Estimated from the flow by the server; a low-flow device delivers a varying FiO2."
                    : "Room air: FiO2 is fixed."}
                </p>
                <p
                  id={`${id}-estimate-error`}
                  className="min-h-4 text-xs font-medium text-below"
                  aria-live="polite"
                >
                  {errors.toFio2?.message ?? ""}
                </p>
                {warning("toFio2")}
              </div>
            ) : null}
          </div>

          <Field id={`${id}-reason`} label="Reason" error={errors.reason?.message}>
            {(d, invalid) => (
              <select
                id={`${id}-reason`}
                className={inputClasses}
                aria-invalid={invalid}
                aria-describedby={d}
                defaultValue={reasonFor(context) ?? ""}
                {...register("reason")}
              >
                <option value="">Choose a reason…</option>
                {ADJUSTMENT_REASONS.map((r) => (
                  <option key={r.value} value={r.value}>
                    {r.label}
                  </option>
                ))}
              </select>
            )}
          </Field>
          <UnitTimeField
            form={form}
            id={id}
            name="appliedAt"
            label="Time applied"
            timeZone={timeZone}
          />
          <Field
            id={`${id}-rationale`}
            label="Rationale"
            hint="Why this change, in your words; recorded in the ledger."
            error={errors.rationale?.message}
          >
            {(d, invalid) => (
              <textarea
                id={`${id}-rationale`}
                rows={3}
                className={inputClasses}
                aria-invalid={invalid}
                aria-describedby={d}
                {...register("rationale")}
              />
            )}
          </Field>

          <div className="flex flex-wrap items-center gap-3">
            <Button type="submit" disabled={isSubmitting || saved}>
              {isSubmitting ? "Recording…" : saved ? "Recorded" : "Record adjustment"}
            </Button>
            <Link href={`/patients/${patientId}`} className={buttonClasses("ghost")}>
              Cancel
            </Link>
          </div>
          <FormStatus notice={conflict ? { kind: "error", text: conflict } : notice}>
            {conflict ? (
              <Button
                variant="secondary"
                className="mt-1"
                disabled={reloading}
                onClick={reloadSettings}
              >
                {reloading ? "Reloading…" : "Reload current settings"}
              </Button>
            ) : null}
          </FormStatus>
        </fieldset>

        <div className="min-w-0 space-y-3">
          <AdjustmentForecast
            gas={context.latestArterialGas}
            useStaleGas={useStaleGas}
            onUseStaleGasChange={onUseStaleGasChange}
            barometricPressure={context.barometricPressure}
            nextFio2={nextFio2}
            fio2Estimated={fio2Estimated}
            peepChanges={peepChanges}
            pressureUnit={pressureUnit}
            timeZone={timeZone}
            forecastPairs={forecastPairs}
          />
          <Caution />
        </div>
      </form>
      {canRequest && askFor ? (
        <section aria-labelledby={`${id}-ask`} className="space-y-2">
          <h2 id={`${id}-ask`} className="text-lg font-semibold">
            Ask for a new order
          </h2>
          <OrderRequestForm key={askFor.need} start={askFor} compact />
        </section>
      ) : null}
    </div>
  );
}
