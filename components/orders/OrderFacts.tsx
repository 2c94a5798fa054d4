import type { ReactNode } from "react";
import { StatusBadge, type Status } from "@/components/ui/StatusBadge";
import { DEVICE_PROFILES } from "@/lib/devices";
import type { OrderStatus, OrderView } from "@/lib/orders/queries";
import { fromMmHg, type PressureUnit } from "@/lib/oxygen";
import { waitingWords } from "@/lib/orders/waiting";
import {
  tidalVolumeForTarget,
  VENT_MODE_LABELS,
  type VentilatorOrderSettings,
} from "@/lib/ventilation/settings";

/** The order states in the product's words. */
export const ORDER_STATUS_LABELS: Record<OrderStatus, string> = {
  draft: "Draft",
  awaiting_cosign: "Awaiting co-sign",
  active: "Active",
  superseded: "Superseded",
  discontinued: "Discontinued",
};

const STATUS_LOOK: Record<OrderStatus, Status> = {
  draft: "neutral",
  awaiting_cosign: "overdue",
  active: "in-band",
  superseded: "neutral",
  discontinued: "neutral",
};

/** An order's state by word and icon as well as colour. */
export function OrderStatusBadge({ status }: { status: OrderStatus }) {
  return <StatusBadge status={STATUS_LOOK[status]} label={ORDER_STATUS_LABELS[status]} />;
}

export const ENTRY_MODE_LABELS: Record<OrderView["entryMode"], string> = {
  written: "Written and signed by the prescriber",
  verbal: "Verbal order, read back",
  telephone: "Telephone order, read back",
};

/** A fraction with its percentage beside it: "0.40 (40 %)". */
export function formatFio2(value: number): string {
  return `${value.toFixed(2)} (${Math.round(value * 100)} %)`;
}

export function formatFio2Range(min: number, max: number): string {
  return `${min.toFixed(2)}–${max.toFixed(2)} (${Math.round(min * 100)}–${Math.round(max * 100)} %)`;
}

/** A PaO2 band in the reader's unit; kPa readers also see the stored mmHg. */
export function formatPao2Band(band: { lower: number; upper: number }, unit: PressureUnit): string {
  if (unit === "mmHg") return `${band.lower}–${band.upper} mmHg`;
  const kpa = (v: number) => fromMmHg(v, "kPa").toFixed(1);
  return `${kpa(band.lower)}–${kpa(band.upper)} kPa (${band.lower}–${band.upper} mmHg)`;
}

/** A moment in the unit's time zone, to the second, with the zone named. */
export function formatOrderTime(iso: string | Date, timeZone: string): string {
  const date = typeof iso === "string" ? new Date(iso) : iso;
  return new Intl.DateTimeFormat("en-GB", {
    timeZone,
    day: "2-digit",
    month: "short",
    year: "numeric",
    hour: "2-digit",
    minute: "2-digit",
    second: "2-digit",
    hourCycle: "h23",
    timeZoneName: "short",
  }).format(date);
}

/** A waiting time in words: "45 min", "3 h 10 min", "2 d 4 h". */
export function formatDuration(ms: number): string {
  return waitingWords(ms);
}

function Row({ term, children }: { term: string; children: ReactNode }) {
  return (
    <>
      <dt className="text-ink-muted">{term}</dt>
      <dd className="min-w-0 break-words">{children}</dd>
    </>
  );
}

/** The ventilator part of an order, the tidal volume also in mL for this patient. */
function VentilatorFacts({ settings: v }: { settings: VentilatorOrderSettings }) {
  const ml = (perKg: number) => tidalVolumeForTarget(perKg, v.pbwKg);
  return (
    <>
      <Row term="Mode">{VENT_MODE_LABELS[v.mode]}</Row>
      <Row term="Tidal volume">
        <span className="tabular" data-testid="order-vt">
          {v.vtTargetMlKg} mL/kg PBW = {ml(v.vtTargetMlKg)} mL (range {v.vtMinMlKg}–{v.vtMaxMlKg}{" "}
          mL/kg, {ml(v.vtMinMlKg)}–{ml(v.vtMaxMlKg)} mL)
        </span>
        <span className="block text-xs text-ink-muted">
          Predicted body weight {v.pbwKg.toFixed(1)} kg from a height of {v.heightCm} cm (ARDS
          Network equation)
        </span>
      </Row>
      <Row term="Rate">
        <span className="tabular">
          {v.rateMin}–{v.rateMax} /min
        </span>
      </Row>
      <Row term="Lung-protective limits">
        <span className="tabular">
          plateau ≤ {v.plateauLimit} cmH2O, driving pressure ≤ {v.drivingLimit} cmH2O
        </span>
      </Row>
    </>
  );
}

/** Every prescribed field of an order, units beside values. */
export function OrderFacts({
  order,
  stepTableName,
  pressureUnit,
}: {
  order: OrderView;
  stepTableName: string | null;
  pressureUnit: PressureUnit;
}) {
  const profile = DEVICE_PROFILES[order.device];
  const { limits, initial } = order;
  return (
    <dl className="grid grid-cols-[minmax(7rem,auto)_1fr] gap-x-4 gap-y-1.5 text-sm">
      <Row term="Device">{profile.label}</Row>
      <Row term="SpO2 target band">
        <span className="tabular">
          {order.spo2Band.lower}–{order.spo2Band.upper} %
        </span>
      </Row>
      <Row term="PaO2 band">
        {order.pao2Band ? (
          <span className="tabular">{formatPao2Band(order.pao2Band, pressureUnit)}</span>
        ) : (
          <span className="text-ink-muted">Not set</span>
        )}
      </Row>
      <Row term="FiO2 limits">
        <span className="tabular">{formatFio2Range(limits.fio2Min, limits.fio2Max)}</span>
        {profile.uses.fio2 === "estimated" ? (
          <span className="ml-1 text-xs text-ink-muted">(estimated from flow)</span>
        ) : null}
      </Row>
      {limits.peepMin !== null && limits.peepMax !== null ? (
        <Row term="PEEP limits">
          <span className="tabular">
            {limits.peepMin}–{limits.peepMax} cmH2O
          </span>
        </Row>
      ) : null}
      {limits.flowMin !== null && limits.flowMax !== null ? (
        <Row term="Flow limits">
          <span className="tabular">
            {limits.flowMin}–{limits.flowMax} L/min
          </span>
        </Row>
      ) : null}
      <Row term="Starting settings">
        <span className="tabular">
          FiO2 {formatFio2(initial.fio2)}
          {initial.peep !== null ? `, PEEP ${initial.peep} cmH2O` : ""}
          {initial.flow !== null ? `, flow ${initial.flow} L/min` : ""}
        </span>
      </Row>
      {order.ventilator ? <VentilatorFacts settings={order.ventilator} /> : null}
      <Row term="Step table">{stepTableName ?? <span className="text-ink-muted">None</span>}</Row>
      <Row term="Reassess every">
        <span className="tabular">{order.reassessMinutes} min</span>
      </Row>
      <Row term="Rationale">
        <span className="whitespace-pre-line">{order.rationale}</span>
      </Row>
      <Row term="Entry">{ENTRY_MODE_LABELS[order.entryMode]}</Row>
      <Row term="Prescriber">{order.prescriber.name}</Row>
      {order.entryMode !== "written" ? <Row term="Entered by">{order.enteredBy.name}</Row> : null}
    </dl>
  );
}
