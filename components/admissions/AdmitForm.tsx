"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useId, useMemo, useState } from "react";
import { useForm, useWatch, type Resolver } from "react-hook-form";
import { z } from "zod";
import {
  type FormNotice,
  FormStatus,
  fromZonedLocalInput,
  localDateTimeSchema,
  NumberField,
  refusalNotice,
  toZonedLocalInput,
  UnitTimeField,
  useHydrated,
  useIdempotencyKey,
} from "@/components/bedside/BedsideFormParts";
import { Button } from "@/components/ui/Button";
import { Field, inputClasses } from "@/components/ui/Field";
import { SelectField } from "@/components/ui/SelectField";
import { admitPatientAction } from "@/lib/admissions/actions";
import { admitSchema, patientDetailsSchema } from "@/lib/admissions/schema";

/** A free bed the form offers, with its unit's clock. */
export type FreeBed = {
  id: number;
  label: string;
  unitCode: string;
  unitName: string;
  timeZone: string;
};

// The shared schema's patient fields and messages; the bed as the select holds
// it (text), the time on the unit's clock.
const admitFormSchema = patientDetailsSchema.extend({
  bedId: z.string().regex(/^\d+$/, "Choose a free bed."),
  admittedAt: localDateTimeSchema("Admission time"),
  rationale: admitSchema.shape.rationale,
});
type FormInput = z.input<typeof admitFormSchema>;
type FormOutput = z.output<typeof admitFormSchema>;
const FIELDS = [
  "mrn",
  "familyName",
  "givenName",
  "birthDate",
  "sex",
  "heightCm",
  "weightKg",
  "bedId",
  "admittedAt",
  "rationale",
] as const;
type FieldName = (typeof FIELDS)[number];

/** Admit a new patient, or a returning one by MRN, into a free bed of the user's units. */
export function AdmitForm({ beds, bedId }: { beds: FreeBed[]; bedId?: number }) {
  const id = useId();
  const router = useRouter();
  const hydrated = useHydrated();
  const idempotencyKey = useIdempotencyKey();
  const [notice, setNotice] = useState<FormNotice | null>(null);
  const resolver = useMemo<Resolver<FormInput, unknown, FormOutput>>(
    () => zodResolver(admitFormSchema),
    [],
  );
  const firstZone = beds[0]?.timeZone ?? "UTC";
  const form = useForm<FormInput, unknown, FormOutput>({
    resolver,
    defaultValues: {
      bedId: bedId && beds.some((b) => b.id === bedId) ? String(bedId) : "",
      admittedAt: toZonedLocalInput(new Date(), firstZone),
      rationale: "",
    },
  });
  const { handleSubmit, setError, register, formState } = form;
  const bedValue = useWatch({ control: form.control, name: "bedId" });
  const chosenBed = beds.find((b) => String(b.id) === bedValue);
  const timeZone = chosenBed?.timeZone ?? firstZone;

  const onSubmit = handleSubmit(async (v) => {
    setNotice(null);
    const admittedAt = fromZonedLocalInput(v.admittedAt, timeZone);
    if (!admittedAt) {
      setError("admittedAt", {
        type: "client",
        message: "Admission time must be a date and time.",
      });
      return;
    }
    let result: Awaited<ReturnType<typeof admitPatientAction>>;
    try {
      result = await admitPatientAction({
        mrn: v.mrn,
        familyName: v.familyName,
        givenName: v.givenName,
        birthDate: v.birthDate,
        sex: v.sex,
        heightCm: v.heightCm,
        weightKg: v.weightKg,
        bedId: Number(v.bedId),
        admittedAt: admittedAt.toISOString(),
        rationale: v.rationale,
        idempotencyKey,
      });
    } catch {
      setNotice({
        kind: "error",
        text: "Tidemark could not be reached; nobody was admitted. Check the connection and try again — your entries are kept.",
      });
      return;
    }
    if (!result.ok) {
      setNotice(
        refusalNotice(result, FIELDS, setError, {
          sessionEnded:
            "Your session has ended. Sign in again in another tab, then admit; your entries are kept here.",
        }),
      );
      return;
    }
    const a = result.data;
    setNotice({
      kind: "success",
      text: `${a.name} (MRN ${a.mrn}) ${a.returning ? "re-admitted" : "admitted"} to bed ${a.bed.label}, ${a.unit.name}. Opening the Chart…`,
    });
    router.push(`/patients/${a.patientId}`);
  });

  if (beds.length === 0) {
    return (
      <p className="rounded-card border border-border bg-surface p-4 text-sm text-ink-muted">
        Every bed of your units is taken. Discharge or move a patient first, or ask an administrator
        to add a bed.
      </p>
    );
  }

  const text = (name: FieldName, label: string, props: Record<string, unknown> = {}) => {
    const fieldId = `${id}-${name}`;
    const error = form.getFieldState(name, formState).error?.message;
    return (
      <Field id={fieldId} label={label} error={error} hint={props.hint as string | undefined}>
        {(d, invalid) => (
          <input
            id={fieldId}
            className={inputClasses}
            aria-invalid={invalid}
            aria-describedby={d}
            autoComplete="off"
            type={(props.type as string | undefined) ?? "text"}
            {...register(name)}
          />
        )}
      </Field>
    );
  };

  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-label="Admit a patient"
      data-ready={hydrated ? "true" : undefined}
      className="rounded-card border border-border bg-surface p-4 shadow-card"
    >
      <fieldset disabled={!hydrated} className="min-w-0 space-y-4">
        <SelectField
          form={form}
          id={id}
          name="bedId"
          label="Bed"
          emptyLabel="Choose a free bed…"
          options={beds.map((b) => ({
            value: String(b.id),
            label: `${b.unitCode} · ${b.label} (${b.unitName})`,
          }))}
        />
        <div className="grid gap-x-4 sm:grid-cols-3">
          {text("mrn", "MRN", { hint: "A known MRN re-admits the stored patient." })}
          {text("familyName", "Family name")}
          {text("givenName", "Given name")}
          {text("birthDate", "Date of birth", { type: "date" })}
          <SelectField
            form={form}
            id={id}
            name="sex"
            label="Sex at birth"
            hint="Sets the predicted body weight."
            emptyLabel="Choose…"
            options={[
              { value: "female", label: "Female" },
              { value: "male", label: "Male" },
            ]}
          />
          <NumberField
            form={form}
            id={id}
            name="heightCm"
            label="Height (cm)"
            hint="40–250 cm; for the predicted body weight."
          />
          <NumberField
            form={form}
            id={id}
            name="weightKg"
            label="Weight (kg), optional"
            hint="0.5–400 kg."
          />
          <UnitTimeField
            form={form}
            id={id}
            name="admittedAt"
            label="Admitted at"
            timeZone={timeZone}
          />
        </div>
        {text("rationale", "Reason or source (optional)", {
          hint: "E.g. from the emergency department.",
        })}
        <FormStatus notice={notice} />
        <Button type="submit" disabled={formState.isSubmitting}>
          {formState.isSubmitting ? "Admitting…" : "Admit"}
        </Button>
      </fieldset>
    </form>
  );
}
