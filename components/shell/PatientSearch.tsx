"use client";

import { Combobox, ComboboxInput, ComboboxOption, ComboboxOptions } from "@headlessui/react";
import { useRouter } from "next/navigation";
import { useEffect, useState } from "react";
import useSWR from "swr";
import { getApiJson } from "@/components/ui/api-json";
import type { PatientHit } from "@/lib/admissions/queries";

/**
 * The header's patient search: MRN, name or bed on the user's units. Arrow
 * keys move through the hits, Enter opens the Chart, Escape closes the list.
 */
export function PatientSearch() {
  const router = useRouter();
  const [query, setQuery] = useState("");
  // Asks the server once typing pauses, not on every key.
  const [deferred, setDeferred] = useState("");
  useEffect(() => {
    const timer = setTimeout(() => setDeferred(query.trim()), 250);
    return () => clearTimeout(timer);
  }, [query]);
  const { data, error, isLoading } = useSWR<{ patients: PatientHit[] }, Error>(
    deferred.length >= 2 ? `/api/v1/patients?query=${encodeURIComponent(deferred)}` : null,
    (url: string) => getApiJson<{ patients: PatientHit[] }>(url, "the patient search"),
    { keepPreviousData: true },
  );
  const hits = data?.patients ?? [];
  const open = (hit: PatientHit | null) => {
    if (!hit) return;
    setQuery("");
    router.push(`/patients/${hit.patientId}`);
  };
  return (
    <div className="relative w-56" data-testid="patient-search">
      <Combobox<PatientHit | null> value={null} onChange={open}>
        <ComboboxInput
          aria-label="Find a patient"
          title="Find a patient of your units by MRN, name or bed"
          placeholder="Find patient (MRN, name, bed)"
          autoComplete="off"
          className="w-full rounded-md border border-border-strong bg-surface px-2.5 py-1 text-sm text-ink placeholder:text-ink-muted"
          onChange={(e) => setQuery(e.target.value)}
          displayValue={() => query}
        />
        {deferred.length >= 2 ? (
          // Not modal: a search in the header must never freeze the page behind it.
          <ComboboxOptions
            static
            modal={false}
            className="absolute z-30 mt-1 max-h-80 w-80 overflow-auto rounded-md border border-border bg-surface py-1 text-sm shadow-card"
          >
            {error ? (
              <p className="px-3 py-2 text-below">{error.message}</p>
            ) : isLoading && !data ? (
              <p className="px-3 py-2 text-ink-muted">Searching…</p>
            ) : hits.length === 0 ? (
              <p className="px-3 py-2 text-ink-muted">No patient on your units matches.</p>
            ) : (
              hits.map((hit) => (
                <ComboboxOption
                  key={hit.patientId}
                  value={hit}
                  className="cursor-pointer px-3 py-1.5 data-[focus]:bg-accent-soft"
                >
                  <span className="font-medium">{hit.name}</span>{" "}
                  <span className="tabular text-ink-muted">
                    MRN {hit.mrn} ·{" "}
                    {hit.dischargedAt
                      ? `discharged ${hit.dischargedAt.slice(0, 10)}`
                      : `${hit.unitCode} ${hit.bedLabel}`}
                  </span>
                </ComboboxOption>
              ))
            )}
          </ComboboxOptions>
        ) : null}
      </Combobox>
    </div>
  );
}
