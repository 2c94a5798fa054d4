"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { inviteUserAction } from "@/lib/accounts/actions";
import { Button } from "@/components/ui/Button";
import { OwnPasswordField } from "@/components/ui/OwnPasswordField";
import { StatusBadge } from "@/components/ui/StatusBadge";
import type { UserSummary } from "@/lib/users/queries";
import { signInWords } from "./invitation-words";

/**
 * How the user signs in, and the invitation: send one (or a new one, which
 * voids the old link) while they have no password of their own.
 */
export function UserInvitePanel({ user, linkHours }: { user: UserSummary; linkHours: number }) {
  const router = useRouter();
  const [password, setPassword] = useState("");
  const [error, setError] = useState<string | null>(null);
  const [passwordError, setPasswordError] = useState<string | null>(null);
  const [sent, setSent] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const words = signInWords(user);
  const mayInvite = user.active && user.password !== "own";
  const again = user.invitation !== null;

  const submit = async (e: React.FormEvent) => {
    e.preventDefault();
    setBusy(true);
    setError(null);
    setPasswordError(null);
    setSent(null);
    const result = await inviteUserAction({ id: user.id, currentPassword: password });
    setBusy(false);
    if (!result.ok) {
      const fields = result.fieldErrors ?? {};
      setPasswordError(fields.currentPassword?.join(" ") ?? null);
      setError(fields.currentPassword ? null : result.message);
      return;
    }
    setPassword("");
    setSent(
      `Invitation sent to ${user.email}. The link works once, until ${result.data.expiresAt.slice(0, 16).replace("T", " ")} UTC${result.data.voided ? "; the earlier link no longer works" : ""}.`,
    );
    router.refresh();
  };

  return (
    <section
      className="space-y-3 rounded-card border border-border bg-surface p-5 shadow-card"
      aria-labelledby="sign-in-heading"
    >
      <h2 id="sign-in-heading" className="text-lg font-semibold">
        Sign-in
      </h2>
      <div className="flex flex-wrap items-center gap-2" data-testid="invitation-state">
        <StatusBadge status={words.tone} label={words.label} />
        <span className="text-sm text-ink-muted">{words.detail}</span>
      </div>
      {mayInvite ? (
        <form onSubmit={submit} noValidate className="space-y-3">
          <p className="text-sm text-ink-muted">
            {again ? "A new invitation" : "An invitation"} e-mails {user.email} a link to choose a
            password. It works once, for {linkHours} hours
            {again ? "; any earlier link stops working" : ""}.
          </p>
          <OwnPasswordField
            id="invite-password"
            className="sm:max-w-xs"
            hint="Confirms the invitation; a wrong one is recorded."
            error={passwordError ?? undefined}
            input={{ value: password, onChange: (e) => setPassword(e.target.value) }}
          />
          <div className="flex flex-wrap items-center gap-3">
            <Button type="submit" variant="secondary" disabled={busy}>
              {busy ? "Sending…" : again ? "Send a new invitation" : "Send invitation"}
            </Button>
            <p role="status" aria-live="polite" className="text-sm">
              {error ? <span className="font-medium text-below">{error}</span> : null}
              {sent ? <span className="text-in-band">{sent}</span> : null}
            </p>
          </div>
        </form>
      ) : null}
    </section>
  );
}
