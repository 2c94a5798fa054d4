"use client";

import { useRouter } from "next/navigation";
import { useId, useState } from "react";
import { useHydrated } from "@/components/bedside/BedsideFormParts";
import { Button } from "@/components/ui/Button";
import { Field, inputClasses } from "@/components/ui/Field";
import { IconWarning } from "@/components/ui/icons";
import { StatusBadge } from "@/components/ui/StatusBadge";
import type { BloodGasMapping } from "@/lib/imports/csv";
import {
  BLOOD_GAS_COLUMNS,
  CSV_DELIMITERS,
  IMPORT_KIND_LABELS,
  IMPORT_KINDS,
  MEASURED_FIELDS,
  REJECT_CODE_LABELS,
  UNIT_LABELS,
  type ImportKind,
  type MeasuredField,
  type UcumCode,
} from "@/lib/imports/kinds";
import type { ImportPreview } from "@/lib/imports/report";

const rows = (n: number, noun: string) => `${n} ${noun}${n === 1 ? "" : "s"}`;

type ApiFailure = { message: string; fieldErrors: Record<string, string[]> };

async function send(
  url: string,
  init: RequestInit,
): Promise<{ ok: true; preview: ImportPreview } | ({ ok: false } & ApiFailure)> {
  let response: Response;
  try {
    response = await fetch(url, {
      ...init,
      headers: { accept: "application/json", ...(init.headers ?? {}) },
    });
  } catch {
    return {
      ok: false,
      message: "Tidemark could not be reached. Check the connection and try again.",
      fieldErrors: {},
    };
  }
  const body = (await response.json().catch(() => null)) as {
    import?: ImportPreview;
    error?: { message?: string; fieldErrors?: Record<string, string[]> };
  } | null;
  if (response.ok && body?.import) return { ok: true, preview: body.import };
  if (response.status === 401)
    return {
      ok: false,
      message: "Your session has ended. Sign in again to upload.",
      fieldErrors: {},
    };
  return {
    ok: false,
    message:
      body?.error?.message ?? `The server could not answer (status ${response.status}). Try again.`,
    fieldErrors: body?.error?.fieldErrors ?? {},
  };
}

