"use client";

import { useRouter } from "next/navigation";
import { useCallback, useState } from "react";
import {
  useForm,
  useWatch,
  type FieldError,
  type FieldErrors,
  type Resolver,
} from "react-hook-form";
import { writeOrderAction } from "@/lib/orders/actions";
import { Button } from "@/components/ui/Button";
import { IconWarning } from "@/components/ui/icons";
import { DEVICE_PROFILES, estimateFio2, type Device } from "@/lib/devices";
import type { OrderView } from "@/lib/orders/queries";
import { orderInputSchema } from "@/lib/orders/schema";
import { toNumber } from "@/lib/number-input";
import type { PressureUnit } from "@/lib/oxygen";
import {
  buildOrderInput,
  fio2Text,
  formFieldOf,
  initialValues,
  prefillFromRequest,
  type RequestPrefill,
  limitValuesFor,
  restate,
  stepTableFits,
  type ComposerValues,
  type FormField,
  type PhysicianChoice,
  type StepTableChoice,
} from "./order-form";
import { OrderInEffect, OrderReadBack } from "./OrderComposerAside";
import { DeviceLimitsSection, TargetBandSection, TitrationSection } from "./OrderComposerFields";
import { SigningSection } from "./OrderSigning";
import { VentilationSection, type OrderBodyWeight } from "./VentilationFields";

// The form mapping lives in ./order-form; these stay importable from here.
export {
  buildOrderInput,
  formFieldOf,
  initialValues,
  limitValuesFor,
  REASSESS_PRESETS,
  type BuildContext,
  type ComposerValues,
  type PhysicianChoice,
  type StepTableChoice,
} from "./order-form";

// ---------------------------------------------------------------------------
// The composer
// ---------------------------------------------------------------------------

function newIdempotencyKey(): string {
  if (typeof crypto.randomUUID === "function") return crypto.randomUUID();
  // Plain-HTTP deployments have no randomUUID; getRandomValues works everywhere.
  return Array.from(crypto.getRandomValues(new Uint8Array(16)), (b) =>
    b.toString(16).padStart(2, "0"),
  ).join("");
}

/**
 * The order composer: device and limits, target band, step table, reassessment
 * and rationale, then the physician's signature or the nurse's/therapist's
 * read-back. Validated with the shared schema before sending and again on the
 * server; refusals land beside their fields and nothing typed is lost.
 */
