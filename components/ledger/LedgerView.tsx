"use client";

import { LoadError } from "@/components/ui/LoadError";
import { usePathname, useRouter, useSearchParams } from "next/navigation";
import { useMemo } from "react";
import useSWRInfinite from "swr/infinite";
import { Button, buttonClasses } from "@/components/ui/Button";
import { EmptyState } from "@/components/ui/EmptyState";
import { IconWarning } from "@/components/ui/icons";
import type { LedgerEntryView } from "@/lib/ledger/queries";
import {
  type ActorOption,
  checkFilterValues,
  filterValuesFromSearch,
  LedgerFilters,
  searchFromFilterValues,
} from "./LedgerFilters";
import { getLedgerJson, type LedgerRequestError } from "./LedgerRequest";
import { type LedgerUnit, LedgerTable } from "./LedgerTable";
import { VerifyChain } from "./VerifyChain";

type LedgerPage = { entries: LedgerEntryView[]; nextBefore: number | null };

const PAGE_SIZE = 50;

export function LedgerLoading() {
  return (
    <div className="space-y-2" aria-busy="true" data-testid="ledger-loading">
      <p role="status" className="sr-only">
        Loading ledger rows…
      </p>
      {Array.from({ length: 6 }, (_, i) => (
        <div key={i} className="h-11 animate-pulse rounded bg-surface-muted" />
      ))}
    </div>
  );
}

/**
 * The Ledger: filters from the address bar, rows from /api/v1/ledger page by
 * page (newest first, "Load older" follows the cursor), CSV with the same
 * filters, and the chain check.
 */
export function LedgerView({
  units,
  actors,
  timeZone,
}: {
  units: LedgerUnit[];
  actors: ActorOption[];
  /** The zone the period filter is typed in: the units' own when they share one. */
  timeZone: string;
}) {
  const router = useRouter();
  const pathname = usePathname();
  const searchParams = useSearchParams();
  const search = searchParams.toString();

  const { values, errors, query } = useMemo(() => {
    const read = filterValuesFromSearch(new URLSearchParams(search), timeZone);
    const problems = checkFilterValues(read);
    const valid = Object.keys(problems).length === 0;
    return {
      values: read,
      errors: problems,
      query: valid ? searchFromFilterValues(read, timeZone).toString() : null,
    };
  }, [search, timeZone]);

  const { data, error, size, setSize, isLoading, isValidating, mutate } = useSWRInfinite<
    LedgerPage,
    LedgerRequestError
  >(
    (index: number, previous: LedgerPage | null) => {
      if (query === null) return null;
      if (previous && previous.nextBefore === null) return null;
      const params = new URLSearchParams(query);
      params.set("limit", String(PAGE_SIZE));
      if (previous?.nextBefore) params.set("before", String(previous.nextBefore));
      return `/api/v1/ledger?${params.toString()}`;
    },
    (url: string) => getLedgerJson<LedgerPage>(url),
    { revalidateFirstPage: false, keepPreviousData: false },
  );

  const entries = data?.flatMap((page) => page.entries) ?? [];
  const lastPage = data?.[data.length - 1];
  const loadingOlder = isValidating && size > 0 && data !== undefined && data.length < size;
  const go = (params: URLSearchParams) => {
    const next = params.toString();
    router.push(next ? `${pathname}?${next}` : pathname, { scroll: false });
  };
  const exportHref = query === null ? null : `/api/v1/ledger/export${query ? `?${query}` : ""}`;

  return (
    <div className="space-y-4">
      <LedgerFilters
        key={search}
        initial={values}
        initialErrors={errors}
        actors={actors}
        timeZone={timeZone}
        onApply={go}
        onClear={() => go(new URLSearchParams())}
      />

      <div className="flex flex-wrap items-center gap-3">
        {exportHref ? (
          <a href={exportHref} download className={buttonClasses("secondary")}>
            Download CSV
          </a>
        ) : null}
        <VerifyChain />
      </div>

      {query === null ? (
        <p
          role="alert"
          className="flex items-start gap-2 rounded-card border border-below/40 bg-below-soft px-4 py-3 text-sm text-below"
        >
          <IconWarning className="mt-0.5 shrink-0" />
          <span>
            Some filters in this address cannot be read; they are marked beside their fields.
            Correct them and apply the filters again.
          </span>
        </p>
      ) : error && entries.length === 0 ? (
        <LoadError what="the ledger" message={error.message} onRetry={() => void mutate()} />
      ) : isLoading || data === undefined ? (
        <LedgerLoading />
      ) : entries.length === 0 ? (
        <EmptyState title="No ledger rows match these filters">
          Only rows of your units are shown. Widen the period, choose another action or actor, or
          clear the filters.
        </EmptyState>
      ) : (
        <section aria-labelledby="ledger-rows-heading" className="space-y-3">
          <h2 id="ledger-rows-heading" className="sr-only">
            Ledger rows
          </h2>
          <LedgerTable entries={entries} units={units} />
          <div className="flex flex-wrap items-center gap-3">
            <p className="text-sm text-ink-muted" aria-live="polite">
              Showing <span className="tabular">{entries.length}</span>{" "}
              {entries.length === 1 ? "row" : "rows"}, newest first
              {lastPage?.nextBefore === null ? " — the oldest row is shown" : ""}.
            </p>
            {error ? (
              <LoadError what="the ledger" message={error.message} onRetry={() => void mutate()} />
            ) : null}
            {lastPage?.nextBefore ? (
              <Button
                variant="secondary"
                className="ml-auto"
                disabled={loadingOlder}
                aria-busy={loadingOlder}
                onClick={() => void setSize(size + 1)}
              >
                {loadingOlder ? "Loading older rows…" : "Load older"}
              </Button>
            ) : null}
          </div>
        </section>
      )}
    </div>
  );
}
