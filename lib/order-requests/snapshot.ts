import { DEVICE_PROFILES, type Device } from "../devices";

/** What a request carries of the bedside at the moment it was asked. Pure. */
export type RequestSnapshot = {
  settings: {
    device: Device;
    fio2: number;
    fio2Estimated: boolean;
    peep: number | null;
    flow: number | null;
  } | null;
  latestSpo2: { pct: number; takenAt: string } | null;
  order: {
    id: number;
    band: { lower: number; upper: number };
    fio2Max: number;
    peepMax: number | null;
    flowMax: number | null;
  } | null;
};

/** The settings in use, the latest SpO2 and the order's ceilings, in one line. */
export function snapshotWords(s: RequestSnapshot): string {
  const parts: string[] = [];
  if (s.settings) {
    const p = DEVICE_PROFILES[s.settings.device];
    const set = [
      p.label,
      `FiO2 ${s.settings.fio2.toFixed(2)}${s.settings.fio2Estimated ? " (estimated)" : ""}`,
      ...(s.settings.peep !== null && p.uses.peep ? [`PEEP ${s.settings.peep} cmH2O`] : []),
      ...(s.settings.flow !== null && p.uses.flow ? [`flow ${s.settings.flow} L/min`] : []),
    ];
    parts.push(set.join(", "));
  } else parts.push("no settings recorded");
  parts.push(s.latestSpo2 ? `latest SpO2 ${s.latestSpo2.pct} %` : "no SpO2 charted");
  if (s.order) {
    const max = [
      `FiO2 ≤ ${s.order.fio2Max.toFixed(2)}`,
      ...(s.order.peepMax !== null ? [`PEEP ≤ ${s.order.peepMax}`] : []),
      ...(s.order.flowMax !== null ? [`flow ≤ ${s.order.flowMax}`] : []),
    ];
    parts.push(
      `order #${s.order.id}: target ${s.order.band.lower}–${s.order.band.upper} %, ${max.join(", ")}`,
    );
  } else parts.push("no order in effect");
  return parts.join("; ");
}