export function OrderComposer({
  patient,
  signer,
  pressureUnit,
  timeZone,
  currentOrder,
  currentStepTableName,
  stepTables,
  physicians,
  prefill,
  bodyWeight = null,
}: {
  patient: { id: number; name: string; bedLabel: string };
  /** The patient's predicted body weight (null without a recorded height): the mL of a ventilator order. */
  bodyWeight?: OrderBodyWeight;
  signer: "physician" | "other";
  pressureUnit: PressureUnit;
  timeZone: string;
  currentOrder: OrderView | null;
  currentStepTableName: string | null;
  stepTables: StepTableChoice[];
  physicians: PhysicianChoice[];
  /** An order request the composer starts from. */
  prefill?: RequestPrefill;
}) {
  const router = useRouter();
  // One key per composer: a double submit or a retry after a lost answer writes once.
  const [idempotencyKey] = useState(newIdempotencyKey);
  const [formError, setFormError] = useState<string | null>(null);
  const [conflict, setConflict] = useState<string | null>(null);
  const [done, setDone] = useState(false);

  const resolver = useCallback<Resolver<ComposerValues>>(
    (values) => {
      const { input, errors: local } = buildOrderInput(values, {
        signer,
        pressureUnit,
        patientId: patient.id,
        supersedesOrderId: null,
        idempotencyKey,
      });
      const found: Partial<Record<FormField, FieldError>> = {};
      for (const [field, message] of Object.entries(local) as [FormField, string][]) {
        found[field] = { type: "validate", message };
      }
      const parsed = orderInputSchema.safeParse(input);
      if (!parsed.success) {
        for (const issue of parsed.error.issues) {
          const path = issue.path.map(String).join(".");
          const field = formFieldOf(path, values);
          if (field && !found[field]) {
            found[field] = {
              type: "validate",
              message: restate(path, issue.message, pressureUnit),
            };
          }
        }
      }
      return Object.keys(found).length > 0
        ? { values: {}, errors: found as FieldErrors<ComposerValues> }
        : { values, errors: {} };
    },
    [signer, pressureUnit, patient.id, idempotencyKey],
  );

  const {
    register,
    control,
    handleSubmit,
    setError,
    setValue,
    clearErrors,
    getValues,
    formState: { errors, isSubmitting },
  } = useForm<ComposerValues>({
    resolver,
    defaultValues: prefill
      ? prefillFromRequest(initialValues(currentOrder, pressureUnit), prefill)
      : initialValues(currentOrder, pressureUnit),
  });
  const values = useWatch({ control });
  const device = values.device ?? "";
  const profile = device === "" ? null : DEVICE_PROFILES[device];
  const estimated = profile?.uses.fio2 === "estimated";

  const chooseDevice = (next: Device | "") => {
    if (next === "") return;
    const limits = limitValuesFor(next);
    for (const [field, value] of Object.entries(limits) as [FormField, string][]) {
      setValue(field, value, { shouldDirty: true });
    }
    const table = stepTables.find((t) => String(t.id) === getValues("stepTableId"));
    if (table && !stepTableFits(table.kind, next)) setValue("stepTableId", "");
    clearErrors(Object.keys(limits) as FormField[]);
  };

  // A low-flow device delivers what the flow gives: the starting FiO2 follows the flow.
  const followFlow = (flowText: string) => {
    if (device === "" || !estimated) return;
    const n = toNumber(flowText);
    const fio2 = n !== undefined && Number.isFinite(n) ? estimateFio2(device, n) : null;
    if (fio2 !== null) setValue("initialFio2", fio2Text(fio2));
  };

  const onSubmit = handleSubmit(async (submitted) => {
    setFormError(null);
    setConflict(null);
    const { input } = buildOrderInput(submitted, {
      signer,
      pressureUnit,
      patientId: patient.id,
      supersedesOrderId: currentOrder?.id ?? null,
      idempotencyKey,
    });
    let result: Awaited<ReturnType<typeof writeOrderAction>>;
    try {
      result = await writeOrderAction(input);
    } catch {
      setFormError(
        "Tidemark could not be reached. Nothing was saved; your entries are kept. Try again.",
      );
      return;
    }
    if (result.ok) {
      setDone(true);
      router.push(`/patients/${patient.id}`);
      return;
    }
    if (result.status === 409) {
      setConflict(result.message);
      return;
    }
    let placed = false;
    let focused = false;
    const unplaced: string[] = [];
    for (const [path, messages] of Object.entries(result.fieldErrors ?? {})) {
      const field = formFieldOf(path, submitted);
      const message = messages.map((m) => restate(path, m, pressureUnit)).join(" ");
      if (!field) {
        unplaced.push(message);
        continue;
      }
      if (field === "password") setValue("password", "");
      setError(field, { type: "server", message }, { shouldFocus: !focused });
      placed = true;
      focused = true;
    }
    setFormError(
      [
        placed
          ? "Not saved: see the message beside each marked field. Everything you typed is kept."
          : result.message,
        ...unplaced,
      ].join(" "),
    );
  });

  return (
    <div className="grid items-start gap-5 lg:grid-cols-[minmax(0,1fr)_18rem]">
      <form onSubmit={onSubmit} noValidate aria-label="Order" className="min-w-0 space-y-4">
        {prefill ? (
          <p className="rounded-card border border-accent/40 bg-surface-muted px-4 py-2 text-sm">
            Started from order request #{prefill.id} by {prefill.requestedBy}: “{prefill.need}”.
            Review every field; signing this order closes the request.
          </p>
        ) : null}
        <DeviceLimitsSection
          register={register}
          errors={errors}
          values={values}
          chooseDevice={chooseDevice}
          followFlow={followFlow}
        />

        <VentilationSection
          register={register}
          errors={errors}
          values={values}
          bodyWeight={bodyWeight}
        />

        <TargetBandSection
          register={register}
          errors={errors}
          values={values}
          pressureUnit={pressureUnit}
        />

        <TitrationSection
          register={register}
          errors={errors}
          values={values}
          stepTables={stepTables}
        />

        <SigningSection
          signer={signer}
          register={register}
          errors={errors}
          prescriberId={values.prescriberId}
          physicians={physicians}
        />

        {conflict ? (
          <div
            role="alert"
            className="space-y-2 rounded-card border border-overdue bg-overdue-soft p-3 text-sm text-ink"
          >
            <p className="flex items-start gap-2 font-medium">
              <IconWarning className="mt-0.5 shrink-0 text-overdue" />
              <span>Not saved: {conflict}</span>
            </p>
            <div className="flex flex-wrap items-center gap-3">
              <Button
                variant="secondary"
                onClick={() => {
                  setConflict(null);
                  router.refresh();
                }}
              >
                Show the order now in effect (keeps what you typed)
              </Button>
              <a
                href={`/patients/${patient.id}/orders/new`}
                className="text-accent underline underline-offset-2"
              >
                Reload this page (starts again)
              </a>
            </div>
          </div>
        ) : null}

        <div className="flex flex-wrap items-center gap-3">
          <Button type="submit" disabled={isSubmitting || done}>
            {signer === "physician"
              ? isSubmitting || done
                ? "Signing…"
                : "Sign order"
              : isSubmitting || done
                ? "Entering…"
                : values.entryMode === "telephone"
                  ? "Enter telephone order"
                  : "Enter verbal order"}
          </Button>
          <p role="status" aria-live="polite" className="text-sm">
            {formError ? <span className="font-medium text-below">{formError}</span> : null}
            {done ? <span className="text-in-band">Saved. Opening the Chart…</span> : null}
          </p>
        </div>
      </form>

      <aside className="space-y-4 lg:sticky lg:top-4" aria-label="Order in effect and summary">
        <OrderInEffect
          currentOrder={currentOrder}
          currentStepTableName={currentStepTableName}
          timeZone={timeZone}
          patientName={patient.name}
        />
        <OrderReadBack
          values={values}
          pressureUnit={pressureUnit}
          stepTables={stepTables}
          bodyWeight={bodyWeight}
        />
      </aside>
    </div>
  );
}
