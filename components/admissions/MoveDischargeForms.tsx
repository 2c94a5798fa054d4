"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useId, useMemo, useState } from "react";
import { useForm, type Resolver } from "react-hook-form";
import { z } from "zod";
import {
  type FormNotice,
  FormStatus,
  fromZonedLocalInput,
  localDateTimeSchema,
  refusalNotice,
  toZonedLocalInput,
  UnitTimeField,
  useHydrated,
  useIdempotencyKey,
} from "@/components/bedside/BedsideFormParts";
import { Button } from "@/components/ui/Button";
import { Field, inputClasses } from "@/components/ui/Field";
import { SelectField } from "@/components/ui/SelectField";
import { dischargePatientAction, transferPatientAction } from "@/lib/admissions/actions";
import {
  dischargeSchema,
  DISPOSITION_LABELS,
  DISPOSITIONS,
  transferSchema,
} from "@/lib/admissions/schema";
import { DEVICE_PROFILES, type Device } from "@/lib/devices";
import type { FreeBedView } from "@/lib/units/queries";

const unreachable = (what: string): FormNotice => ({
  kind: "error",
  text: `Tidemark could not be reached; the patient was not ${what}. Check the connection and try again — your entries are kept.`,
});
const sessionEnded = (what: string) =>
  `Your session has ended. Sign in again in another tab, then ${what}; your entries are kept here.`;

function ReasonField({
  id,
  label,
  hint,
  error,
  registration,
}: {
  id: string;
  label: string;
  hint?: string;
  error?: string;
  registration: ReturnType<ReturnType<typeof useForm>["register"]>;
}) {
  return (
    <Field id={id} label={label} hint={hint} error={error}>
      {(d, invalid) => (
        <textarea
          id={id}
          rows={2}
          className={inputClasses}
          aria-invalid={invalid}
          aria-describedby={d}
          {...registration}
        />
      )}
    </Field>
  );
}

const moveFormSchema = z.object({
  bedId: z.string().regex(/^\d+$/, "Choose the bed to move to."),
  rationale: transferSchema.shape.rationale,
});
type MoveInput = z.input<typeof moveFormSchema>;
type MoveOutput = z.output<typeof moveFormSchema>;

/**
 * Move an admitted patient to a free bed of the user's units. Beds of units
 * that do not allow the device in use are shown but cannot be chosen.
 */
export function MoveForm({
  admissionId,
  patientId,
  beds,
  device,
}: {
  admissionId: number;
  patientId: number;
  beds: FreeBedView[];
  device: Device | null;
}) {
  const id = useId();
  const router = useRouter();
  const hydrated = useHydrated();
  const idempotencyKey = useIdempotencyKey();
  const [notice, setNotice] = useState<FormNotice | null>(null);
  const resolver = useMemo<Resolver<MoveInput, unknown, MoveOutput>>(
    () => zodResolver(moveFormSchema),
    [],
  );
  const form = useForm<MoveInput, unknown, MoveOutput>({
    resolver,
    defaultValues: { bedId: "", rationale: "" },
  });
  const onSubmit = form.handleSubmit(async (v) => {
    setNotice(null);
    let result: Awaited<ReturnType<typeof transferPatientAction>>;
    try {
      result = await transferPatientAction({
        admissionId,
        bedId: Number(v.bedId),
        rationale: v.rationale,
        idempotencyKey,
      });
    } catch {
      setNotice(unreachable("moved"));
      return;
    }
    if (!result.ok) {
      setNotice(
        refusalNotice(result, ["bedId", "rationale"] as const, form.setError, {
          sessionEnded: sessionEnded("move the patient"),
        }),
      );
      return;
    }
    setNotice({
      kind: "success",
      text: `Moved to bed ${result.data.bed.label}, ${result.data.unit.name}. Opening the Chart…`,
    });
    router.push(`/patients/${patientId}`);
  });
  const allowed = (b: FreeBedView) => !device || b.allowedDevices.includes(device);
  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-label="Move the patient"
      data-ready={hydrated ? "true" : undefined}
      className="space-y-4 rounded-card border border-border bg-surface p-4 shadow-card"
    >
      <fieldset disabled={!hydrated} className="min-w-0 space-y-4">
        {beds.length === 0 ? (
          <p className="text-sm text-ink-muted">No bed of your units is free.</p>
        ) : (
          <Field
            id={`${id}-bedId`}
            label="Move to bed"
            hint={
              device
                ? `The order in effect uses ${DEVICE_PROFILES[device].label}; units that do not allow it are not offered.`
                : undefined
            }
            error={form.getFieldState("bedId", form.formState).error?.message}
          >
            {(d, invalid) => (
              <select
                id={`${id}-bedId`}
                className={inputClasses}
                aria-invalid={invalid}
                aria-describedby={d}
                {...form.register("bedId")}
              >
                <option value="">Choose a free bed…</option>
                {beds.map((b) => (
                  <option key={b.id} value={String(b.id)} disabled={!allowed(b)}>
                    {b.unitCode} · {b.label} ({b.unitName})
                    {allowed(b)
                      ? ""
                      : ` — ${device ? DEVICE_PROFILES[device].label : ""} not allowed`}
                  </option>
                ))}
              </select>
            )}
          </Field>
        )}
        <ReasonField
          id={`${id}-rationale`}
          label="Reason for the move"
          hint="3 to 500 characters; kept in the ledger."
          error={form.getFieldState("rationale", form.formState).error?.message}
          registration={form.register("rationale")}
        />
        <FormStatus notice={notice} />
        <Button type="submit" disabled={form.formState.isSubmitting || beds.length === 0}>
          {form.formState.isSubmitting ? "Moving…" : "Move"}
        </Button>
      </fieldset>
    </form>
  );
}

