"use client";

import { useId, useState } from "react";
import { Button } from "@/components/ui/Button";
import { Field, inputClasses } from "@/components/ui/Field";
import type { BloodGasMapping } from "@/lib/imports/csv";
import {
  BLOOD_GAS_COLUMNS,
  MEASURED_FIELDS,
  UNIT_LABELS,
  type MeasuredField,
  type UcumCode,
} from "@/lib/imports/kinds";
import type { ImportPreview } from "@/lib/imports/report";
import { send } from "./import-request";

/** The mapping step: which column holds which value, and its unit. */
export function MappingStep({
  preview,
  onChange,
}: {
  preview: ImportPreview;
  onChange: (p: ImportPreview) => void;
}) {
  const id = useId();
  const initial: BloodGasMapping = preview.mapping ?? { delimiter: ",", columns: {}, units: {} };
  const [mapping, setMapping] = useState<BloodGasMapping>(initial);
  const [busy, setBusy] = useState(false);
  const [failure, setFailure] = useState<string | null>(null);
  const errors = preview.mappingErrors ?? {};
  const header = preview.header ?? [];

  const check = async (e: React.FormEvent) => {
    e.preventDefault();
    setBusy(true);
    setFailure(null);
    const result = await send(`/api/v1/imports/${preview.id}`, {
      method: "PUT",
      headers: { "content-type": "application/json" },
      body: JSON.stringify(mapping),
    });
    setBusy(false);
    if (!result.ok) return setFailure(result.message);
    onChange(result.preview);
  };

  return (
    <form
      onSubmit={check}
      noValidate
      className="space-y-2 rounded-md border border-border p-3"
      aria-labelledby={`${id}-title`}
    >
      <h3 id={`${id}-title`} className="font-semibold">
        Columns and units
      </h3>
      <p className="text-sm text-ink-muted">
        Tidemark guessed these from the header line. Check each one; a wrong unit shows as rejected
        rows.
      </p>
      <fieldset disabled={busy} className="grid min-w-0 gap-x-4 sm:grid-cols-2 lg:grid-cols-3">
        {BLOOD_GAS_COLUMNS.map((c) => {
          const measured = c.key in MEASURED_FIELDS ? (c.key as MeasuredField) : null;
          const colError = errors[`columns.${c.key}`]?.join(" ");
          const unitError = errors[`units.${c.key}`]?.join(" ");
          return (
            <div key={c.key} className="flex gap-2">
              <div className="min-w-0 flex-1">
                <Field
                  id={`${id}-${c.key}`}
                  label={`${c.label}${c.required ? "" : " (optional)"}`}
                  error={colError}
                >
                  {(d, invalid) => (
                    <select
                      id={`${id}-${c.key}`}
                      className={inputClasses}
                      aria-invalid={invalid}
                      aria-describedby={d}
                      value={mapping.columns[c.key] ?? ""}
                      onChange={(e) =>
                        setMapping((m) => ({
                          ...m,
                          columns: { ...m.columns, [c.key]: e.target.value || undefined },
                        }))
                      }
                    >
                      <option value="">Not in the file</option>
                      {header.map((h) => (
                        <option key={h} value={h}>
                          {h}
                        </option>
                      ))}
                    </select>
                  )}
                </Field>
              </div>
              {measured && MEASURED_FIELDS[measured].units.length > 1 ? (
                <div className="w-32">
                  <Field id={`${id}-${c.key}-unit`} label="Unit" error={unitError}>
                    {(d, invalid) => (
                      <select
                        id={`${id}-${c.key}-unit`}
                        className={inputClasses}
                        aria-invalid={invalid}
                        aria-describedby={d}
                        value={
                          mapping.units[measured as keyof BloodGasMapping["units"]] ??
                          MEASURED_FIELDS[measured].units[0]
                        }
                        onChange={(e) =>
                          setMapping((m) => ({
                            ...m,
                            units: { ...m.units, [measured]: e.target.value as UcumCode },
                          }))
                        }
                      >
                        {(MEASURED_FIELDS[measured].units as readonly UcumCode[]).map((u) => (
                          <option key={u} value={u}>
                            {UNIT_LABELS[u]}
                          </option>
                        ))}
                      </select>
                    )}
                  </Field>
                </div>
              ) : null}
            </div>
          );
        })}
      </fieldset>
      <div className="flex flex-wrap items-center gap-3">
        <Button type="submit" variant="secondary" disabled={busy}>
          {busy ? "Checking…" : "Check again with these columns"}
        </Button>
        <p role="status" aria-live="polite" className="text-sm">
          {failure ? <span className="font-medium text-below">{failure}</span> : null}
        </p>
      </div>
    </form>
  );
}
