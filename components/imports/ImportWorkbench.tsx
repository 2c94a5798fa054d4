"use client";

import { useRouter } from "next/navigation";
import { useId, useState } from "react";
import { useHydrated } from "@/components/bedside/BedsideFormParts";
import { Button } from "@/components/ui/Button";
import { Field, inputClasses } from "@/components/ui/Field";
import {
  CSV_DELIMITERS,
  IMPORT_KIND_LABELS,
  IMPORT_KINDS,
  type ImportKind,
} from "@/lib/imports/kinds";
import type { ImportPreview } from "@/lib/imports/report";
import { send, type ApiFailure } from "./import-request";
import { PreviewPanel } from "./PreviewPanel";

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
