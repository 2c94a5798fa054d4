import { DEVICE_PROFILES } from "../devices";
import type { OrderView } from "../orders/queries";

// What changed in an order, in words, for the bed's nurse and therapist. Pure.

export type OrderChangeEvent = "new" | "supersede" | "discontinue";

type Shape = Pick<OrderView, "id" | "device" | "spo2Band" | "limits" | "reassessMinutes">;

const f2 = (n: number) => n.toFixed(2);
const range = (min: number | null, max: number | null, unit: string) =>
  min === null || max === null ? null : `${min}–${max} ${unit}`;

/** The parts of an order a bedside change is held to, each as words. */
function parts(o: Shape): Record<string, string | null> {
  return {
    device: DEVICE_PROFILES[o.device].label,
    band: `target SpO2 ${o.spo2Band.lower}–${o.spo2Band.upper} %`,
    fio2: `FiO2 ${f2(o.limits.fio2Min)}–${f2(o.limits.fio2Max)}`,
    peep: range(o.limits.peepMin, o.limits.peepMax, "cmH2O"),
    flow: range(o.limits.flowMin, o.limits.flowMax, "L/min"),
    reassess: `reassess every ${o.reassessMinutes} min`,
  };
}

const NAMES: Record<string, string> = {
  device: "device",
  band: "band",
  fio2: "FiO2 limits",
  peep: "PEEP limits",
  flow: "flow limits",
  reassess: "reassessment",
};

/** The whole order in one line: device, band, limits, interval. */
export function orderWords(o: Shape): string {
  return Object.values(parts(o))
    .filter((p): p is string => p !== null)
    .join(", ");
}

/**
 * A new order, one that replaces another (only what differs, before → after),
 * or a discontinued one (with its reason), in one or two sentences.
 */
export function describeOrderChange(
  event: OrderChangeEvent,
  order: Shape,
  before: Shape | null,
  reason?: string,
): string {
  if (event === "discontinue")
    return `Order #${order.id} was discontinued${reason ? `: ${reason}` : ""}. No order is in effect now; settings may not be changed until a new one is written.`;
  if (event === "new" || before === null) return `New order #${order.id}: ${orderWords(order)}.`;
  const a = parts(before);
  const b = parts(order);
  const changed = Object.keys(b).flatMap((k) => {
    if (a[k] === b[k]) return [];
    if (a[k] === null) return [`${NAMES[k]} now ${b[k]}`];
    if (b[k] === null) return [`no ${NAMES[k]} (was ${a[k]})`];
    return [`${NAMES[k]} ${a[k]} → ${b[k]}`];
  });
  return changed.length
    ? `Order #${order.id} replaces #${before.id}: ${changed.join("; ")}.`
    : `Order #${order.id} replaces #${before.id} with the same device, band and limits.`;
}