/** Upload → preview (with the column mapping for CSV blood gases) → confirm. */
export function ImportWorkbench({ units }: { units: { id: number; label: string }[] }) {
  const id = useId();
  const router = useRouter();
  const hydrated = useHydrated();
  const [kind, setKind] = useState<ImportKind>("blood_gas_csv");
  const [unitId, setUnitId] = useState(String(units[0]?.id ?? ""));
  const [delimiter, setDelimiter] = useState<keyof typeof CSV_DELIMITERS>(",");
  const [mrn, setMrn] = useState("");
  const [bed, setBed] = useState("");
  const [file, setFile] = useState<File | null>(null);
  const [busy, setBusy] = useState(false);
  const [failure, setFailure] = useState<ApiFailure | null>(null);
  const [preview, setPreview] = useState<ImportPreview | null>(null);

  const fe = (name: string) => failure?.fieldErrors[name]?.join(" ");

  const upload = async (e: React.FormEvent) => {
    e.preventDefault();
    setFailure(null);
    if (!file) {
      setFailure({
        message: "Some fields need attention.",
        fieldErrors: { file: ["Choose a file to upload."] },
      });
      return;
    }
    const form = new FormData();
    form.set("file", file);
    form.set("kind", kind);
    form.set("unitId", unitId);
    form.set("delimiter", delimiter);
    if (kind === "monitor_csv") {
      form.set("mrn", mrn);
      form.set("bed", bed);
    }
    setBusy(true);
    const result = await send("/api/v1/imports", { method: "POST", body: form });
    setBusy(false);
    if (!result.ok) {
      setPreview(null);
      setFailure(result);
      return;
    }
    setPreview(result.preview);
    router.refresh();
  };

  return (
    <div className="space-y-4">
      <form
        onSubmit={upload}
        noValidate
        data-ready={hydrated ? "true" : undefined}
        className="rounded-card border border-border bg-surface p-5 shadow-card"
        aria-labelledby={`${id}-title`}
      >
        <h2 id={`${id}-title`} className="mb-3 text-lg font-semibold">
          Upload a file
        </h2>
        <fieldset disabled={!hydrated || busy} className="min-w-0 space-y-1">
          <div className="grid gap-x-4 sm:grid-cols-2 lg:grid-cols-3">
            <Field id={`${id}-kind`} label="The file holds" error={fe("kind")}>
              {(d, invalid) => (
                <select
                  id={`${id}-kind`}
                  className={inputClasses}
                  aria-invalid={invalid}
                  aria-describedby={d}
                  value={kind}
                  onChange={(e) => setKind(e.target.value as ImportKind)}
                >
                  {IMPORT_KINDS.map((k) => (
                    <option key={k} value={k}>
                      {IMPORT_KIND_LABELS[k]}
                    </option>
                  ))}
                </select>
              )}
            </Field>
            <Field
              id={`${id}-unit`}
              label="Unit"
              hint="Patients are matched by MRN on this unit."
              error={fe("unitId")}
            >
              {(d, invalid) => (
                <select
                  id={`${id}-unit`}
                  className={inputClasses}
                  aria-invalid={invalid}
                  aria-describedby={d}
                  value={unitId}
                  onChange={(e) => setUnitId(e.target.value)}
                >
                  {units.map((u) => (
                    <option key={u.id} value={u.id}>
                      {u.label}
                    </option>
                  ))}
                </select>
              )}
            </Field>
            {kind === "blood_gas_csv" ? (
              <Field id={`${id}-delimiter`} label="Columns separated by" error={fe("delimiter")}>
                {(d, invalid) => (
                  <select
                    id={`${id}-delimiter`}
                    className={inputClasses}
                    aria-invalid={invalid}
                    aria-describedby={d}
                    value={delimiter}
                    onChange={(e) => setDelimiter(e.target.value as keyof typeof CSV_DELIMITERS)}
                  >
                    {Object.entries(CSV_DELIMITERS).map(([v, label]) => (
                      <option key={v} value={v}>
                        {label}
                      </option>
                    ))}
                  </select>
                )}
              </Field>
            ) : null}
            {kind === "monitor_csv" ? (
              <>
                <Field id={`${id}-mrn`} label="Patient MRN" error={fe("mrn")}>
                  {(d, invalid) => (
                    <input
                      id={`${id}-mrn`}
                      className={inputClasses}
                      aria-invalid={invalid}
                      aria-describedby={d}
                      value={mrn}
                      onChange={(e) => setMrn(e.target.value)}
                    />
                  )}
                </Field>
                <Field id={`${id}-bed`} label="Bed of the monitor" error={fe("bed")}>
                  {(d, invalid) => (
                    <input
                      id={`${id}-bed`}
                      className={inputClasses}
                      aria-invalid={invalid}
                      aria-describedby={d}
                      value={bed}
                      onChange={(e) => setBed(e.target.value)}
                    />
                  )}
                </Field>
              </>
            ) : null}
            <Field
              id={`${id}-file`}
              label="File"
              hint={
                kind === "monitor_csv"
                  ? "CSV with a header line time,spo2 and optionally pulse_rate."
                  : kind === "hl7"
                    ? "One ORU^R01 message (.hl7 or .txt)."
                    : "CSV with a header line; you choose the columns next."
              }
              error={fe("file")}
            >
              {(d, invalid) => (
                <input
                  id={`${id}-file`}
                  type="file"
                  accept={kind === "hl7" ? ".hl7,.txt,text/plain" : ".csv,text/csv,text/plain"}
                  className={inputClasses}
                  aria-invalid={invalid}
                  aria-describedby={d}
                  onChange={(e) => setFile(e.target.files?.[0] ?? null)}
                />
              )}
            </Field>
          </div>
          <div className="flex flex-wrap items-center gap-3">
            <Button type="submit" disabled={busy}>
              {busy ? "Checking…" : "Upload and check"}
            </Button>
            <p role="status" aria-live="polite" className="text-sm">
              {failure ? <span className="font-medium text-below">{failure.message}</span> : null}
            </p>
          </div>
        </fieldset>
      </form>
      {preview ? (
        <PreviewPanel preview={preview} onChange={setPreview} onImported={() => router.refresh()} />
      ) : null}
    </div>
  );
}

