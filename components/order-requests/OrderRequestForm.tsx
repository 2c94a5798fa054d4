"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import Link from "next/link";
import { useId, useState } from "react";
import { useForm } from "react-hook-form";
import { Button } from "@/components/ui/Button";
import { Field, inputClasses } from "@/components/ui/Field";
import { sendOrderRequestAction } from "@/lib/order-requests/actions";
import { DEVICE_PROFILES } from "@/lib/devices";
import { toNumber } from "@/lib/number-input";
import {
  orderRequestSchema,
  type OrderRequestData,
  type OrderRequestInput,
} from "@/lib/order-requests/schema";
import { BASIS_LABELS } from "./labels";
import type { RequestStart } from "./request-defaults";

/**
 * Ask the responsible physician for a new order: what is needed and why,
 * prefilled from where it is asked; the settings in use and the latest SpO2
 * are attached by the server. One button sends it.
 */
export function OrderRequestForm({ start, compact }: { start: RequestStart; compact?: boolean }) {
  const id = useId();
  const [idempotencyKey] = useState(() => crypto.randomUUID());
  const [sent, setSent] = useState<string | null>(null);
  const [failure, setFailure] = useState<string | null>(null);
  const uses = start.device ? DEVICE_PROFILES[start.device].uses : null;
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<OrderRequestInput, unknown, OrderRequestData>({
    resolver: zodResolver(orderRequestSchema),
    defaultValues: { ...start, idempotencyKey },
  });

  const onSubmit = handleSubmit(async (values) => {
    setFailure(null);
    let result: Awaited<ReturnType<typeof sendOrderRequestAction>>;
    try {
      result = await sendOrderRequestAction(values);
    } catch {
      setFailure(
        "Tidemark could not be reached; nothing was sent. Try again — your words are kept.",
      );
      return;
    }
    if (!result.ok) {
      for (const [field, messages] of Object.entries(result.fieldErrors ?? {}))
        if (field === "need" || field === "reason" || field.endsWith("Max"))
          setError(field as "need", { type: "server", message: messages.join(" ") });
      setFailure(result.message);
      return;
    }
    const told = result.data.told[0] ?? [];
    setSent(
      `Request #${result.data.id} sent${
        told.length
          ? ` to ${told.map((t) => `${t.name} (${BASIS_LABELS[t.basis]})`).join(", ")}`
          : ", but nobody could be told: the unit has no physician, charge nurse or fallback address"
      }.`,
    );
  });

  if (sent)
    return (
      <p role="status" className="rounded-card border border-in-band/40 bg-surface p-3 text-sm">
        {sent}{" "}
        <Link href="/order-requests" className="text-accent underline">
          Follow it in Order requests
        </Link>
      </p>
    );

  const max = (name: "fio2Max" | "peepMax" | "flowMax", label: string) => (
    <Field id={`${id}-${name}`} label={label} error={errors[name]?.message}>
      {(describedBy, invalid) => (
        <input
          id={`${id}-${name}`}
          inputMode="decimal"
          className={inputClasses}
          aria-describedby={describedBy}
          aria-invalid={invalid}
          {...register(name, { setValueAs: toNumber })}
        />
      )}
    </Field>
  );

  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-label="Ask for a new order"
      className="space-y-3 rounded-card border border-border bg-surface p-4 shadow-card"
    >
      {compact ? null : (
        <p className="text-sm text-ink-muted">
          Goes to the physician responsible for this bed this shift (or the order&apos;s
          prescriber), with the settings in use and the latest SpO2.
        </p>
      )}
      <Field id={`${id}-need`} label="What is needed" error={errors.need?.message}>
        {(describedBy, invalid) => (
          <input
            id={`${id}-need`}
            className={inputClasses}
            aria-describedby={describedBy}
            aria-invalid={invalid}
            {...register("need")}
          />
        )}
      </Field>
      <Field id={`${id}-reason`} label="Why" error={errors.reason?.message}>
        {(describedBy, invalid) => (
          <textarea
            id={`${id}-reason`}
            rows={2}
            className={inputClasses}
            aria-describedby={describedBy}
            aria-invalid={invalid}
            {...register("reason")}
          />
        )}
      </Field>
      {uses ? (
        <div className="grid grid-cols-1 gap-3 sm:grid-cols-3">
          {uses.fio2 === "set" ? max("fio2Max", "Proposed FiO2 maximum") : null}
          {uses.peep ? max("peepMax", "Proposed PEEP maximum (cmH2O)") : null}
          {uses.flow ? max("flowMax", "Proposed flow maximum (L/min)") : null}
        </div>
      ) : null}
      <div className="flex flex-wrap items-center gap-3">
        <Button type="submit" disabled={isSubmitting}>
          {isSubmitting ? "Sending…" : "Send the request"}
        </Button>
        {failure ? (
          <p role="alert" className="text-sm font-medium text-below">
            {failure}
          </p>
        ) : null}
      </div>
    </form>
  );
}
