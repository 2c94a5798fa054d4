import { DEVICE_PROFILES, type Device } from "@/lib/devices";
import type { OrderView } from "@/lib/orders/queries";
import type { OrderRequestInput, OrderRequestSource } from "@/lib/order-requests/schema";

// What a request starts from, wherever it is asked. Pure.

export type RequestStart = Omit<OrderRequestInput, "idempotencyKey">;

const f2 = (n: number) => n.toFixed(2);

/**
 * From a change refused at the order's limits: the typed values above the
 * limits become the proposed maxima and "what is needed"; the reason quotes
 * the latest SpO2 against the band.
 */
export function requestFromRefusal(
  patientId: number,
  order: Pick<OrderView, "device" | "limits" | "spo2Band">,
  typed: { fio2?: number | undefined; peep?: number | undefined; flow?: number | undefined },
  latestSpo2: number | null,
): RequestStart | null {
  const l = order.limits;
  const over = (v: number | undefined, max: number | null): v is number =>
    v !== undefined && Number.isFinite(v) && max !== null && v > max;
  const needs: string[] = [];
  const start: RequestStart = {
    patientId,
    source: "limit_refusal",
    device: order.device,
    need: "",
    reason: "",
  };
  if (over(typed.fio2, l.fio2Max) && typed.fio2 <= 1) {
    needs.push(`FiO2 up to ${f2(typed.fio2)} (order maximum ${f2(l.fio2Max)})`);
    start.fio2Max = Number(f2(typed.fio2));
  }
  if (over(typed.peep, l.peepMax)) {
    needs.push(`PEEP up to ${typed.peep} cmH2O (order maximum ${l.peepMax})`);
    start.peepMax = typed.peep;
  }
  if (over(typed.flow, l.flowMax)) {
    needs.push(`flow up to ${typed.flow} L/min (order maximum ${l.flowMax})`);
    start.flowMax = typed.flow;
  }
  const under = [
    typed.fio2 !== undefined && Number.isFinite(typed.fio2) && typed.fio2 < l.fio2Min
      ? `FiO2 down to ${f2(typed.fio2)}`
      : null,
    typed.peep !== undefined && l.peepMin !== null && typed.peep < l.peepMin
      ? `PEEP down to ${typed.peep} cmH2O`
      : null,
    typed.flow !== undefined && l.flowMin !== null && typed.flow < l.flowMin
      ? `flow down to ${typed.flow} L/min`
      : null,
  ].filter((x): x is string => x !== null);
  needs.push(...under);
  if (!needs.length) return null;
  start.need = `New limits: ${needs.join("; ")}`;
  start.reason = reasonWords(order, latestSpo2, under.length > 0 && needs.length === under.length);
  return start;
}

function reasonWords(
  order: Pick<OrderView, "device" | "spo2Band">,
  latestSpo2: number | null,
  weaning: boolean,
): string {
  const band = `target ${order.spo2Band.lower}–${order.spo2Band.upper} %`;
  const spo2 = latestSpo2 === null ? "No SpO2 charted yet" : `Latest SpO2 ${latestSpo2} %`;
  return weaning
    ? `${spo2} (${band}) on ${DEVICE_PROFILES[order.device].label}: ready to wean below the order's minimum.`
    : `${spo2} (${band}) on ${DEVICE_PROFILES[order.device].label}: the change needed is outside the order's limits.`;
}

/** From the "order limits reached" alert or the Chart: the device in use and a blank need. */
export function requestFromBedside(
  patientId: number,
  source: Exclude<OrderRequestSource, "limit_refusal">,
  device: Device | null,
  alertId?: number,
): RequestStart {
  return {
    patientId,
    source,
    ...(device ? { device } : {}),
    ...(alertId !== undefined ? { alertId } : {}),
    need:
      source === "limits_alert"
        ? "New limits: the order's maximum is reached and SpO2 is still low"
        : "",
    reason: "",
  };
}
