"use client";

import useSWRMutation from "swr/mutation";
import { Button } from "@/components/ui/Button";
import { IconCheck, IconWarning } from "@/components/ui/icons";
import type { LedgerVerification } from "@/lib/ledger/verify";
import { getLedgerJson, type LedgerRequestError } from "./LedgerRequest";

const VERIFY_URL = "/api/v1/ledger/verify";

const plural = (n: number, one: string, many: string) =>
  `${n.toLocaleString("en-GB")} ${n === 1 ? one : many}`;

/** The verdict in words: intact with its count, or where the first link breaks and why. */
export function verificationMessage(result: LedgerVerification): string {
  const anchorTime = result.anchor
    ? `${result.anchor.createdAt.slice(0, 16).replace("T", " ")} UTC`
    : null;
  if (result.ok || result.firstBroken === null) {
    const rows = `Chain intact — ${plural(result.checked, "row", "rows")} checked`;
    if (!anchorTime) return rows;
    return result.mode === "incremental"
      ? `${rows} since the anchor of ${anchorTime}`
      : `${rows}; heads match the anchor of ${anchorTime}`;
  }
  const { id, chainKey, chainSeq, problem } = result.firstBroken;
  // Row 0 means the chain head (or the anchor file), not a stored row.
  const where = id > 0 ? `row #${id}` : chainKey === "(anchor)" ? "the anchor" : "the chain head";
  const more = (result.problems?.length ?? 1) - 1;
  return (
    `Broken link at ${where} (chain ${chainKey}, position ${chainSeq}): ${problem}` +
    (more > 0 ? ` — and ${plural(more, "more problem", "more problems")}` : "")
  );
}

/** Walks every hash chain on request; the verdict by word, icon and colour. */
export function VerifyChain() {
  const { trigger, data, error, isMutating } = useSWRMutation<
    LedgerVerification,
    LedgerRequestError,
    string
  >(VERIFY_URL, (url: string) => getLedgerJson<LedgerVerification>(url), { throwOnError: false });

  return (
    <div className="flex min-w-0 flex-1 flex-wrap items-center gap-3">
      <Button
        variant="secondary"
        onClick={() => void trigger()}
        disabled={isMutating}
        aria-busy={isMutating}
      >
        {isMutating ? "Verifying…" : "Verify chain"}
      </Button>
      <div role="status" aria-live="polite" className="min-w-0 flex-1" data-testid="verify-result">
        {isMutating ? (
          <span className="text-sm text-ink-muted">Recomputing every row&apos;s hash…</span>
        ) : error ? (
          <p className="inline-flex items-start gap-1.5 rounded-md bg-below-soft px-2.5 py-1 text-sm font-medium text-below">
            <IconWarning className="mt-0.5 shrink-0" />
            <span>The chain could not be verified: {error.message}</span>
          </p>
        ) : data ? (
          data.ok ? (
            <p className="inline-flex items-start gap-1.5 rounded-md bg-in-band-soft px-2.5 py-1 text-sm font-medium text-in-band">
              <IconCheck className="mt-0.5 shrink-0" />
              <span>{verificationMessage(data)}</span>
            </p>
          ) : (
            <p className="inline-flex items-start gap-1.5 rounded-md bg-below-soft px-2.5 py-1 text-sm font-medium break-words text-below">
              <IconWarning className="mt-0.5 shrink-0" />
              <span>{verificationMessage(data)}</span>
            </p>
          )
        ) : null}
      </div>
    </div>
  );
}