function PreviewPanel({
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
            <thead className="border-b border-border bg-surface-muted text-xs tracking-wide text-ink-muted uppercase">
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
            <thead className="border-b border-border bg-surface-muted text-xs tracking-wide text-ink-muted uppercase">
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

/** The mapping step: which column holds which value, and its unit. */
function MappingStep({
  preview,
  onChange,
}: {
  preview: ImportPreview;
  onChange: (p: ImportPreview) => void;
}) {
  const id = useId();
  const initial: BloodGasMapping = preview.mapping ?? { delimiter: ",", columns: {}, units: {} };
  const [mapping, setMapping] = useState<BloodGasMapping>(initial);
  const [busy, setBusy] = useState(false);
  const [failure, setFailure] = useState<string | null>(null);
  const errors = preview.mappingErrors ?? {};
  const header = preview.header ?? [];

  const check = async (e: React.FormEvent) => {
    e.preventDefault();
    setBusy(true);
    setFailure(null);
    const result = await send(`/api/v1/imports/${preview.id}`, {
      method: "PUT",
      headers: { "content-type": "application/json" },
      body: JSON.stringify(mapping),
    });
    setBusy(false);
    if (!result.ok) return setFailure(result.message);
    onChange(result.preview);
  };

  return (
    <form
      onSubmit={check}
      noValidate
      className="space-y-2 rounded-md border border-border p-3"
      aria-labelledby={`${id}-title`}
    >
      <h3 id={`${id}-title`} className="font-semibold">
        Columns and units
      </h3>
      <p className="text-sm text-ink-muted">
        Tidemark guessed these from the header line. Check each one; a wrong unit shows as rejected
        rows.
      </p>
      <fieldset disabled={busy} className="grid min-w-0 gap-x-4 sm:grid-cols-2 lg:grid-cols-3">
        {BLOOD_GAS_COLUMNS.map((c) => {
          const measured = c.key in MEASURED_FIELDS ? (c.key as MeasuredField) : null;
          const colError = errors[`columns.${c.key}`]?.join(" ");
          const unitError = errors[`units.${c.key}`]?.join(" ");
          return (
            <div key={c.key} className="flex gap-2">
              <div className="min-w-0 flex-1">
                <Field
                  id={`${id}-${c.key}`}
                  label={`${c.label}${c.required ? "" : " (optional)"}`}
                  error={colError}
                >
                  {(d, invalid) => (
                    <select
                      id={`${id}-${c.key}`}
                      className={inputClasses}
                      aria-invalid={invalid}
                      aria-describedby={d}
                      value={mapping.columns[c.key] ?? ""}
                      onChange={(e) =>
                        setMapping((m) => ({
                          ...m,
                          columns: { ...m.columns, [c.key]: e.target.value || undefined },
                        }))
                      }
                    >
                      <option value="">Not in the file</option>
                      {header.map((h) => (
                        <option key={h} value={h}>
                          {h}
                        </option>
                      ))}
                    </select>
                  )}
                </Field>
              </div>
              {measured && MEASURED_FIELDS[measured].units.length > 1 ? (
                <div className="w-32">
                  <Field id={`${id}-${c.key}-unit`} label="Unit" error={unitError}>
                    {(d, invalid) => (
                      <select
                        id={`${id}-${c.key}-unit`}
                        className={inputClasses}
                        aria-invalid={invalid}
                        aria-describedby={d}
                        value={
                          mapping.units[measured as keyof BloodGasMapping["units"]] ??
                          MEASURED_FIELDS[measured].units[0]
                        }
                        onChange={(e) =>
                          setMapping((m) => ({
                            ...m,
                            units: { ...m.units, [measured]: e.target.value as UcumCode },
                          }))
                        }
                      >
                        {(MEASURED_FIELDS[measured].units as readonly UcumCode[]).map((u) => (
                          <option key={u} value={u}>
                            {UNIT_LABELS[u]}
                          </option>
                        ))}
                      </select>
                    )}
                  </Field>
                </div>
              ) : null}
            </div>
          );
        })}
      </fieldset>
      <div className="flex flex-wrap items-center gap-3">
        <Button type="submit" variant="secondary" disabled={busy}>
          {busy ? "Checking…" : "Check again with these columns"}
        </Button>
        <p role="status" aria-live="polite" className="text-sm">
          {failure ? <span className="font-medium text-below">{failure}</span> : null}
        </p>
      </div>
    </form>
  );
}
