"use client";

import Link from "next/link";
import { useEffect, useRef } from "react";
import { formatPressureNumber } from "@/components/oxygenation/format";
import { OxygenationPanel } from "@/components/oxygenation/OxygenationPanel";
import { formatFio2Value, formatUnitTime } from "@/components/bedside/BedsideFormParts";
import { Button, buttonClasses } from "@/components/ui/Button";
import { IconCheck } from "@/components/ui/icons";
import type { BloodGasView } from "@/lib/blood-gases/service";
import type { BloodGasInput, PressureUnit } from "@/lib/oxygen";
import { DEVICE_PROFILES } from "@/lib/devices";

/**
 * A saved blood gas: what was stored, and for an arterial sample the indices
 * the server computed and stored with it, in the oxygenation panel.
 */
export function BloodGasResult({
  view,
  input,
  patientId,
  pressureUnit,
  timeZone,
  onAnother,
}: {
  view: BloodGasView;
  input: BloodGasInput;
  patientId: number;
  pressureUnit: PressureUnit;
  timeZone: string;
  onAnother: () => void;
}) {
  const heading = useRef<HTMLHeadingElement>(null);
  useEffect(() => {
    // Keyboard and screen-reader users land on the outcome, not on a vanished button.
    heading.current?.focus();
  }, []);
  const unit = pressureUnit;
  return (
    <div className="space-y-4" data-testid="blood-gas-saved">
      <section className="rounded-card border border-in-band/40 bg-surface p-4 shadow-card">
        <h2
          ref={heading}
          tabIndex={-1}
          className="flex items-center gap-2 text-base font-semibold text-in-band"
        >
          <IconCheck className="shrink-0" />
          {view.sampleType === "arterial" ? "Arterial" : "Venous"} blood gas saved
        </h2>
        <p className="tabular mt-1 text-sm">
          Sampled {formatUnitTime(view.sampledAt, timeZone)} on {DEVICE_PROFILES[view.device].label}
          , FiO2 {formatFio2Value(view.fio2)}
          {view.fio2Estimated ? " (estimated)" : ""}
          {view.peep !== null ? `, PEEP ${view.peep} cmH2O` : ""}: PaO2{" "}
          {formatPressureNumber(view.pao2, unit)} {unit}, PaCO2{" "}
          {formatPressureNumber(view.paco2, unit)} {unit}. Barometric pressure{" "}
          {view.barometricPressure} mmHg from the unit&apos;s altitude; engine {view.engineVersion}.
        </p>
        {view.sampleType === "venous" ? (
          <p className="mt-1 text-sm text-ink-muted">
            A venous PO2 says nothing about arterial oxygenation, so no oxygenation indices are
            computed for it.
          </p>
        ) : null}
        <div className="mt-3 flex flex-wrap gap-2">
          <Link href={`/patients/${patientId}`} className={buttonClasses("primary")}>
            Back to the Chart
          </Link>
          <Button variant="secondary" onClick={onAnother}>
            Enter another blood gas
          </Button>
        </div>
      </section>
      {view.assessment ? (
        <section aria-labelledby="stored-indices" className="space-y-2">
          <h2 id="stored-indices" className="text-lg font-semibold">
            Stored indices
          </h2>
          <OxygenationPanel assessment={view.assessment} input={input} pressureUnit={unit} />
        </section>
      ) : null}
    </div>
  );
}
