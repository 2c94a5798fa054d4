"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useId, useState } from "react";
import { useForm } from "react-hook-form";
import { Button } from "@/components/ui/Button";
import { Field, inputClasses } from "@/components/ui/Field";
import { replyOrderRequestAction } from "@/lib/order-requests/actions";
import {
  orderRequestReplySchema,
  type OrderRequestReplyData,
  type OrderRequestReplyInput,
} from "@/lib/order-requests/schema";

/** Answer a request without an order: the reason closes it and is sent to the requester. */
export function ReplyForm({ requestId }: { requestId: number }) {
  const id = useId();
  const router = useRouter();
  const [open, setOpen] = useState(false);
  const [failure, setFailure] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    formState: { errors, isSubmitting },
  } = useForm<OrderRequestReplyInput, unknown, OrderRequestReplyData>({
    resolver: zodResolver(orderRequestReplySchema),
    defaultValues: { requestId, reply: "" },
  });
  const onSubmit = handleSubmit(async (values) => {
    setFailure(null);
    try {
      const result = await replyOrderRequestAction(values);
      if (!result.ok) {
        setFailure(result.message);
        return;
      }
      router.refresh();
    } catch {
      setFailure("Tidemark could not be reached; nothing was sent. Try again.");
    }
  });
  if (!open)
    return (
      <Button variant="secondary" onClick={() => setOpen(true)}>
        Answer without an order…
      </Button>
    );
  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-label={`Answer request #${requestId}`}
      className="space-y-2"
    >
      <Field
        id={`${id}-reply`}
        label="Reason (sent to the requester)"
        error={errors.reply?.message}
      >
        {(describedBy, invalid) => (
          <textarea
            id={`${id}-reply`}
            rows={2}
            className={inputClasses}
            aria-describedby={describedBy}
            aria-invalid={invalid}
            {...register("reply")}
          />
        )}
      </Field>
      <div className="flex flex-wrap items-center gap-2">
        <Button type="submit" disabled={isSubmitting}>
          {isSubmitting ? "Sending…" : "Close the request with this answer"}
        </Button>
        <Button variant="secondary" onClick={() => setOpen(false)}>
          Cancel
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
