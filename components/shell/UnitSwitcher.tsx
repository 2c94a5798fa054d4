"use client";

import { Listbox, ListboxButton, ListboxOption, ListboxOptions } from "@headlessui/react";
import { useRouter } from "next/navigation";
import { useState, useTransition } from "react";
import { selectUnitAction } from "@/lib/preferences/actions";
import { IconChevronDown } from "@/components/ui/icons";

type UnitOption = { id: number; code: string; name: string };

/** Chooses which of the user's units the pages show. */
export function UnitSwitcher({ units, value }: { units: UnitOption[]; value: string }) {
  const router = useRouter();
  const [selected, setSelected] = useState(value);
  const [error, setError] = useState<string | null>(null);
  const [pending, startTransition] = useTransition();
  const options = [
    { value: "all", label: "All my units" },
    ...units.map((u) => ({ value: String(u.id), label: `${u.code} · ${u.name}` })),
  ];
  const current = options.find((o) => o.value === selected) ?? options[0]!;

  const choose = (next: string) => {
    const previous = selected;
    setSelected(next);
    startTransition(async () => {
      const result = await selectUnitAction(next);
      if (!result.ok) {
        setSelected(previous);
        setError(result.message);
        return;
      }
      setError(null);
      router.refresh();
    });
  };

  if (units.length === 0) {
    return <span className="text-sm text-ink-muted">No units assigned</span>;
  }
  return (
    <div className="relative">
      <Listbox value={selected} onChange={choose}>
        <ListboxButton
          aria-label={`Unit: ${current.label}`}
          className="flex min-w-44 items-center justify-between gap-2 rounded-md border border-border-strong bg-surface px-2.5 py-1.5 text-sm"
        >
          <span>{current.label}</span>
          <IconChevronDown aria-hidden className={pending ? "animate-pulse" : ""} />
        </ListboxButton>
        <ListboxOptions
          anchor="bottom end"
          className="z-40 mt-1 w-56 rounded-md border border-border bg-surface p-1 shadow-card focus:outline-none"
        >
          {options.map((o) => (
            <ListboxOption
              key={o.value}
              value={o.value}
              className="cursor-pointer rounded px-2 py-1.5 text-sm data-[focus]:bg-accent-soft data-[selected]:font-semibold"
            >
              {o.label}
            </ListboxOption>
          ))}
        </ListboxOptions>
      </Listbox>
      {error ? (
        <p role="alert" className="absolute right-0 mt-1 text-xs text-below">
          {error}
        </p>
      ) : null}
    </div>
  );
}
