"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useFieldArray, useForm, type FieldPath, type Resolver } from "react-hook-form";
import {
  createStepTableAction,
  setStepTableActiveAction,
  updateStepTableAction,
} from "@/lib/step-tables/actions";
import { Button } from "@/components/ui/Button";
import { Field, inputClasses } from "@/components/ui/Field";
import { toNumber } from "@/lib/number-input";
import type { StepTableView } from "@/lib/step-tables/queries";
import { stepTableCreateSchema, type StepTableCreateInput } from "@/lib/step-tables/schema";

type Values = StepTableCreateInput;
const numberInput = { setValueAs: toNumber };

/** Create or edit a unit's step table; steps go from least to most support. */
export function StepTableForm({
  units,
  table,
}: {
  units: { id: number; label: string }[];
  table?: StepTableView;
}) {
  const router = useRouter();
  const [formError, setFormError] = useState<string | null>(null);
  const [saved, setSaved] = useState<string | null>(null);
  const {
    register,
    control,
    watch,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<Values>({
    resolver: zodResolver(stepTableCreateSchema) as unknown as Resolver<Values>,
    defaultValues: {
      unitId: table?.unitId ?? units[0]?.id,
      name: table?.name ?? "",
      kind: table?.kind ?? "fio2_peep",
      source: table?.source ?? "",
      rationale: "",
      rows: table?.rows.map((r) => ({
        fio2Min: r.fio2Min,
        fio2Max: r.fio2Max,
        peepMin: r.peepMin ?? undefined,
        peepMax: r.peepMax ?? undefined,
        flow: r.flow ?? undefined,
      })) ?? [
        { fio2Min: 0.3, fio2Max: 0.3, peepMin: 5, peepMax: 5 },
        { fio2Min: 0.4, fio2Max: 0.4, peepMin: 8, peepMax: 8 },
      ],
    },
  });
  const { fields, append, remove, move } = useFieldArray({ control, name: "rows" });
  const kind = watch("kind");

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    setSaved(null);
    const result = table
      ? await updateStepTableAction({ ...values, id: table.id, version: table.version })
      : await createStepTableAction(values);
    if (!result.ok) {
      setFormError(result.message);
      for (const [path, messages] of Object.entries(result.fieldErrors ?? {})) {
        setError(path as FieldPath<Values>, { type: "server", message: messages.join(" ") });
      }
      return;
    }
    if (!table) router.push(`/admin/step-tables/${result.data.id}`);
    else setSaved("Saved. Orders using this table see the new steps from now on.");
    router.refresh();
  });

  const rowError = (i: number, key: "fio2Min" | "fio2Max" | "peepMin" | "peepMax" | "flow") =>
    errors.rows?.[i]?.[key]?.message;

  return (
    <form
      onSubmit={onSubmit}
      noValidate
      className="space-y-4 rounded-card border border-border bg-surface p-5 shadow-card"
    >
      <div className="grid gap-x-4 sm:grid-cols-2">
        <Field id="name" label="Name" error={errors.name?.message}>
          {(d, invalid) => (
            <input
              id="name"
              className={inputClasses}
              aria-invalid={invalid}
              aria-describedby={d}
              {...register("name")}
            />
          )}
        </Field>
        <Field id="unitId" label="Unit" error={errors.unitId?.message}>
          {(d, invalid) => (
            <select
              id="unitId"
              className={inputClasses}
              aria-invalid={invalid}
              aria-describedby={d}
              {...register("unitId", { valueAsNumber: true })}
            >
              {units.map((u) => (
                <option key={u.id} value={u.id}>
                  {u.label}
                </option>
              ))}
            </select>
          )}
        </Field>
        <Field id="kind" label="Kind" error={errors.kind?.message}>
          {(d, invalid) => (
            <select
              id="kind"
              className={inputClasses}
              aria-invalid={invalid}
              aria-describedby={d}
              {...register("kind")}
            >
              <option value="fio2_peep">FiO2 with PEEP (ventilation, CPAP)</option>
              <option value="flow_fio2">Flow with FiO2 (high-flow)</option>
            </select>
          )}
        </Field>
        <Field id="source" label="Source or protocol (optional)" error={errors.source?.message}>
          {(d, invalid) => (
            <input
              id="source"
              className={inputClasses}
              aria-invalid={invalid}
              aria-describedby={d}
              {...register("source")}
            />
          )}
        </Field>
      </div>

      <fieldset className="space-y-2">
        <legend className="text-sm font-medium">Steps, least to most support</legend>
        {errors.rows?.message ? (
          <p className="text-xs font-medium text-below">{errors.rows.message}</p>
        ) : null}
        <ol className="space-y-2">
          {fields.map((f, i) => (
            <li
              key={f.id}
              className="flex flex-wrap items-start gap-2 rounded-md border border-border p-2"
              aria-label={`Step ${i + 1}`}
            >
              <span className="tabular w-14 pt-7 text-sm font-medium">Step {i + 1}</span>
              <div className="w-28">
                <Field id={`rows-${i}-fio2Min`} label="FiO2" error={rowError(i, "fio2Min")}>
                  {(d, invalid) => (
                    <input
                      id={`rows-${i}-fio2Min`}
                      inputMode="decimal"
                      className={inputClasses}
                      aria-invalid={invalid}
                      aria-describedby={d}
                      {...register(`rows.${i}.fio2Min`, numberInput)}
                    />
                  )}
                </Field>
              </div>
              <div className="w-28">
                <Field id={`rows-${i}-fio2Max`} label="FiO2 up to" error={rowError(i, "fio2Max")}>
                  {(d, invalid) => (
                    <input
                      id={`rows-${i}-fio2Max`}
                      inputMode="decimal"
                      className={inputClasses}
                      aria-invalid={invalid}
                      aria-describedby={d}
                      {...register(`rows.${i}.fio2Max`, numberInput)}
                    />
                  )}
                </Field>
              </div>
              {kind === "fio2_peep" ? (
                <>
                  <div className="w-28">
                    <Field id={`rows-${i}-peepMin`} label="PEEP" error={rowError(i, "peepMin")}>
                      {(d, invalid) => (
                        <input
                          id={`rows-${i}-peepMin`}
                          inputMode="decimal"
                          className={inputClasses}
                          aria-invalid={invalid}
                          aria-describedby={d}
                          {...register(`rows.${i}.peepMin`, numberInput)}
                        />
                      )}
                    </Field>
                  </div>
                  <div className="w-28">
                    <Field
                      id={`rows-${i}-peepMax`}
                      label="PEEP up to"
                      error={rowError(i, "peepMax")}
                    >
                      {(d, invalid) => (
                        <input
                          id={`rows-${i}-peepMax`}
                          inputMode="decimal"
                          className={inputClasses}
                          aria-invalid={invalid}
                          aria-describedby={d}
                          {...register(`rows.${i}.peepMax`, numberInput)}
                        />
                      )}
                    </Field>
                  </div>
                </>
              ) : (
                <div className="w-28">
                  <Field id={`rows-${i}-flow`} label="Flow (L/min)" error={rowError(i, "flow")}>
                    {(d, invalid) => (
                      <input
                        id={`rows-${i}-flow`}
                        inputMode="decimal"
                        className={inputClasses}
                        aria-invalid={invalid}
                        aria-describedby={d}
                        {...register(`rows.${i}.flow`, numberInput)}
                      />
                    )}
                  </Field>
                </div>
              )}
              <div className="flex gap-1 pt-6">
                <Button
                  variant="ghost"
                  onClick={() => move(i, i - 1)}
                  disabled={i === 0}
                  aria-label={`Move step ${i + 1} up`}
                >
                  ↑
                </Button>
                <Button
                  variant="ghost"
                  onClick={() => move(i, i + 1)}
                  disabled={i === fields.length - 1}
                  aria-label={`Move step ${i + 1} down`}
                >
                  ↓
                </Button>
                <Button
                  variant="ghost"
                  onClick={() => remove(i)}
                  disabled={fields.length <= 2}
                  aria-label={`Remove step ${i + 1}`}
                >
                  Remove
                </Button>
              </div>
            </li>
          ))}
        </ol>
        <Button
          variant="secondary"
          onClick={() =>
            append({
              fio2Min: 0.5,
              fio2Max: 0.5,
              ...(kind === "fio2_peep" ? { peepMin: 10, peepMax: 10 } : { flow: 50 }),
            })
          }
          disabled={fields.length >= 40}
        >
          Add step
        </Button>
      </fieldset>

      <Field
        id="rationale"
        label="Reason for the change (recorded in the ledger)"
        error={errors.rationale?.message}
      >
        {(d, invalid) => (
          <input
            id="rationale"
            className={inputClasses}
            aria-invalid={invalid}
            aria-describedby={d}
            {...register("rationale")}
          />
        )}
      </Field>
      <div className="flex flex-wrap items-center gap-3">
        <Button type="submit" disabled={isSubmitting}>
          {isSubmitting ? "Saving…" : table ? "Save table" : "Create table"}
        </Button>
        <p role="status" aria-live="polite" className="text-sm">
          {formError ? <span className="font-medium text-below">{formError}</span> : null}
          {saved ? <span className="text-in-band">{saved}</span> : null}
        </p>
      </div>
    </form>
  );
}

