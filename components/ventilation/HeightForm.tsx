"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useId, useMemo, useState } from "react";
import { useForm, type Resolver } from "react-hook-form";
import type { z } from "zod";
import {
  FormStatus,
  NumberField,
  refusalNotice,
  useHydrated,
  useIdempotencyKey,
  type FormNotice,
} from "@/components/bedside/BedsideFormParts";
import { Button } from "@/components/ui/Button";
import { recordHeightAction } from "@/lib/admissions/actions";
import { heightSchema } from "@/lib/admissions/schema";

const formSchema = heightSchema.pick({ heightCm: true });
type FormInput = z.input<typeof formSchema>;
type FormOutput = z.output<typeof formSchema>;

/**
 * Record the patient's height (cm): what the predicted body weight of a
 * ventilator order and check needs. Shown where a height is missing.
 */
export function HeightForm({
  patientId,
  reason,
}: {
  patientId: number;
  /** Why the height is asked for here, in one sentence. */
  reason: string;
}) {
  const id = useId();
  const router = useRouter();
  const hydrated = useHydrated();
  const idempotencyKey = useIdempotencyKey();
  const [notice, setNotice] = useState<FormNotice | null>(null);
  const resolver = useMemo<Resolver<FormInput, unknown, FormOutput>>(
    () => zodResolver(formSchema),
    [],
  );
  const form = useForm<FormInput, unknown, FormOutput>({ resolver });
  const onSubmit = form.handleSubmit(async (values) => {
    setNotice(null);
    let result: Awaited<ReturnType<typeof recordHeightAction>>;
    try {
      result = await recordHeightAction({ patientId, heightCm: values.heightCm, idempotencyKey });
    } catch {
      setNotice({
        kind: "error",
        text: "Tidemark could not be reached; the height was not saved.",
      });
      return;
    }
    if (!result.ok) {
      setNotice(
        refusalNotice(result, ["heightCm"] as const, form.setError, {
          sessionEnded: "Your session has ended. Sign in again, then record the height.",
        }),
      );
      return;
    }
    setNotice({ kind: "success", text: `Height recorded: ${result.data.heightCm} cm.` });
    router.refresh();
  });
  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-label="Record height"
      data-ready={hydrated ? "true" : undefined}
      className="rounded-card border border-overdue/40 bg-overdue-soft p-4 text-ink"
    >
      <fieldset disabled={!hydrated} className="min-w-0 space-y-2">
        <legend className="text-base font-semibold">Record height</legend>
        <p className="text-sm">{reason}</p>
        <div className="flex flex-wrap items-end gap-3">
          <div className="w-40">
            <NumberField form={form} id={id} name="heightCm" label="Height (cm)" />
          </div>
          <div className="pb-5">
            <Button type="submit" variant="secondary" disabled={form.formState.isSubmitting}>
              {form.formState.isSubmitting ? "Recording…" : "Record height"}
            </Button>
          </div>
        </div>
        <FormStatus notice={notice} />
      </fieldset>
    </form>
  );
}
