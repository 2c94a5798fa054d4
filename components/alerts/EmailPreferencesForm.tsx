"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { saveEmailPreferencesAction } from "@/lib/alerts/actions";
import { Button } from "@/components/ui/Button";
import { EMAIL_PREFERENCE_KINDS, EMAIL_PREFERENCE_LABELS } from "@/lib/alerts/kinds";
import { emailPreferencesSchema, type EmailPreferences } from "@/lib/alerts/schema";

/**
 * Which alert kinds e-mail me. Alerts always show in the app whatever is
 * chosen here; escalation to the next person goes on regardless.
 */
export function EmailPreferencesForm({
  initial,
  email,
}: {
  initial: EmailPreferences;
  email: string;
}) {
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const {
    register,
    handleSubmit,
    formState: { isSubmitting },
  } = useForm<EmailPreferences>({
    resolver: zodResolver(emailPreferencesSchema),
    defaultValues: initial,
  });

  const onSubmit = handleSubmit(async (values) => {
    setMessage(null);
    try {
      const result = await saveEmailPreferencesAction(values);
      setMessage(result.ok ? { ok: true, text: "Saved." } : { ok: false, text: result.message });
    } catch {
      setMessage({
        ok: false,
        text: "Tidemark could not be reached. Nothing was changed; try again.",
      });
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate aria-label="Alert e-mail choices" className="space-y-3">
      <fieldset>
        <legend className="text-sm font-medium">
          E-mail me at <span className="font-mono text-xs">{email}</span> when I am the one to tell
          about:
        </legend>
        <div className="mt-2 grid gap-1 sm:grid-cols-2">
          {EMAIL_PREFERENCE_KINDS.map((kind) => (
            <label key={kind} className="flex items-center gap-2 text-sm">
              <input type="checkbox" className="size-4 accent-accent" {...register(kind)} />
              {EMAIL_PREFERENCE_LABELS[kind]}
            </label>
          ))}
        </div>
        <p className="mt-1 text-xs text-ink-muted">
          Alerts and order changes always show in the app; unchecking one stops only its e-mail. If
          you do not acknowledge, the alert still escalates to the next person on schedule.
        </p>
      </fieldset>
      <div className="flex items-center gap-3">
        <Button type="submit" variant="secondary" disabled={isSubmitting}>
          {isSubmitting ? "Saving…" : "Save e-mail choices"}
        </Button>
        <p role="status" aria-live="polite" className="text-sm">
          {message ? (
            <span className={message.ok ? "text-in-band" : "font-medium text-below"}>
              {message.text}
            </span>
          ) : null}
        </p>
      </div>
    </form>
  );
}
