"use client";

import type { ReactNode } from "react";
import type { Basis, BloodGasAssessment, IndexValue, PressureUnit } from "@/lib/oxygen";
import { BasisDisclosure } from "./BasisDisclosure";
import { formatNumber, formatPressureNumber } from "./format";

function IndexCard({
  label,
  value,
  unit,
  basis,
  pressureUnit,
  children,
  wide = false,
}: {
  label: string;
  value: string;
  unit: string;
  basis: Basis;
  pressureUnit: PressureUnit;
  children?: ReactNode;
  wide?: boolean;
}) {
  return (
    <li
      className={`rounded-card border border-border bg-surface p-3 ${wide ? "sm:col-span-2" : ""}`}
      data-testid="oxygenation-index"
    >
      <p className="text-xs font-medium tracking-wide text-ink-muted">{label}</p>
      <p className="tabular mt-0.5">
        <span className="text-value">{value}</span>{" "}
        <span className="text-sm text-ink-muted">{unit}</span>
      </p>
      {children}
      <BasisDisclosure basis={basis} pressureUnit={pressureUnit} />
    </li>
  );
}

/** The indices section of the oxygenation panel: one card per index, each with its basis. */
export function OxygenationIndices({
  id,
  indices,
  pressureUnit,
}: {
  /** The panel's useId prefix, so the heading ids match the panel's. */
  id: string;
  indices: BloodGasAssessment["indices"];
  pressureUnit: PressureUnit;
}) {
  const unit = pressureUnit;
  const pressure = (v: IndexValue) => formatPressureNumber(v.value, unit);
  const content = indices.oxygenContent;
  return (
    <section aria-labelledby={`${id}-indices`} className="space-y-2">
      <h3 id={`${id}-indices`} className="text-base font-semibold">
        Indices
      </h3>
      <ul className="grid grid-cols-1 items-start gap-3 sm:grid-cols-2 lg:grid-cols-4">
        <IndexCard
          label="P/F ratio"
          value={pressure(indices.pfRatio)}
          unit={unit}
          basis={indices.pfRatio.basis}
          pressureUnit={unit}
        />
        {indices.sfRatio ? (
          <IndexCard
            label="S/F ratio"
            value={formatNumber(indices.sfRatio.value, 0)}
            unit="SpO2 % / FiO2"
            basis={indices.sfRatio.basis}
            pressureUnit={unit}
          />
        ) : null}
        <IndexCard
          label="Alveolar PO2 (PAO2)"
          value={pressure(indices.alveolarPO2)}
          unit={unit}
          basis={indices.alveolarPO2.basis}
          pressureUnit={unit}
        />
        <IndexCard
          label="A–a gradient"
          value={pressure(indices.alveolarArterialGradient)}
          unit={unit}
          basis={indices.alveolarArterialGradient.basis}
          pressureUnit={unit}
        >
          {indices.expectedAlveolarArterialGradient ? (
            <p className="text-xs text-ink-muted">
              Expected for age on room air ≈{" "}
              <span className="tabular">
                {pressure(indices.expectedAlveolarArterialGradient)} {unit}
              </span>{" "}
              (age/4 + 4)
            </p>
          ) : null}
        </IndexCard>
        <IndexCard
          label="a/A ratio"
          value={formatNumber(indices.arterialAlveolarRatio.value, 2)}
          unit="PaO2 / PAO2"
          basis={indices.arterialAlveolarRatio.basis}
          pressureUnit={unit}
        />
        {content ? (
          <IndexCard
            label="Arterial O2 content (CaO2)"
            value={formatNumber(content.total.value, 1)}
            unit={content.total.unit}
            basis={content.total.basis}
            pressureUnit={unit}
          >
            <dl className="tabular mt-1 grid grid-cols-[auto_auto] justify-start gap-x-3 text-xs">
              <dt className="text-ink-muted">Bound to Hb</dt>
              <dd>
                {formatNumber(content.bound.value, 1)} {content.bound.unit}
              </dd>
              <dt className="text-ink-muted">Dissolved</dt>
              <dd>
                {formatNumber(content.dissolved.value, 2)} {content.dissolved.unit}
              </dd>
              <dt className="text-ink-muted">Bound : dissolved</dt>
              <dd>{formatNumber(content.boundToDissolvedRatio.value, 0)} : 1</dd>
            </dl>
          </IndexCard>
        ) : null}
        {[
          { label: "O2 delivery (DO2)", index: indices.oxygenDelivery, digits: 0 },
          { label: "Oxygenation index (OI)", index: indices.oxygenationIndex, digits: 1 },
          { label: "O2 saturation index (OSI)", index: indices.oxygenSaturationIndex, digits: 1 },
          { label: "ROX index", index: indices.roxIndex, digits: 2 },
        ].map(({ label, index, digits }) =>
          // Shown only when the inputs it needs were given.
          index ? (
            <IndexCard
              key={label}
              label={label}
              value={formatNumber(index.value, digits)}
              unit={index.unit}
              basis={index.basis}
              pressureUnit={unit}
            />
          ) : null,
        )}
      </ul>
    </section>
  );
}
