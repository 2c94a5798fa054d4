"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm, type Resolver } from "react-hook-form";
import { useHydrated } from "@/components/bedside/BedsideFormParts";
import { Button } from "@/components/ui/Button";
import { inputClasses } from "@/components/ui/Field";
import { setAssignmentsAction } from "@/lib/assignments/actions";
import type { AssignmentGrid as Grid } from "@/lib/assignments/queries";
import {
  assignmentWriteSchema,
  DUTIES,
  type AssignmentWriteInput,
  type Duty,
} from "@/lib/assignments/schema";

const DUTY_LABELS: Record<Duty, string> = {
  nurse: "Nurse",
  therapist: "Therapist",
  physician: "Physician",
};

type Values = AssignmentWriteInput & {
  chargeNurseId: number | null;
  cells: { bedId: number; duty: Duty; userId: number | null }[];
};

const toId = (v: unknown) => (v === "" || v === null || v === undefined ? null : Number(v));

/** The form's cells: one per bed and duty, in the table's order. */
function initialCells(grid: Grid): Values["cells"] {
  return grid.beds.flatMap((b) =>
    DUTIES.map((duty) => ({ bedId: b.id, duty, userId: b.cells[duty]?.userId ?? null })),
  );
}

/**
 * One shift's beds × duties. Editable: a native select per cell (keyboard
 * friendly), the charge nurse, "Copy from previous shift" (fills empty cells
 * in the form, to review before saving) and one bulk save of the changed cells.
 * Read-only: the names.
 */
