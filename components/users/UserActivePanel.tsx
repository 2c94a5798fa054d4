"use client";

import { Dialog, DialogPanel, DialogTitle } from "@headlessui/react";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { setUserActiveAction } from "@/lib/users/actions";
import { Button } from "@/components/ui/Button";
import { Field, inputClasses } from "@/components/ui/Field";
import { StatusBadge } from "@/components/ui/StatusBadge";
import type { UserSummary } from "@/lib/users/queries";
import { OwnPasswordField } from "@/components/ui/OwnPasswordField";

/** Deactivate or reactivate an account, with a required reason for the ledger. */
export function UserActivePanel({ user, isSelf }: { user: UserSummary; isSelf: boolean }) {
  const router = useRouter();
  const [open, setOpen] = useState(false);
  const [reason, setReason] = useState("");
  const [password, setPassword] = useState("");
  const [error, setError] = useState<string | null>(null);
  const [passwordError, setPasswordError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const next = !user.active;

  const submit = async (e: React.FormEvent) => {
    e.preventDefault();
    setBusy(true);
    const result = await setUserActiveAction({
      id: user.id,
      version: user.version,
      active: next,
      rationale: reason,
      currentPassword: password,
    });
    setBusy(false);
    if (!result.ok) {
      const fields = result.fieldErrors ?? {};
      setPasswordError(fields.currentPassword?.join(" ") ?? null);
      setError(
        fields.rationale?.join(" ") ??
          fields.active?.join(" ") ??
          (fields.currentPassword ? null : result.message),
      );
      return;
    }
    setOpen(false);
    setReason("");
    setPassword("");
    router.refresh();
  };

  return (
    <section
      className="space-y-2 rounded-card border border-border bg-surface p-5 shadow-card"
      aria-labelledby="account-status"
    >
      <h2 id="account-status" className="text-lg font-semibold">
        Account status
      </h2>
      <div className="flex flex-wrap items-center gap-3">
        {user.active ? (
          <StatusBadge status="in-band" label="Active" />
        ) : (
          <StatusBadge status="neutral" label="Deactivated" />
        )}
        {isSelf ? (
          <span className="text-sm text-ink-muted">You cannot deactivate your own account.</span>
        ) : (
          <Button variant={user.active ? "danger" : "secondary"} onClick={() => setOpen(true)}>
            {user.active ? "Deactivate…" : "Reactivate…"}
          </Button>
        )}
      </div>
      <Dialog open={open} onClose={() => setOpen(false)} className="relative z-50">
        <div className="fixed inset-0 bg-black/40" aria-hidden="true" />
        <div className="fixed inset-0 flex items-center justify-center p-4">
          <DialogPanel className="w-full max-w-md space-y-3 rounded-card border border-border bg-surface p-5 shadow-card">
            <DialogTitle className="text-lg font-semibold">
              {user.active ? `Deactivate ${user.name}?` : `Reactivate ${user.name}?`}
            </DialogTitle>
            <p className="text-sm text-ink-muted">
              {user.active
                ? "They can no longer sign in; their past entries stay in the ledger under their name."
                : "They can sign in again with their existing password."}
            </p>
            <form onSubmit={submit} className="space-y-3" noValidate>
              <Field
                id="active-reason"
                label="Reason (recorded in the ledger)"
                error={error ?? undefined}
              >
                {(d, invalid) => (
                  <input
                    id="active-reason"
                    autoFocus
                    value={reason}
                    onChange={(e) => setReason(e.target.value)}
                    className={inputClasses}
                    aria-invalid={invalid}
                    aria-describedby={d}
                  />
                )}
              </Field>
              <OwnPasswordField
                id="active-password"
                hint="Confirms the change; a wrong one is recorded."
                error={passwordError ?? undefined}
                input={{ value: password, onChange: (e) => setPassword(e.target.value) }}
              />
              <div className="flex justify-end gap-2">
                <Button variant="secondary" onClick={() => setOpen(false)}>
                  Cancel
                </Button>
                <Button type="submit" variant={user.active ? "danger" : "primary"} disabled={busy}>
                  {busy ? "Saving…" : user.active ? "Deactivate" : "Reactivate"}
                </Button>
              </div>
            </form>
          </DialogPanel>
        </div>
      </Dialog>
    </section>
  );
}
