"use client";

import { Disclosure, DisclosureButton, DisclosurePanel } from "@headlessui/react";
import { IconChevronDown } from "@/components/ui/icons";
import type { Basis, PressureUnit } from "@/lib/oxygen";
import { formatBasisInput } from "./format";

/**
 * "Basis" one click away: the inputs, formula, source and
 * assumptions behind a number, so a clinician can check it by hand. A native
 * button; its accessible name says whose basis it is.
 */
export function BasisDisclosure({
  basis,
  pressureUnit,
  className = "mt-1.5",
}: {
  basis: Basis;
  pressureUnit: PressureUnit;
  className?: string;
}) {
  const inputs = Object.entries(basis.inputs);
  return (
    <Disclosure as="div" className={className}>
      <DisclosureButton
        aria-label={`Basis of ${basis.name}`}
        className="group inline-flex items-center gap-1 rounded text-xs font-medium text-accent hover:underline"
      >
        Basis
        <IconChevronDown
          aria-hidden
          className="transition-transform group-data-[open]:rotate-180"
        />
      </DisclosureButton>
      <DisclosurePanel className="mt-1.5 rounded-md border border-border bg-surface-muted p-2 text-xs text-ink">
        <dl className="grid grid-cols-[auto_minmax(0,1fr)] gap-x-2 gap-y-1">
          <dt className="font-medium text-ink-muted">Formula</dt>
          <dd className="font-mono break-words">{basis.formula}</dd>
          {inputs.length > 0 ? (
            <>
              <dt className="font-medium text-ink-muted">Inputs</dt>
              <dd>
                <ul className="tabular">
                  {inputs.map(([name, input]) => (
                    <li key={name}>
                      {name} = {formatBasisInput(input.value, input.unit, pressureUnit)}
                      {input.unit === "fraction" ? (
                        <span className="text-ink-muted"> (fraction)</span>
                      ) : null}
                    </li>
                  ))}
                </ul>
              </dd>
            </>
          ) : null}
          <dt className="font-medium text-ink-muted">Source</dt>
          <dd>{basis.source}</dd>
          {basis.assumptions.length > 0 ? (
            <>
              <dt className="font-medium text-ink-muted">Assumes</dt>
              <dd>
                <ul className="list-disc space-y-0.5 pl-4">
                  {basis.assumptions.map((a) => (
                    <li key={a}>{a}</li>
                  ))}
                </ul>
              </dd>
            </>
          ) : null}
        </dl>
      </DisclosurePanel>
    </Disclosure>
  );
}