export function AssignmentGrid({ grid }: { grid: Grid }) {
  const router = useRouter();
  const hydrated = useHydrated();
  const [formError, setFormError] = useState<string | null>(null);
  const [status, setStatus] = useState<string | null>(null);
  const initial = initialCells(grid);
  const initialCharge = grid.charge?.userId ?? null;
  const {
    register,
    handleSubmit,
    setValue,
    getValues,
    setError,
    reset,
    formState: { errors, isSubmitting, isDirty },
  } = useForm<Values>({
    resolver: zodResolver(assignmentWriteSchema) as unknown as Resolver<Values>,
    defaultValues: {
      unitId: grid.unit.id,
      // The exact start, so a page left open past the change of shift cannot write the new one by mistake.
      shift: grid.shift.startsAt,
      chargeNurseId: initialCharge,
      cells: initial,
    },
  });

  const copyPrevious = () => {
    setStatus(null);
    let filled = 0;
    getValues("cells").forEach((cell, i) => {
      if (cell.userId !== null) return;
      const source = grid.previous.cells.find(
        (c) => c.bedId === cell.bedId && c.duty === cell.duty,
      );
      if (source && grid.candidates[cell.duty].some((c) => c.id === source.userId)) {
        setValue(`cells.${i}.userId`, source.userId, { shouldDirty: true });
        filled += 1;
      }
    });
    const charge = grid.previous.chargeNurseId;
    if (
      getValues("chargeNurseId") === null &&
      charge !== null &&
      grid.candidates.nurse.some((c) => c.id === charge)
    ) {
      setValue("chargeNurseId", charge, { shouldDirty: true });
      filled += 1;
    }
    setStatus(
      filled
        ? `Filled ${filled} empty ${filled === 1 ? "cell" : "cells"} from the previous shift. Review, then save.`
        : "The previous shift has nobody still on the unit for the empty cells.",
    );
  };

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    setStatus(null);
    // Only the changed cells go out, so two people editing different beds do not overwrite each other.
    const sent = values.cells
      .map((cell, index) => ({ cell, index }))
      .filter(({ cell, index }) => cell.userId !== initial[index]!.userId);
    const chargeChanged = values.chargeNurseId !== initialCharge;
    if (sent.length === 0 && !chargeChanged) {
      setStatus("Nothing to save: no cell was changed.");
      return;
    }
    // From the grid, not the resolver's output (which holds the shift as a Date).
    let result: Awaited<ReturnType<typeof setAssignmentsAction>>;
    try {
      result = await setAssignmentsAction({
        unitId: grid.unit.id,
        shift: grid.shift.startsAt,
        cells: sent.map(({ cell }) => cell),
        ...(chargeChanged ? { chargeNurseId: values.chargeNurseId } : {}),
      });
    } catch {
      setFormError(
        "Tidemark could not be reached; nothing was saved. Check the connection and save again — your choices are kept.",
      );
      return;
    }
    if (!result.ok) {
      // Errors of a cell or the charge nurse land beside it; any other (the shift) in the message.
      const elsewhere: string[] = [];
      for (const [path, messages] of Object.entries(result.fieldErrors ?? {})) {
        const m = /^cells\.(\d+)\.\w+$/.exec(path);
        const index = m ? sent[Number(m[1])]?.index : undefined;
        const message = messages.join(" ");
        if (index !== undefined) setError(`cells.${index}.userId`, { type: "server", message });
        else if (path === "chargeNurseId") setError("chargeNurseId", { type: "server", message });
        else if (message !== result.message) elsewhere.push(message);
      }
      setFormError([result.message, ...elsewhere].join(" "));
      return;
    }
    setStatus(
      `Saved: ${result.data.changed} ${result.data.changed === 1 ? "change" : "changes"} to the ${grid.unit.code} shift.`,
    );
    reset(values);
    router.refresh();
  });

  const nameOf = (person: { name: string } | null) =>
    person ? person.name : <span className="text-ink-muted">Nobody</span>;

  return (
    <form
      onSubmit={onSubmit}
      noValidate
      data-ready={hydrated ? "true" : undefined}
      className="space-y-4"
      aria-label={`Assignments of ${grid.unit.code}`}
    >
      <p
        className={`text-sm ${grid.editable ? "text-ink" : "text-ink-muted"}`}
        data-testid="edit-why"
      >
        {grid.editWhy}
      </p>
      <fieldset disabled={!hydrated || isSubmitting} className="min-w-0 space-y-4">
        <div className="flex flex-col gap-1 sm:max-w-sm">
          <label htmlFor="charge-nurse" className="text-sm font-medium text-ink">
            Charge nurse
          </label>
          {grid.editable ? (
            <select
              id="charge-nurse"
              className={inputClasses}
              aria-invalid={Boolean(errors.chargeNurseId)}
              aria-describedby={errors.chargeNurseId ? "charge-nurse-error" : undefined}
              {...register("chargeNurseId", { setValueAs: toId })}
            >
              <option value="">Nobody</option>
              {grid.candidates.nurse.map((c) => (
                <option key={c.id} value={c.id}>
                  {c.name}
                </option>
              ))}
            </select>
          ) : (
            <p id="charge-nurse" className="text-base">
              {nameOf(grid.charge)}
            </p>
          )}
          <p id="charge-nurse-error" className="min-h-4 text-xs font-medium text-below">
            {errors.chargeNurseId?.message ?? ""}
          </p>
        </div>

        {/* Above the table, so a long grid does not hide Save from the keyboard. */}
        {grid.editable ? (
          <div className="flex flex-wrap items-center gap-2">
            <Button variant="secondary" onClick={copyPrevious}>
              Copy from previous shift
            </Button>
            <Button type="submit" disabled={isSubmitting}>
              {isSubmitting ? "Saving…" : "Save"}
            </Button>
            {isDirty ? <span className="text-sm text-ink-muted">Unsaved changes</span> : null}
          </div>
        ) : null}
        <p role="status" aria-live="polite" className="min-h-5 text-sm">
          {formError ? <span className="font-medium text-below">{formError}</span> : status}
        </p>
        {grid.beds.length === 0 ? (
          <p className="text-sm text-ink-muted">This unit has no active beds.</p>
        ) : (
          <div className="overflow-x-auto rounded-card border border-border bg-surface shadow-card">
            <table className="w-full text-left text-sm">
              <caption className="sr-only">
                Beds and who looks after each in this shift, by duty
              </caption>
              <thead className="border-b border-border bg-surface-muted">
                <tr>
                  <th scope="col" className="px-3 py-2 font-medium">
                    Bed
                  </th>
                  {DUTIES.map((duty) => (
                    <th key={duty} scope="col" className="px-3 py-2 font-medium">
                      {DUTY_LABELS[duty]}
                    </th>
                  ))}
                </tr>
              </thead>
              <tbody>
                {grid.beds.map((bed, b) => (
                  <tr key={bed.id} className="border-b border-border last:border-0">
                    <th scope="row" className="px-3 py-2 align-top font-medium">
                      {bed.label}
                      <span className="block text-xs font-normal text-ink-muted">
                        {bed.occupant ? bed.occupant.initials : "Empty"}
                      </span>
                    </th>
                    {DUTIES.map((duty, d) => {
                      const i = b * DUTIES.length + d;
                      const id = `cell-${bed.id}-${duty}`;
                      const error = errors.cells?.[i]?.userId?.message;
                      return (
                        <td key={duty} className="px-3 py-2 align-top">
                          {grid.editable ? (
                            <>
                              <label htmlFor={id} className="sr-only">
                                {`${bed.label} ${DUTY_LABELS[duty].toLowerCase()}`}
                              </label>
                              <select
                                id={id}
                                className={inputClasses}
                                aria-invalid={Boolean(error)}
                                aria-describedby={error ? `${id}-error` : undefined}
                                {...register(`cells.${i}.userId`, { setValueAs: toId })}
                              >
                                <option value="">Nobody</option>
                                {grid.candidates[duty].map((c) => (
                                  <option key={c.id} value={c.id}>
                                    {c.name}
                                  </option>
                                ))}
                              </select>
                              {error ? (
                                <p id={`${id}-error`} className="text-xs font-medium text-below">
                                  {error}
                                </p>
                              ) : null}
                            </>
                          ) : (
                            <span data-cell={id}>{nameOf(bed.cells[duty])}</span>
                          )}
                        </td>
                      );
                    })}
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </fieldset>
    </form>
  );
}
