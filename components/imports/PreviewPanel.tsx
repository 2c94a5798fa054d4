"use client";

import { useId, useState } from "react";
import { Button } from "@/components/ui/Button";
import { IconWarning } from "@/components/ui/icons";
import { StatusBadge } from "@/components/ui/StatusBadge";
import { IMPORT_KIND_LABELS, REJECT_CODE_LABELS } from "@/lib/imports/kinds";
import type { ImportPreview } from "@/lib/imports/report";
import { rows, send, type ApiFailure } from "./import-request";
import { MappingStep } from "./MappingStep";

/** The preview of an upload: counts, accepted and rejected rows, and confirming the import. */
export function PreviewPanel({
  preview,
  onChange,
  onImported,
}: {
  preview: ImportPreview;
  onChange: (p: ImportPreview) => void;
  onImported: () => void;
}) {
  const id = useId();
  const [read, setRead] = useState(false);
  const [busy, setBusy] = useState(false);
  const [failure, setFailure] = useState<ApiFailure | null>(null);
  const { counts } = preview;
  const canConfirm =
    preview.status === "previewed" && counts.accepted > 0 && !preview.mappingErrors;

  const confirm = async () => {
    setBusy(true);
    setFailure(null);
    const result = await send(`/api/v1/imports/${preview.id}/confirm`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ expectedAccepted: counts.accepted }),
    });
    setBusy(false);
    if (!result.ok) return setFailure(result);
    onChange(result.preview);
    onImported();
  };

  return (
    <section
      aria-labelledby={`${id}-title`}
      className="space-y-4 rounded-card border border-border bg-surface p-5 shadow-card"
    >
      <div className="flex flex-wrap items-start justify-between gap-2">
        <div>
          <h2 id={`${id}-title`} className="text-lg font-semibold">
            {preview.status === "imported" ? "Imported" : "Preview"}: {preview.fileName}
          </h2>
          <p className="text-sm text-ink-muted">
            {IMPORT_KIND_LABELS[preview.kind]} · {preview.unitCode}
            {preview.monitor ? ` · MRN ${preview.monitor.mrn}, bed ${preview.monitor.bed}` : ""} ·
            SHA-256 <span className="font-mono text-xs">{preview.sha256.slice(0, 12)}…</span>
          </p>
        </div>
        {preview.status === "imported" ? (
          <StatusBadge status="in-band" label="Imported" />
        ) : (
          <StatusBadge status="overdue" label="Not imported yet" />
        )}
      </div>
      {preview.alreadyImported ? (
        <p
          role="note"
          className="rounded-md border border-border bg-surface-muted px-3 py-2 text-sm"
        >
          This file was imported before
          {preview.importedAt ? ` (${preview.importedAt.slice(0, 16).replace("T", " ")} UTC)` : ""}.
          Nothing was changed.
        </p>
      ) : null}
      <dl className="flex flex-wrap gap-6 text-sm">
        <div>
          <dt className="text-ink-muted">Rows in file</dt>
          <dd className="tabular text-xl font-semibold">{counts.total}</dd>
        </div>
        <div>
          <dt className="text-ink-muted">
            {preview.status === "imported" ? "Imported" : "Good rows"}
          </dt>
          <dd className="tabular text-xl font-semibold text-in-band">{counts.accepted}</dd>
        </div>
        <div>
          <dt className="text-ink-muted">Rejected</dt>
          <dd className={`tabular text-xl font-semibold ${counts.rejected ? "text-below" : ""}`}>
            {counts.rejected}
          </dd>
        </div>
      </dl>

      {preview.kind === "blood_gas_csv" && preview.status === "previewed" && preview.header ? (
        <MappingStep preview={preview} onChange={onChange} />
      ) : null}

      {preview.sample.length > 0 ? (
        <div className="overflow-x-auto">
          <table className="w-full text-left text-sm">
            <caption className="mb-1 text-left text-sm font-medium">First good rows</caption>
            <thead className="border-b border-border bg-surface-muted text-xs tracking-wide text-ink-muted">
              <tr>
                <th scope="col" className="px-2 py-1">
                  Row
                </th>
                <th scope="col" className="px-2 py-1">
                  Patient
                </th>
                <th scope="col" className="px-2 py-1">
                  Time (UTC)
                </th>
                <th scope="col" className="px-2 py-1">
                  Values
                </th>
              </tr>
            </thead>
            <tbody>
              {preview.sample.map((r) => (
                <tr key={`${r.label}-${r.what}`} className="border-b border-border last:border-0">
                  <th scope="row" className="px-2 py-1 font-normal">
                    {r.label}
                  </th>
                  <td className="px-2 py-1">
                    {r.mrn} · {r.patient}
                  </td>
                  <td className="tabular px-2 py-1">{r.at.slice(0, 19).replace("T", " ")}</td>
                  <td className="tabular px-2 py-1">{r.summary}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : null}

      {preview.rejected.length > 0 ? (
        <div className="overflow-x-auto">
          <table className="w-full text-left text-sm">
            <caption className="mb-1 text-left text-sm font-medium text-below">
              <IconWarning className="mr-1 inline" />
              Rejected rows{preview.rejected.length > 200 ? " (first 200; the report has all)" : ""}
            </caption>
            <thead className="border-b border-border bg-surface-muted text-xs tracking-wide text-ink-muted">
              <tr>
                <th scope="col" className="px-2 py-1">
                  Row
                </th>
                <th scope="col" className="px-2 py-1">
                  MRN
                </th>
                <th scope="col" className="px-2 py-1">
                  Why
                </th>
              </tr>
            </thead>
            <tbody>
              {preview.rejected.slice(0, 200).map((r) => (
                <tr
                  key={`${r.label}-${r.line}`}
                  className="border-b border-border align-top last:border-0"
                >
                  <th scope="row" className="px-2 py-1 font-normal whitespace-nowrap">
                    {r.label}
                  </th>
                  <td className="px-2 py-1">{r.mrn ?? "—"}</td>
                  <td className="px-2 py-1">
                    <ul>
                      {r.reasons.map((x, i) => (
                        <li key={i}>
                          <span className="font-medium">{REJECT_CODE_LABELS[x.code]}:</span>{" "}
                          {x.message}
                        </li>
                      ))}
                    </ul>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : null}

      {preview.notes.length > 0 ? (
        <div className="text-sm">
          <p className="font-medium">Not used by Tidemark</p>
          <ul className="list-inside list-disc text-ink-muted">
            {preview.notes.map((n) => (
              <li key={n}>{n}</li>
            ))}
          </ul>
        </div>
      ) : null}

      <div className="flex flex-wrap items-center gap-3 border-t border-border pt-3">
        {canConfirm ? (
          <>
            {counts.rejected > 0 ? (
              <label className="flex items-center gap-2 text-sm">
                <input
                  type="checkbox"
                  className="size-4 accent-accent"
                  checked={read}
                  onChange={(e) => setRead(e.target.checked)}
                />
                I have read the {rows(counts.rejected, "rejected row")}; import the{" "}
                {rows(counts.accepted, "good row")} only.
              </label>
            ) : null}
            <Button
              onClick={() => void confirm()}
              disabled={busy || (counts.rejected > 0 && !read)}
            >
              {busy ? "Importing…" : `Import ${rows(counts.accepted, "row")}`}
            </Button>
          </>
        ) : preview.status === "previewed" && counts.accepted === 0 ? (
          <p className="text-sm text-below">Nothing can be imported from this file as it stands.</p>
        ) : null}
        <a
          className="text-sm text-accent underline-offset-2 hover:underline"
          href={`/api/v1/imports/${preview.id}/report`}
        >
          Download the report (CSV)
        </a>
        <p role="status" aria-live="polite" className="text-sm">
          {failure ? <span className="font-medium text-below">{failure.message}</span> : null}
        </p>
      </div>
    </section>
  );
}
