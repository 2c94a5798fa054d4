import type {
  AdjustmentEvent,
  AdmissionEvents,
  BloodGasEvent,
  OrderChangeEvent,
} from "@/lib/forecast-accuracy";
import type { Fio2Forecast } from "@/lib/oxygen/forecast";

/** Minutes after 08:00 UTC on 2026-03-02: every test's clock. */
export const t = (minutes: number): Date => new Date(Date.UTC(2026, 2, 2, 8, 0) + minutes * 60_000);

/**
 * A stored forecast with hand-picked PaO2s per model (mmHg); the range is
 * their spread, as the engine makes it. SpO2s are not read by the library's
 * pairing and are set to 0 so nothing can depend on them by accident.
 */
export function forecast(pf: number, alveolarArterialRatio: number, shunt: number): Fio2Forecast {
  const at = (pao2: number) => ({ pao2, spo2: 0 });
  return {
    models: { pf: at(pf), alveolarArterialRatio: at(alveolarArterialRatio), shunt: at(shunt) },
    range: {
      low: at(Math.min(pf, alveolarArterialRatio, shunt)),
      high: at(Math.max(pf, alveolarArterialRatio, shunt)),
    },
    alveolarPO2: { current: 300, next: 250 },
    shuntFraction: 0.2,
    caveats: [],
    assumptions: [],
  };
}

/** An FiO2 change 0.50 → 0.40 at `minutes`, on a ventilator with PEEP 8 kept, with a forecast of 80/85/90 mmHg unless given. */
export function change(
  id: number,
  minutes: number,
  over: Partial<Omit<AdjustmentEvent, "id" | "appliedAt">> = {},
): AdjustmentEvent {
  return {
    id,
    appliedAt: t(minutes),
    fromFio2: 0.5,
    toFio2: 0.4,
    fromPeep: 8,
    toPeep: 8,
    device: "invasive",
    forecast: forecast(80, 85, 90),
    ...over,
  };
}

export const arterial = (id: number, minutes: number, pao2 = 84): BloodGasEvent => ({
  id,
  sampledAt: t(minutes),
  sampleType: "arterial",
  pao2,
});

export const venous = (id: number, minutes: number, pao2 = 40): BloodGasEvent => ({
  id,
  sampledAt: t(minutes),
  sampleType: "venous",
  pao2,
});

export const orderChange = (minutes: number): OrderChangeEvent => ({ at: t(minutes) });

export function events(
  adjustments: AdjustmentEvent[],
  bloodGases: BloodGasEvent[] = [],
  orderChanges: OrderChangeEvent[] = [],
): AdmissionEvents {
  return { adjustments, bloodGases, orderChanges };
}