const dischargeFormSchema = z.object({
  disposition: dischargeSchema.shape.disposition,
  dischargedAt: localDateTimeSchema("Discharge time"),
  rationale: dischargeSchema.shape.rationale,
});
type DischargeInput = z.input<typeof dischargeFormSchema>;
type DischargeOutput = z.output<typeof dischargeFormSchema>;

/** Discharge: says what it will do (order discontinued, alerts resolved) before it does it. */
export function DischargeForm({
  admissionId,
  patientId,
  timeZone,
  consequences,
}: {
  admissionId: number;
  patientId: number;
  timeZone: string;
  consequences: string[];
}) {
  const id = useId();
  const router = useRouter();
  const hydrated = useHydrated();
  const idempotencyKey = useIdempotencyKey();
  const [notice, setNotice] = useState<FormNotice | null>(null);
  const resolver = useMemo<Resolver<DischargeInput, unknown, DischargeOutput>>(
    () => zodResolver(dischargeFormSchema),
    [],
  );
  const form = useForm<DischargeInput, unknown, DischargeOutput>({
    resolver,
    defaultValues: { dischargedAt: toZonedLocalInput(new Date(), timeZone), rationale: "" },
  });
  const onSubmit = form.handleSubmit(async (v) => {
    setNotice(null);
    const dischargedAt = fromZonedLocalInput(v.dischargedAt, timeZone);
    if (!dischargedAt) {
      form.setError("dischargedAt", {
        type: "client",
        message: "Discharge time must be a date and time.",
      });
      return;
    }
    let result: Awaited<ReturnType<typeof dischargePatientAction>>;
    try {
      result = await dischargePatientAction({
        admissionId,
        disposition: v.disposition,
        dischargedAt: dischargedAt.toISOString(),
        rationale: v.rationale,
        idempotencyKey,
      });
    } catch {
      setNotice(unreachable("discharged"));
      return;
    }
    if (!result.ok) {
      setNotice(
        refusalNotice(
          result,
          ["disposition", "dischargedAt", "rationale"] as const,
          form.setError,
          {
            sessionEnded: sessionEnded("discharge the patient"),
          },
        ),
      );
      return;
    }
    setNotice({ kind: "success", text: "Discharged. Opening the Chart (read-only now)…" });
    router.push(`/patients/${patientId}`);
  });
  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-label="Discharge the patient"
      data-ready={hydrated ? "true" : undefined}
      className="space-y-4 rounded-card border border-border bg-surface p-4 shadow-card"
    >
      <fieldset disabled={!hydrated} className="min-w-0 space-y-4">
        <SelectField
          form={form}
          id={id}
          name="disposition"
          label="Discharged to"
          emptyLabel="Choose…"
          options={DISPOSITIONS.map((d) => ({ value: d, label: DISPOSITION_LABELS[d] }))}
        />
        <UnitTimeField
          form={form}
          id={id}
          name="dischargedAt"
          label="Discharged at"
          timeZone={timeZone}
        />
        <ReasonField
          id={`${id}-rationale`}
          label="Note (optional)"
          hint="Up to 500 characters; kept in the ledger with the order's discontinuation."
          error={form.getFieldState("rationale", form.formState).error?.message}
          registration={form.register("rationale")}
        />
        <div className="rounded-md border border-border bg-surface-muted px-3 py-2 text-sm">
          <p className="font-medium">Discharging will:</p>
          <ul className="list-disc pl-5" data-testid="discharge-consequences">
            {consequences.map((c) => (
              <li key={c}>{c}</li>
            ))}
          </ul>
        </div>
        <FormStatus notice={notice} />
        <Button type="submit" disabled={form.formState.isSubmitting}>
          {form.formState.isSubmitting ? "Discharging…" : "Discharge"}
        </Button>
      </fieldset>
    </form>
  );
}
