"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useId, useState } from "react";
import { useForm } from "react-hook-form";
import { useSWRConfig } from "swr";
import { acknowledgeAlertAction, resolveAlertAction } from "@/lib/alerts/actions";
import { ALERT_SUMMARY_URL } from "@/components/shell/AlertBell";
import { Button } from "@/components/ui/Button";
import { Field, inputClasses } from "@/components/ui/Field";
import type { ActionResult } from "@/lib/action-result";
import { acknowledgeSchema, resolveSchema } from "@/lib/alerts/schema";

const ackForm = acknowledgeSchema.pick({ note: true });
const resolveForm = resolveSchema.pick({ reason: true });

type Outcome = { ok: boolean; message: string } | null;

/**
 * Acknowledge (with an optional note) and close-with-reason for one alert.
 * What was typed stays when the server refuses; the header count and the
 * list refresh after either step.
 */
export function AlertActions({
  alertId,
  canAcknowledge,
  suggestedReason,
  onDone,
}: {
  alertId: number;
  canAcknowledge: boolean;
  /** A reason to start from (an in-band spot check recorded on the alert); editable. */
  suggestedReason?: string;
  onDone: () => void;
}) {
  const id = useId();
  const { mutate } = useSWRConfig();
  const [outcome, setOutcome] = useState<Outcome>(null);
  const ack = useForm<{ note?: string }>({
    resolver: zodResolver(ackForm),
    defaultValues: { note: "" },
  });
  const close = useForm<{ reason: string }>({
    resolver: zodResolver(resolveForm),
    defaultValues: { reason: suggestedReason ?? "" },
  });

  async function finish<T>(
    call: () => Promise<ActionResult<T>>,
    form: { setError: (name: never, error: { type: string; message: string }) => void },
    done: string,
  ) {
    setOutcome(null);
    let result: ActionResult<T>;
    try {
      result = await call();
    } catch {
      setOutcome({
        ok: false,
        message: "Tidemark could not be reached. Nothing was changed; try again.",
      });
      return;
    }
    if (result.ok) {
      setOutcome({ ok: true, message: done });
      void mutate(ALERT_SUMMARY_URL);
      onDone();
      return;
    }
    for (const [path, messages] of Object.entries(result.fieldErrors ?? {}))
      form.setError(path as never, { type: "server", message: messages.join(" ") });
    setOutcome({ ok: false, message: result.message });
  }

  const onAcknowledge = ack.handleSubmit((values) =>
    finish(() => acknowledgeAlertAction({ alertId, ...values }), ack, "Acknowledged."),
  );
  const onClose = close.handleSubmit((values) =>
    finish(() => resolveAlertAction({ alertId, ...values }), close, "Closed."),
  );

  return (
    <div className="mt-3 grid gap-3 md:grid-cols-2">
      {canAcknowledge ? (
        <form
          onSubmit={onAcknowledge}
          noValidate
          aria-label={`Acknowledge alert ${alertId}`}
          className="flex items-start gap-2"
        >
          <div className="min-w-0 flex-1">
            <Field
              id={`${id}-note`}
              label="Note (optional)"
              hint="What you are doing about it; kept in the ledger."
              error={ack.formState.errors.note?.message}
            >
              {(d, invalid) => (
                <input
                  id={`${id}-note`}
                  className={inputClasses}
                  aria-invalid={invalid}
                  aria-describedby={d}
                  {...ack.register("note")}
                />
              )}
            </Field>
          </div>
          {/* Level with the input: the label above it is one line of text-sm. */}
          <Button type="submit" className="mt-6 shrink-0" disabled={ack.formState.isSubmitting}>
            {ack.formState.isSubmitting ? "Acknowledging…" : "Acknowledge"}
          </Button>
        </form>
      ) : null}
      <details className="self-start rounded-md border border-border p-2">
        <summary className="cursor-pointer text-sm font-medium">Close with a reason…</summary>
        <form
          onSubmit={onClose}
          noValidate
          aria-label={`Close alert ${alertId}`}
          className="mt-2 space-y-2"
        >
          <Field
            id={`${id}-reason`}
            label="Reason"
            hint="For example: probe artefact, rechecked; palliative goals. 3 to 500 characters."
            error={close.formState.errors.reason?.message}
          >
            {(d, invalid) => (
              <input
                id={`${id}-reason`}
                className={inputClasses}
                aria-invalid={invalid}
                aria-describedby={d}
                {...close.register("reason")}
              />
            )}
          </Field>
          <Button type="submit" variant="secondary" disabled={close.formState.isSubmitting}>
            {close.formState.isSubmitting ? "Closing…" : "Close alert"}
          </Button>
        </form>
      </details>
      <p role="status" aria-live="polite" className="text-sm md:col-span-2">
        {outcome ? (
          <span className={outcome.ok ? "text-in-band" : "font-medium text-below"}>
            {outcome.message}
          </span>
        ) : null}
      </p>
    </div>
  );
}
