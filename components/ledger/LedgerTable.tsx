"use client";

import { Disclosure, DisclosureButton, DisclosurePanel } from "@headlessui/react";
import Link from "next/link";
import { IconChevronDown } from "@/components/ui/icons";
import { ledgerDiff } from "@/lib/ledger/diff";
import type { LedgerEntryView } from "@/lib/ledger/queries";
import { actionLabel, entityLabel, roleLabel } from "./LedgerLabels";
import { LedgerTime } from "./LedgerTime";

export type LedgerUnit = { id: number; code: string; timeZone: string };

/** Pretty-printed JSON; text that is not JSON is shown as stored. */
export function prettyJson(stored: string): string {
  try {
    return JSON.stringify(JSON.parse(stored) as unknown, null, 2);
  } catch {
    return stored;
  }
}

function JsonBox({
  title,
  stored,
  emptyText,
}: {
  title: string;
  stored: string | null;
  emptyText: string;
}) {
  return (
    <div className="min-w-0">
      <h3 className="mb-1 text-xs font-semibold tracking-wide text-ink-muted">{title}</h3>
      {stored === null ? (
        <p className="rounded-md border border-dashed border-border-strong px-2 py-1.5 text-xs text-ink-muted">
          {emptyText}
        </p>
      ) : (
        // Scrolls inside its own box; long values wrap instead of widening the page.
        <pre
          tabIndex={0}
          aria-label={`${title} (JSON)`}
          className="max-h-72 overflow-auto rounded-md border border-border bg-surface-muted p-2 font-mono text-xs break-all whitespace-pre-wrap text-ink"
        >
          {prettyJson(stored)}
        </pre>
      )}
    </div>
  );
}

