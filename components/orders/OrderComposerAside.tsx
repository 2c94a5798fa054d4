"use client";

import Link from "next/link";
import { DEVICE_PROFILES } from "@/lib/devices";
import type { OrderView } from "@/lib/orders/queries";
import type { PressureUnit } from "@/lib/oxygen";
import {
  BAND_CHOICES,
  CUSTOM,
  percentOf,
  type ComposerValues,
  type StepTableChoice,
} from "./order-form";
import { formatFio2Range, formatOrderTime, OrderStatusBadge } from "./OrderFacts";
import { mlFor, type OrderBodyWeight } from "./VentilationFields";
import { isVentilatorDevice, VENT_MODE_LABELS } from "@/lib/ventilation/settings";

/** The order in effect, which the new one replaces. */
export function OrderInEffect({
  currentOrder,
  currentStepTableName,
  timeZone,
  patientName,
}: {
  currentOrder: OrderView | null;
  currentStepTableName: string | null;
  timeZone: string;
  patientName: string;
}) {
  const card = "rounded-card border border-border bg-surface p-4 shadow-card";

  return (
    <section className={card} aria-labelledby="order-current-heading" data-testid="order-in-effect">
      <h2 id="order-current-heading" className="text-sm font-semibold">
        Order in effect
      </h2>
      {currentOrder ? (
        <div className="mt-2 space-y-2 text-sm">
          <div className="flex flex-wrap items-center gap-2">
            <Link
              href={`/orders/${currentOrder.id}`}
              className="font-medium text-accent underline-offset-2 hover:underline"
            >
              Order #{currentOrder.id}
            </Link>
            <OrderStatusBadge status={currentOrder.status} />
          </div>
          <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5">
            <dt className="text-ink-muted">Device</dt>
            <dd>{DEVICE_PROFILES[currentOrder.device].label}</dd>
            <dt className="text-ink-muted">SpO2</dt>
            <dd className="tabular">
              {currentOrder.spo2Band.lower}–{currentOrder.spo2Band.upper} %
            </dd>
            <dt className="text-ink-muted">FiO2</dt>
            <dd className="tabular">
              {formatFio2Range(currentOrder.limits.fio2Min, currentOrder.limits.fio2Max)}
            </dd>
            {currentOrder.limits.peepMin !== null ? (
              <>
                <dt className="text-ink-muted">PEEP</dt>
                <dd className="tabular">
                  {currentOrder.limits.peepMin}–{currentOrder.limits.peepMax} cmH2O
                </dd>
              </>
            ) : null}
            {currentOrder.limits.flowMin !== null ? (
              <>
                <dt className="text-ink-muted">Flow</dt>
                <dd className="tabular">
                  {currentOrder.limits.flowMin}–{currentOrder.limits.flowMax} L/min
                </dd>
              </>
            ) : null}
            <dt className="text-ink-muted">Step table</dt>
            <dd>{currentStepTableName ?? "None"}</dd>
            <dt className="text-ink-muted">Prescriber</dt>
            <dd>{currentOrder.prescriber.name}</dd>
            <dt className="text-ink-muted">Since</dt>
            <dd className="tabular">{formatOrderTime(currentOrder.createdAt, timeZone)}</dd>
          </dl>
          <p className="text-xs text-ink-muted">
            Yours replaces it: order #{currentOrder.id} becomes superseded.
          </p>
        </div>
      ) : (
        <p className="mt-2 text-sm text-ink-muted">No order in effect for {patientName}.</p>
      )}
    </section>
  );
}

/** The order in words as it stands in the form: what is signed, or read back. */
export function OrderReadBack({
  values,
  pressureUnit,
  stepTables,
  bodyWeight = null,
}: {
  values: Partial<ComposerValues>;
  pressureUnit: PressureUnit;
  stepTables: StepTableChoice[];
  bodyWeight?: OrderBodyWeight;
}) {
  const device = values.device ?? "";
  const profile = device === "" ? null : DEVICE_PROFILES[device];
  const band = BAND_CHOICES.find((b) => b.value === values.bandChoice);
  const show = (t: string | undefined) => (t && t.trim() !== "" ? t.trim() : "—");
  const range = (
    min: string | undefined,
    max: string | undefined,
    start: string | undefined,
    unit: string,
  ) => `${show(min)}–${show(max)} ${unit}, start ${show(start)} ${unit}`;
  const lines: [string, string][] = [];
  lines.push(["Device", profile?.label ?? "—"]);
  lines.push([
    "SpO2 band",
    band
      ? `${band.lower}–${band.upper} %`
      : `${show(values.spo2Lower)}–${show(values.spo2Upper)} %`,
  ]);
  if (values.pao2Lower || values.pao2Upper) {
    lines.push([
      "PaO2 band",
      `${show(values.pao2Lower)}–${show(values.pao2Upper)} ${pressureUnit}`,
    ]);
  }
  if (profile) {
    lines.push([
      "FiO2",
      `${show(values.fio2Min)}–${show(values.fio2Max)}, start ${show(values.initialFio2)} (${percentOf(values.initialFio2 ?? "")})`,
    ]);
    if (profile.uses.peep)
      lines.push(["PEEP", range(values.peepMin, values.peepMax, values.initialPeep, "cmH2O")]);
    if (profile.uses.flow)
      lines.push(["Flow", range(values.flowMin, values.flowMax, values.initialFlow, "L/min")]);
  }
  if (device !== "" && isVentilatorDevice(device)) {
    lines.push(["Mode", values.ventMode ? VENT_MODE_LABELS[values.ventMode] : "—"]);
    lines.push([
      "Tidal volume",
      `${show(values.vtTarget)} mL/kg PBW (${mlFor(values.vtTarget, bodyWeight)}), range ${show(values.vtMin)}–${show(values.vtMax)} mL/kg`,
    ]);
    lines.push(["Rate", `${show(values.rateMin)}–${show(values.rateMax)} /min`]);
    lines.push([
      "Limits",
      `plateau ≤ ${show(values.plateauLimit)}, driving pressure ≤ ${show(values.drivingLimit)} cmH2O`,
    ]);
  }
  const table = stepTables.find((t) => String(t.id) === values.stepTableId);
  lines.push(["Step table", table?.name ?? "None"]);
  lines.push([
    "Reassess",
    values.reassessChoice === CUSTOM
      ? `every ${show(values.reassessCustom)} min`
      : `every ${values.reassessChoice ?? "—"} min`,
  ]);
  return (
    <section
      className="rounded-card border border-border bg-surface p-4 shadow-card"
      aria-labelledby="order-readback-heading"
    >
      <h2 id="order-readback-heading" className="text-sm font-semibold">
        Your order, in words
      </h2>
      <dl
        className="mt-2 grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5 text-sm"
        data-testid="order-read-back"
      >
        {lines.map(([term, value]) => (
          <div key={term} className="contents">
            <dt className="text-ink-muted">{term}</dt>
            <dd className="tabular min-w-0 break-words">{value}</dd>
          </div>
        ))}
      </dl>
    </section>
  );
}
