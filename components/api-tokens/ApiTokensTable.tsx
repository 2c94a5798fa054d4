"use client";

import { Dialog, DialogPanel, DialogTitle } from "@headlessui/react";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { revokeApiTokenAction } from "@/lib/api-tokens/actions";
import { Button } from "@/components/ui/Button";
import { EmptyState } from "@/components/ui/EmptyState";
import { Field, inputClasses } from "@/components/ui/Field";
import { StatusBadge } from "@/components/ui/StatusBadge";
import type { ApiTokenSummary } from "@/lib/api-tokens/queries";
import { OwnPasswordField } from "@/components/ui/OwnPasswordField";

const when = (iso: string | null) => (iso ? `${iso.slice(0, 16).replace("T", " ")} UTC` : "never");

/** The token list with a revoke action that asks for confirmation and a reason. */
export function ApiTokensTable({ tokens }: { tokens: ApiTokenSummary[] }) {
  const router = useRouter();
  const [target, setTarget] = useState<ApiTokenSummary | null>(null);
  const [reason, setReason] = useState("");
  const [error, setError] = useState<string | null>(null);
  const [password, setPassword] = useState("");
  const [passwordError, setPasswordError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  const close = () => {
    setTarget(null);
    setReason("");
    setError(null);
    setPassword("");
    setPasswordError(null);
  };

  const revoke = async (e: React.FormEvent) => {
    e.preventDefault();
    if (!target) return;
    setBusy(true);
    const result = await revokeApiTokenAction({
      id: target.id,
      rationale: reason,
      currentPassword: password,
    });
    setBusy(false);
    if (!result.ok) {
      const fields = result.fieldErrors ?? {};
      setPasswordError(fields.currentPassword?.join(" ") ?? null);
      setError(fields.rationale?.join(" ") ?? (fields.currentPassword ? null : result.message));
      return;
    }
    close();
    router.refresh();
  };

  if (tokens.length === 0) {
    return (
      <EmptyState title="No API tokens yet">
        Create one above for each interface engine that sends results.
      </EmptyState>
    );
  }
  return (
    <>
      <div className="overflow-x-auto rounded-card border border-border bg-surface shadow-card">
        <table className="w-full text-left text-sm" data-testid="api-tokens-table">
          <caption className="sr-only">API tokens, active first</caption>
          <thead className="border-b border-border bg-surface-muted text-xs tracking-wide text-ink-muted">
            <tr>
              <th scope="col" className="px-3 py-2">
                Name
              </th>
              <th scope="col" className="px-3 py-2">
                Token starts
              </th>
              <th scope="col" className="px-3 py-2">
                Scope
              </th>
              <th scope="col" className="px-3 py-2">
                Units
              </th>
              <th scope="col" className="px-3 py-2">
                Status
              </th>
              <th scope="col" className="px-3 py-2">
                Created
              </th>
              <th scope="col" className="px-3 py-2">
                Expires
              </th>
              <th scope="col" className="px-3 py-2">
                Last used
              </th>
              <th scope="col" className="px-3 py-2">
                <span className="sr-only">Actions</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {tokens.map((t) => (
              <tr key={t.id} className="border-b border-border last:border-0">
                <th scope="row" className="px-3 py-2 font-medium">
                  {t.name}
                </th>
                <td className="px-3 py-2 font-mono text-xs">{t.prefix}…</td>
                <td className="px-3 py-2">{t.scope === "write" ? "Write" : "Read only"}</td>
                <td className="px-3 py-2">{t.units.map((u) => u.code).join(", ")}</td>
                <td className="px-3 py-2">
                  {t.revokedAt ? (
                    <StatusBadge
                      status="neutral"
                      label={`Revoked ${when(t.revokedAt)}${t.revokedBy ? ` by ${t.revokedBy}` : ""}`}
                    />
                  ) : t.expired ? (
                    <StatusBadge status="neutral" label={`Expired ${when(t.expiresAt)}`} />
                  ) : (
                    <StatusBadge status="in-band" label="Active" />
                  )}
                </td>
                <td className="tabular px-3 py-2">
                  {when(t.createdAt)} by {t.createdBy}
                </td>
                <td className="tabular px-3 py-2">{when(t.expiresAt)}</td>
                <td className="tabular px-3 py-2">{when(t.lastUsedAt)}</td>
                <td className="px-3 py-2 text-right">
                  {t.revokedAt || t.expired ? null : (
                    <Button variant="danger" onClick={() => setTarget(t)}>
                      Revoke…<span className="sr-only"> {t.name}</span>
                    </Button>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <Dialog open={target !== null} onClose={close} className="relative z-50">
        <div className="fixed inset-0 bg-black/40" aria-hidden="true" />
        <div className="fixed inset-0 flex items-center justify-center p-4">
          <DialogPanel className="w-full max-w-md space-y-3 rounded-card border border-border bg-surface p-5 shadow-card">
            <DialogTitle className="text-lg font-semibold">Revoke “{target?.name}”?</DialogTitle>
            <p className="text-sm text-ink-muted">
              The interface engine using it is refused from its next request on. This cannot be
              undone; create a new token to reconnect it.
            </p>
            <form onSubmit={revoke} className="space-y-3" noValidate>
              <Field
                id="revoke-reason"
                label="Reason (recorded in the ledger)"
                error={error ?? undefined}
              >
                {(d, invalid) => (
                  <input
                    id="revoke-reason"
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
                id="revoke-password"
                hint="Confirms the revocation; a wrong one is recorded."
                error={passwordError ?? undefined}
                input={{ value: password, onChange: (e) => setPassword(e.target.value) }}
              />
              <div className="flex justify-end gap-2">
                <Button variant="secondary" onClick={close}>
                  Cancel
                </Button>
                <Button type="submit" variant="danger" disabled={busy}>
                  {busy ? "Revoking…" : "Revoke"}
                </Button>
              </div>
            </form>
          </DialogPanel>
        </div>
      </Dialog>
    </>
  );
}
