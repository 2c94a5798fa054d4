"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useForm } from "react-hook-form";
import { cosignOrderAction } from "@/lib/orders/actions";
import { DESIGNATED_COSIGN_MEANING, SIGNATURE_MEANING } from "@/lib/orders/wording";
import { cosignSchema } from "@/lib/orders/schema";
import { SignedStepFooter, SignPasswordField, useSignedOrderStep } from "./SignedOrderStep";

const formSchema = cosignSchema.pick({ password: true });
type CosignValues = { password: string };
const FIELDS = ["password"] as const;

/**
 * The prescriber named on a verbal or telephone order, or a physician the unit
 * designates, co-signs it by re-entering the password. The page shows this
 * form only to them; the server refuses anyone else.
 */
export function CosignForm({
  orderId,
  version,
  enteredBy,
  prescriber,
  asPrescriber,
}: {
  orderId: number;
  version: number;
  enteredBy: string;
  /** The prescriber the order names. */
  prescriber: string;
  /** The signed-in physician is that prescriber (else a designated co-signer). */
  asPrescriber: boolean;
}) {
  const form = useForm<CosignValues>({
    resolver: zodResolver(formSchema),
    defaultValues: { password: "" },
  });
  const { state, run } = useSignedOrderStep(
    form,
    FIELDS,
    "Tidemark could not be reached. Nothing was signed; try again.",
  );
  const onSubmit = form.handleSubmit(({ password }) =>
    run(() => cosignOrderAction({ orderId, version, password })),
  );

  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-labelledby="cosign-heading"
      className="space-y-3 rounded-card border border-overdue/50 bg-surface p-4 shadow-card"
    >
      <h2 id="cosign-heading" className="text-base font-semibold">
        Co-sign this order
      </h2>
      {asPrescriber ? (
        <p className="text-sm text-ink-muted">
          Entered by {enteredBy} from your verbal or telephone order. Check every field above
          against what you ordered; co-signing makes it active and records you as its signer.
        </p>
      ) : (
        <p className="text-sm text-ink-muted">
          Entered by {enteredBy} from {prescriber}&apos;s verbal or telephone order. You may co-sign
          it as a co-signer this unit designates: check every field above; co-signing makes it
          active and records you as its signer.
        </p>
      )}
      <p id="cosign-meaning" className="rounded-md bg-accent-soft px-3 py-2 text-sm">
        By co-signing you state:{" "}
        <q>{asPrescriber ? SIGNATURE_MEANING : DESIGNATED_COSIGN_MEANING}</q>
      </p>
      <SignPasswordField
        id="cosign-password"
        label="Password to co-sign"
        hint="Your sign-in password, asked again."
        error={form.formState.errors.password?.message}
        registration={form.register("password")}
        alsoDescribedBy="cosign-meaning"
      />
      <SignedStepFooter
        orderId={orderId}
        state={state}
        submitting={form.formState.isSubmitting}
        label="Co-sign order"
        busyLabel="Co-signing…"
        doneText="Co-signed. The order is active."
      />
    </form>
  );
}