/** Retire or restore a unit table, with a reason for the ledger. */
export function StepTableActiveToggle({ table }: { table: StepTableView }) {
  const router = useRouter();
  const [reason, setReason] = useState("");
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const submit = async (e: React.FormEvent) => {
    e.preventDefault();
    setBusy(true);
    const result = await setStepTableActiveAction({
      id: table.id,
      version: table.version,
      active: !table.active,
      rationale: reason,
    });
    setBusy(false);
    if (!result.ok) {
      setError(result.fieldErrors?.rationale?.join(" ") ?? result.message);
      return;
    }
    setError(null);
    setReason("");
    router.refresh();
  };
  return (
    <form
      onSubmit={submit}
      noValidate
      className="flex flex-wrap items-end gap-3 rounded-card border border-border bg-surface p-4 shadow-card"
    >
      <div className="min-w-64 flex-1">
        <Field
          id="active-reason"
          label={table.active ? "Reason to retire this table" : "Reason to restore this table"}
          error={error ?? undefined}
        >
          {(d, invalid) => (
            <input
              id="active-reason"
              value={reason}
              onChange={(e) => setReason(e.target.value)}
              className={inputClasses}
              aria-invalid={invalid}
              aria-describedby={d}
            />
          )}
        </Field>
      </div>
      <Button
        type="submit"
        variant={table.active ? "danger" : "secondary"}
        disabled={busy}
        className="mb-5"
      >
        {table.active ? "Retire table" : "Restore table"}
      </Button>
    </form>
  );
}
