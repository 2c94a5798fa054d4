import Link from "next/link";
import { BasisDisclosure } from "@/components/oxygenation/BasisDisclosure";
import { buttonClasses } from "@/components/ui/Button";
import { EmptyState } from "@/components/ui/EmptyState";
import { StatusBadge } from "@/components/ui/StatusBadge";
import type { IndexValue, PressureUnit } from "@/lib/oxygen";
import { formatUnitTime } from "@/lib/time/zone";
import { breachWords, type Breach, type CheckIndices } from "@/lib/ventilation/evaluate";
import {
  tidalVolumeForTarget,
  VENT_MODE_LABELS,
  type VentilatorOrderSettings,
} from "@/lib/ventilation/settings";
import type { VentilatorCheckView } from "@/lib/ventilator-checks/queries";
import { VentilationTrend } from "./VentilationTrend";

/** Each computed value, and why it is missing when its inputs were not measured. */
const TILES: {
  key: keyof CheckIndices;
  label: string;
  digits: number;
  breach?: Breach["what"];
  missing: string;
}[] = [
  { key: "vtPerKg", label: "VT per kg PBW", digits: 1, breach: "vt_per_kg", missing: "" },
  {
    key: "drivingPressure",
    label: "Driving pressure",
    digits: 1,
    breach: "driving_pressure",
    missing: "Not computed: no plateau pressure recorded.",
  },
  {
    key: "staticCompliance",
    label: "Static compliance",
    digits: 1,
    missing: "Not computed: no plateau pressure recorded.",
  },
  {
    key: "mechanicalPower",
    label: "Mechanical power",
    digits: 1,
    missing: "Not computed: needs both peak and plateau pressure.",
  },
  {
    key: "ventilatoryRatio",
    label: "Ventilatory ratio",
    digits: 2,
    missing: "Not computed: no arterial PaCO2 in the 6 hours before the check.",
  },
];

function Tile({
  label,
  value,
  digits,
  beyond,
  missing,
  pressureUnit,
}: {
  missing: string;
  label: string;
  value: IndexValue | undefined;
  digits: number;
  beyond: Breach | undefined;
  pressureUnit: PressureUnit;
}) {
  return (
    // An opened basis takes the whole row, so its words have room on a phone.
    <div
      className="min-w-0 rounded-md border border-border p-2 has-[[data-open]]:col-span-full"
      data-testid="ventilation-tile"
    >
      <p className="text-xs text-ink-muted">{label}</p>
      {value ? (
        <>
          <p className="tabular text-lg font-semibold">
            {value.value.toFixed(digits)}{" "}
            <span className="text-xs font-normal text-ink-muted">
              {value.unit === "ratio" ? "" : value.unit}
            </span>
          </p>
          {beyond ? <StatusBadge status="above" label={`Above limit ${beyond.limit}`} /> : null}
          <BasisDisclosure basis={value.basis} pressureUnit={pressureUnit} />
        </>
      ) : (
        <p className="text-sm text-ink-muted">{missing}</p>
      )}
    </div>
  );
}

/**
 * The Chart's ventilation panel: the ventilator order's settings, the latest
 * check with what Tidemark computed (each with its basis) and whether it is
 * within the order's lung-protective limits, and the trend over the checks.
 */
export function VentilationPanel({
  patientId,
  ventilator,
  checks,
  timeZone,
  pressureUnit,
  mayRecord,
}: {
  patientId: number;
  ventilator: VentilatorOrderSettings | null;
  /** Newest first. */
  checks: VentilatorCheckView[];
  timeZone: string;
  pressureUnit: PressureUnit;
  mayRecord: boolean;
}) {
  const latest = checks[0];
  return (
    <section
      aria-labelledby="ventilation-heading"
      className="space-y-3"
      data-testid="ventilation-panel"
    >
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 id="ventilation-heading" className="text-lg font-semibold">
          Ventilation
        </h2>
        {mayRecord && ventilator ? (
          <Link
            href={`/patients/${patientId}/ventilator-checks/new`}
            className={buttonClasses("secondary")}
          >
            Record ventilator check
          </Link>
        ) : null}
      </div>
      <div className="space-y-4 rounded-card border border-border bg-surface p-4 shadow-card">
        {ventilator ? (
          <p className="text-sm" data-testid="ventilation-order">
            {VENT_MODE_LABELS[ventilator.mode]}, VT {ventilator.vtTargetMlKg} mL/kg PBW ={" "}
            <span className="tabular">
              {tidalVolumeForTarget(ventilator.vtTargetMlKg, ventilator.pbwKg)} mL
            </span>{" "}
            (range {ventilator.vtMinMlKg}–{ventilator.vtMaxMlKg}), rate {ventilator.rateMin}–
            {ventilator.rateMax} /min; limits: plateau ≤ {ventilator.plateauLimit}, driving pressure
            ≤ {ventilator.drivingLimit} cmH2O.
          </p>
        ) : (
          <p className="text-sm text-ink-muted">
            No ventilator order in effect; the checks below are from earlier.
          </p>
        )}
        {!latest ? (
          <EmptyState title="No ventilator check yet">
            A therapist or physician records the measured volumes and pressures; Tidemark computes
            VT per kg, driving pressure, compliance, mechanical power and the ventilatory ratio.
          </EmptyState>
        ) : (
          <div className="space-y-2" data-testid="ventilation-latest">
            <div className="flex flex-wrap items-center gap-2 text-sm">
              <span className="font-medium">
                Latest check {formatUnitTime(latest.checkedAt, timeZone)} (unit time),{" "}
                {latest.recordedBy.name}
              </span>
              {latest.breaches.length ? (
                <StatusBadge status="above" label="Beyond lung-protective limits" />
              ) : (
                <StatusBadge status="in-band" label="Within limits" />
              )}
            </div>
            {latest.breaches.length ? (
              <p className="text-sm font-medium text-above">
                {latest.breaches.map(breachWords).join("; ")}
              </p>
            ) : null}
            <p className="tabular text-sm text-ink-muted">
              VT {latest.measuredVt} mL{latest.setVt !== null ? ` (set ${latest.setVt})` : ""}, rate{" "}
              {latest.measuredRate} /min{latest.setRate !== null ? ` (set ${latest.setRate})` : ""}
              {latest.minuteVentilation !== null ? `, VE ${latest.minuteVentilation} L/min` : ""}
              {latest.peak !== null ? `, peak ${latest.peak}` : ""}
              {latest.plateau !== null ? `, plateau ${latest.plateau}` : ""}, total PEEP{" "}
              {latest.totalPeep} cmH2O
              {latest.paco2 ? `, PaCO2 ${latest.paco2.value} mmHg` : ", no recent arterial PaCO2"}
            </p>
            <div className="grid grid-cols-2 gap-2 sm:grid-cols-3 lg:grid-cols-5">
              {TILES.map((t) => (
                <Tile
                  key={t.key}
                  label={t.label}
                  value={latest.indices[t.key]}
                  digits={t.digits}
                  missing={t.missing}
                  beyond={latest.breaches.find((b) => b.what === t.breach)}
                  pressureUnit={pressureUnit}
                />
              ))}
            </div>
          </div>
        )}
        {checks.length ? <VentilationTrend checks={checks} timeZone={timeZone} /> : null}
      </div>
    </section>
  );
}