/** Before and after field by field; the changed fields stand out, unchanged ones stay readable. */
function ChangeTable({ entry }: { entry: LedgerEntryView }) {
  const rows = ledgerDiff(entry.before, entry.after);
  if (rows.length === 0) {
    return <p className="text-xs text-ink-muted">No before or after stored for this row.</p>;
  }
  const changed = rows.filter((r) => r.changed).length;
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-left text-xs" data-testid="ledger-diff">
        <caption className="pb-1 text-left text-xs text-ink-muted">
          {entry.before === null
            ? "Created with these fields"
            : `${changed} of ${rows.length} field${rows.length === 1 ? "" : "s"} changed`}
        </caption>
        <thead className="text-ink-muted">
          <tr>
            <th scope="col" className="py-1 pr-3 font-medium">
              Field
            </th>
            <th scope="col" className="py-1 pr-3 font-medium">
              Before
            </th>
            <th scope="col" className="py-1 font-medium">
              After
            </th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr
              key={r.field}
              data-changed={r.changed}
              className={r.changed ? "font-semibold" : "text-ink-muted"}
            >
              <th scope="row" className="py-0.5 pr-3 font-mono font-normal break-all">
                {r.field}
              </th>
              <td className="py-0.5 pr-3 break-all">{r.before ?? "(none)"}</td>
              <td className="py-0.5 break-all">
                {r.changed ? <span aria-hidden>→ </span> : null}
                {r.after ?? "(removed)"}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

function EntryRows({ entry, unit }: { entry: LedgerEntryView; unit: LedgerUnit | undefined }) {
  const entity = entityLabel(entry.entityType);
  return (
    <Disclosure
      as="tbody"
      className="border-b border-border last:border-0"
      data-testid="ledger-entry"
    >
      <tr className="align-top">
        <td className="px-3 py-2">
          <LedgerTime iso={entry.occurredAt} timeZone={unit?.timeZone ?? "UTC"} />
        </td>
        <td className="px-3 py-2">
          <div className="truncate font-medium" title={entry.actor.name ?? undefined}>
            {entry.actor.name ?? (entry.actor.id === null ? "System" : `User #${entry.actor.id}`)}
          </div>
          <div className="truncate text-xs text-ink-muted">{roleLabel(entry.actor.role)}</div>
        </td>
        <td className="px-3 py-2">
          <div className="font-medium">{actionLabel(entry.action)}</div>
          <div className="truncate font-mono text-xs text-ink-muted">{entry.action}</div>
        </td>
        <td className="px-3 py-2">
          <div className="tabular truncate" data-testid="ledger-entity">
            {entity} #{entry.entityId}
            {unit ? <span className="text-xs text-ink-muted"> · {unit.code}</span> : null}
          </div>
          {entry.patient ? (
            <Link
              href={`/patients/${entry.patient.id}`}
              className="block truncate text-xs text-accent underline-offset-2 hover:underline"
              title={`Chart of ${entry.patient.name}, MRN ${entry.patient.mrn}`}
              data-testid="ledger-patient"
            >
              {entry.patient.name} · {entry.patient.mrn}
            </Link>
          ) : null}
        </td>
        <td className="px-3 py-2 break-words">
          {entry.rationale ? (
            <span className="line-clamp-4" title={entry.rationale}>
              {entry.rationale}
            </span>
          ) : (
            <span className="text-ink-muted">
              —<span className="sr-only">no rationale</span>
            </span>
          )}
        </td>
        <td className="px-3 py-2 text-right">
          <DisclosureButton
            aria-label={`Before / after of row ${entry.id}`}
            className="group inline-flex items-center gap-1 rounded px-1 py-0.5 text-xs font-medium whitespace-nowrap text-accent hover:underline"
          >
            Before / after
            <IconChevronDown
              aria-hidden
              className="transition-transform group-data-[open]:rotate-180"
            />
          </DisclosureButton>
        </td>
      </tr>
      <DisclosurePanel as="tr" className="bg-surface-muted/40">
        <td colSpan={6} className="px-3 pt-1 pb-3">
          <ChangeTable entry={entry} />
          <details className="mt-2">
            <summary className="cursor-pointer text-xs font-medium text-accent">
              Stored JSON, as hashed
            </summary>
            <div className="mt-2 grid gap-3 md:grid-cols-2">
              <JsonBox
                title="Before"
                stored={entry.before}
                emptyText="Nothing before: this row created the record."
              />
              <JsonBox title="After" stored={entry.after} emptyText="Nothing after this change." />
            </div>
          </details>
          {entry.rationale ? (
            <p className="mt-2 text-sm break-words whitespace-pre-line">
              <span className="font-medium text-ink-muted">Rationale: </span>
              {entry.rationale}
            </p>
          ) : null}
          <p className="mt-2 text-xs text-ink-muted">
            Row <span className="tabular">#{entry.id}</span> · chain{" "}
            <span className="font-mono">{entry.chainKey}</span>, position{" "}
            <span className="tabular">{entry.chainSeq}</span> · SHA-256{" "}
            <span className="font-mono break-all">{entry.hash}</span>
          </p>
        </td>
      </DisclosurePanel>
    </Disclosure>
  );
}

/** Ledger rows, newest first; each row's before/after opens beneath it. */
export function LedgerTable({
  entries,
  units,
}: {
  entries: LedgerEntryView[];
  units: LedgerUnit[];
}) {
  const byId = new Map(units.map((u) => [u.id, u]));
  return (
    <div className="rounded-card border border-border bg-surface shadow-card">
      <table className="w-full table-fixed text-left text-sm" data-testid="ledger-table">
        <caption className="sr-only">Ledger rows, newest first</caption>
        <colgroup>
          <col className="w-[8rem]" />
          <col className="w-[10rem]" />
          <col className="w-[11.5rem]" />
          <col className="w-[11rem]" />
          <col />
          <col className="w-[7.5rem]" />
        </colgroup>
        <thead className="border-b border-border bg-surface-muted text-xs tracking-wide text-ink-muted">
          <tr>
            <th scope="col" className="px-3 py-2">
              Time
            </th>
            <th scope="col" className="px-3 py-2">
              Actor
            </th>
            <th scope="col" className="px-3 py-2">
              Action
            </th>
            <th scope="col" className="px-3 py-2">
              Entity
            </th>
            <th scope="col" className="px-3 py-2">
              Rationale
            </th>
            <th scope="col" className="px-3 py-2 text-right">
              <span className="sr-only">Details</span>
            </th>
          </tr>
        </thead>
        {entries.map((entry) => (
          <EntryRows
            key={entry.id}
            entry={entry}
            unit={entry.unitId === null ? undefined : byId.get(entry.unitId)}
          />
        ))}
      </table>
    </div>
  );
}
