"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useId, useState } from "react";
import { useForm, type FieldPath } from "react-hook-form";
import {
  FormStatus,
  NumberField,
  refusalNotice,
  useHydrated,
  type FormNotice,
} from "@/components/bedside/BedsideFormParts";
import { Button } from "@/components/ui/Button";
import { Field, inputClasses } from "@/components/ui/Field";
import { SelectField } from "@/components/ui/SelectField";
import { toNumber } from "@/lib/number-input";
import { DEFAULT_HFNC_OPTION, NUMBER_SETTINGS, SETTING_GROUPS } from "@/lib/rehearsal/labels";
import {
  rehearsalCreateSchema,
  type RehearsalCreateData,
  type RehearsalCreateInput,
} from "@/lib/rehearsal/schema";
import type { RehearsalView } from "@/lib/rehearsal/views";
import { postRehearsal } from "./rehearsal-request";

type Values = RehearsalCreateInput;
export type TableOption = { id: number; name: string };

const FIELDS = Object.keys(rehearsalCreateSchema.shape) as FieldPath<Values>[];
const numberOf = (v: unknown) => (typeof v === "number" ? v : undefined);

/**
 * "New run": the protocol, the alert settings, the response times and the
 * cohort, checked by the same schema as the server (rehearsalCreateSchema).
 * A refusal from the server lands beside its field; what was typed stays.
 * On 202 the page selects the new run and shows its progress.
 */
export function RehearsalForm({
  defaults,
  ventilatedTables,
  hfncTables,
  onQueued,
}: {
  defaults: RehearsalCreateInput;
  /** The unit's FiO2/PEEP tables: the published ones and its own. */
  ventilatedTables: TableOption[];
  /** The unit's flow/FiO2 tables (the default ladder is the empty choice). */
  hfncTables: TableOption[];
  onQueued: (run: RehearsalView) => void;
}) {
  const id = useId();
  const hydrated = useHydrated();
  const [notice, setNotice] = useState<FormNotice | null>(null);
  const form = useForm<Values, unknown, RehearsalCreateData>({
    resolver: zodResolver(rehearsalCreateSchema),
    defaultValues: defaults,
  });
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = form;

  const onSubmit = handleSubmit(async (values) => {
    setNotice(null);
    const result = await postRehearsal(values);
    if (!result.ok) {
      setNotice(
        refusalNotice(result, FIELDS, setError, {
          sessionEnded: "Your session has ended. Sign in again; your values are kept here.",
        }),
      );
      return;
    }
    setNotice({
      kind: "success",
      text: `Run #${result.rehearsal.id} “${result.rehearsal.label}” is queued; its progress is shown below.`,
    });
    onQueued(result.rehearsal);
  });

  const labelId = `${id}-label`;
  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-labelledby={`${id}-heading`}
      data-ready={hydrated ? "true" : undefined}
      className="space-y-4 rounded-card border border-border bg-surface p-4 shadow-card print:hidden"
    >
      <h2 id={`${id}-heading`} className="text-lg font-semibold">
        New run
      </h2>
      <fieldset disabled={!hydrated} className="min-w-0 space-y-4">
        {SETTING_GROUPS.map((group) => (
          <fieldset
            key={group.key}
            className="grid min-w-0 grid-cols-1 gap-x-3 sm:grid-cols-2 lg:grid-cols-4"
          >
            <legend className="mb-1 text-sm font-semibold">{group.legend}</legend>
            {group.key === "protocol" ? (
              <>
                <div className="sm:col-span-2">
                  <Field id={labelId} label="Name of the run" error={errors.label?.message}>
                    {(d, invalid) => (
                      <input
                        id={labelId}
                        type="text"
                        autoComplete="off"
                        maxLength={120}
                        className={inputClasses}
                        aria-invalid={invalid}
                        aria-describedby={d}
                        {...register("label")}
                      />
                    )}
                  </Field>
                </div>
                <SelectField
                  form={form}
                  id={id}
                  name="ventilatedTableId"
                  label="Ventilated patients' step table (FiO2/PEEP)"
                  options={ventilatedTables.map((t) => ({ value: String(t.id), label: t.name }))}
                  defaultValue={String(defaults.ventilatedTableId ?? "")}
                  registerOptions={{ setValueAs: toNumber }}
                />
                <SelectField
                  form={form}
                  id={id}
                  name="hfncTableId"
                  label="High-flow patients' step table (flow/FiO2)"
                  options={hfncTables.map((t) => ({ value: String(t.id), label: t.name }))}
                  emptyLabel={DEFAULT_HFNC_OPTION}
                  defaultValue=""
                  registerOptions={{ setValueAs: toNumber }}
                />
              </>
            ) : null}
            {NUMBER_SETTINGS.filter((s) => s.group === group.key).map((s) => (
              <NumberField
                key={s.name}
                form={form}
                id={id}
                name={s.name}
                label={s.label}
                hint={s.hint}
                inputMode={s.inputMode}
                defaultValue={numberOf(defaults[s.name])}
              />
            ))}
          </fieldset>
        ))}
        <p className="text-xs text-ink-muted">
          The worker runs every patient under the three care models; a large cohort (100 patients ×
          72 h) takes about half a minute. Everyone on the unit can read the results.
        </p>
        <div className="flex flex-wrap items-center gap-3">
          <Button type="submit" disabled={isSubmitting}>
            {isSubmitting ? "Queuing…" : "Run rehearsal"}
          </Button>
        </div>
        <FormStatus notice={notice} />
      </fieldset>
    </form>
  );
}
