"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm, type Resolver } from "react-hook-form";
import { useHydrated } from "@/components/bedside/BedsideFormParts";
import { Button } from "@/components/ui/Button";
import { EmptyState } from "@/components/ui/EmptyState";
import { Field, inputClasses } from "@/components/ui/Field";
import { StatusBadge } from "@/components/ui/StatusBadge";
import type { ActionResult } from "@/lib/action-result";
import { createBedAction, updateBedAction } from "@/lib/units/actions";
import type { BedView } from "@/lib/units/queries";
import { bedCreateSchema } from "@/lib/units/schema";

type Message = { kind: "error" | "ok"; text: string };

/** Server refusals name the field; the table shows the first message in words. */
function refusalText(result: Extract<ActionResult<unknown>, { ok: false }>): string {
  const first = Object.values(result.fieldErrors ?? {})[0]?.[0];
  return first && first !== result.message && result.message.startsWith("Some fields")
    ? first
    : result.message;
}

/**
 * A unit's beds: add one inline, rename, retire or restore. A bed with a
 * patient in it is refused retirement by the server, and the refusal is shown
 * above the table in words.
 */
export function BedsTable({
  unitId,
  unitCode,
  beds,
}: {
  unitId: number;
  unitCode: string;
  beds: BedView[];
}) {
  const router = useRouter();
  const hydrated = useHydrated();
  const [message, setMessage] = useState<Message | null>(null);
  const [busyBed, setBusyBed] = useState<number | null>(null);
  const [renaming, setRenaming] = useState<number | null>(null);

  async function change(bed: BedView, patch: { label?: string; active?: boolean }) {
    setBusyBed(bed.id);
    setMessage(null);
    const result = await updateBedAction({ unitId, bedId: bed.id, ...patch });
    setBusyBed(null);
    if (!result.ok) {
      setMessage({ kind: "error", text: refusalText(result) });
      return false;
    }
    const what =
      patch.label !== undefined
        ? `Bed ${bed.label} is now ${result.data.label}.`
        : result.data.active
          ? `Bed ${bed.label} restored.`
          : `Bed ${bed.label} retired.`;
    setMessage({ kind: "ok", text: what });
    router.refresh();
    return true;
  }

  const active = beds.filter((b) => b.active).length;
  return (
    <div className="space-y-3">
      <AddBedForm
        unitId={unitId}
        unitCode={unitCode}
        hydrated={hydrated}
        onAdded={(label) => {
          setMessage({ kind: "ok", text: `Bed ${label} added.` });
          router.refresh();
        }}
      />
      <div aria-live="polite" role={message?.kind === "error" ? "alert" : "status"}>
        {message ? (
          <p
            data-testid="beds-message"
            className={
              message.kind === "error"
                ? "rounded-md border border-below bg-below-soft px-3 py-2 text-sm font-medium text-below"
                : "text-sm text-in-band"
            }
          >
            {message.text}
          </p>
        ) : null}
      </div>
      {beds.length === 0 ? (
        <EmptyState title={`${unitCode} has no beds yet`}>
          Add the first bed above; patients are admitted to beds.
        </EmptyState>
      ) : (
        <div className="overflow-x-auto rounded-card border border-border bg-surface shadow-card">
          <table className="w-full text-left text-sm" data-testid="beds-table">
            <caption className="sr-only">
              Beds of {unitCode}: {active} in use, {beds.length - active} retired
            </caption>
            <thead className="border-b border-border bg-surface-muted text-xs tracking-wide text-ink-muted">
              <tr>
                <th scope="col" className="px-3 py-2">
                  Bed
                </th>
                <th scope="col" className="px-3 py-2">
                  Status
                </th>
                <th scope="col" className="px-3 py-2">
                  <span className="sr-only">Actions</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {beds.map((bed) => (
                <tr
                  key={bed.id}
                  data-testid={`bed-${bed.label}`}
                  className="border-b border-border last:border-0"
                >
                  <th scope="row" className="px-3 py-2 font-medium">
                    {renaming === bed.id ? (
                      <RenameField
                        bed={bed}
                        disabled={busyBed === bed.id}
                        onCancel={() => setRenaming(null)}
                        onSave={async (label) => {
                          if (await change(bed, { label })) setRenaming(null);
                        }}
                      />
                    ) : (
                      bed.label
                    )}
                  </th>
                  <td className="px-3 py-2">
                    {!bed.active ? (
                      <StatusBadge status="neutral" label="Retired" />
                    ) : bed.occupant ? (
                      <span>
                        <StatusBadge status="in-band" label="Occupied" />{" "}
                        <span className="text-ink-muted">
                          {bed.occupant.name} (MRN {bed.occupant.mrn})
                        </span>
                      </span>
                    ) : (
                      <StatusBadge status="neutral" label="Empty" />
                    )}
                  </td>
                  <td className="px-3 py-2">
                    <div className="flex justify-end gap-2">
                      {renaming === bed.id ? null : (
                        <Button
                          variant="secondary"
                          disabled={!hydrated || busyBed === bed.id}
                          onClick={() => setRenaming(bed.id)}
                          aria-label={`Rename bed ${bed.label}`}
                        >
                          Rename
                        </Button>
                      )}
                      {bed.active ? (
                        <Button
                          variant="danger"
                          disabled={!hydrated || busyBed === bed.id}
                          onClick={() => void change(bed, { active: false })}
                          aria-label={`Retire bed ${bed.label}`}
                        >
                          Retire
                        </Button>
                      ) : (
                        <Button
                          variant="secondary"
                          disabled={!hydrated || busyBed === bed.id}
                          onClick={() => void change(bed, { active: true })}
                          aria-label={`Restore bed ${bed.label}`}
                        >
                          Restore
                        </Button>
                      )}
                    </div>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </div>
  );
}

type AddValues = { unitId: number; label: string };

function AddBedForm({
  unitId,
  unitCode,
  hydrated,
  onAdded,
}: {
  unitId: number;
  unitCode: string;
  hydrated: boolean;
  onAdded: (label: string) => void;
}) {
  const {
    register,
    handleSubmit,
    setError,
    reset,
    setFocus,
    formState: { errors, isSubmitting },
  } = useForm<AddValues>({
    resolver: zodResolver(bedCreateSchema) as unknown as Resolver<AddValues>,
    defaultValues: { unitId, label: "" },
  });
  const onSubmit = handleSubmit(async (values) => {
    const result = await createBedAction(values);
    if (!result.ok) {
      setError("label", { type: "server", message: refusalText(result) });
      setFocus("label");
      return;
    }
    reset({ unitId, label: "" });
    setFocus("label");
    onAdded(result.data.label);
  });
  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-label={`Add a bed to ${unitCode}`}
      data-ready={hydrated ? "true" : undefined}
      className="flex flex-wrap items-start gap-3"
    >
      <fieldset disabled={!hydrated} className="flex min-w-0 flex-wrap items-start gap-3">
        <div className="w-48">
          <Field
            id="new-bed-label"
            label="New bed label"
            hint="1 to 16 characters, unique in the unit."
            error={errors.label?.message}
          >
            {(d, invalid) => (
              <input
                id="new-bed-label"
                autoComplete="off"
                className={inputClasses}
                aria-invalid={invalid}
                aria-describedby={d}
                {...register("label")}
              />
            )}
          </Field>
        </div>
        <Button type="submit" className="mt-6" disabled={isSubmitting}>
          {isSubmitting ? "Adding…" : "Add bed"}
        </Button>
      </fieldset>
    </form>
  );
}

/** The inline rename: Enter saves, Escape cancels. */
function RenameField({
  bed,
  disabled,
  onSave,
  onCancel,
}: {
  bed: BedView;
  disabled: boolean;
  onSave: (label: string) => Promise<void>;
  onCancel: () => void;
}) {
  const [value, setValue] = useState(bed.label);
  const trimmed = value.trim();
  const error =
    trimmed.length < 1 || trimmed.length > 16 ? "Bed label must be 1 to 16 characters." : null;
  const inputId = `rename-bed-${bed.id}`;
  return (
    <form
      className="flex flex-wrap items-center gap-2"
      onSubmit={(e) => {
        e.preventDefault();
        if (!error) void onSave(trimmed);
      }}
    >
      <label htmlFor={inputId} className="sr-only">
        New label for bed {bed.label}
      </label>
      <input
        id={inputId}
        // The rename was asked for by a button: the field takes the focus.
        autoFocus
        value={value}
        disabled={disabled}
        onChange={(e) => setValue(e.target.value)}
        onKeyDown={(e) => {
          if (e.key === "Escape") onCancel();
        }}
        aria-invalid={Boolean(error)}
        aria-describedby={error ? `${inputId}-error` : undefined}
        className={`${inputClasses} w-32`}
      />
      <Button type="submit" disabled={disabled || Boolean(error)}>
        Save
      </Button>
      <Button variant="ghost" onClick={onCancel}>
        Cancel
      </Button>
      {error ? (
        <p id={`${inputId}-error`} className="w-full text-xs font-medium text-below">
          {error}
        </p>
      ) : null}
    </form>
  );
}
