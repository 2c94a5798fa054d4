import type { OrderInput } from "@/lib/orders/schema";

/**
 * A written, signed high-flow order the integration tests share: SpO2 92–96 %,
 * FiO2 0.30–0.60, flow 30–60 L/min, starting at 0.40 and 40 L/min, reassessed
 * every 30 min. Invented; override what a test is about.
 */
export function hfncOrder(patientId: number, overrides: Partial<OrderInput> = {}): OrderInput {
  return {
    entryMode: "written",
    password: "tidemark-demo",
    patientId,
    device: "hfnc",
    spo2Lower: 92,
    spo2Upper: 96,
    fio2Min: 0.3,
    fio2Max: 0.6,
    flowMin: 30,
    flowMax: 60,
    initialFio2: 0.4,
    initialFlow: 40,
    reassessMinutes: 30,
    rationale: "Hypoxaemic respiratory failure on high flow (test order)",
    supersedesOrderId: null,
    ...overrides,
  } as OrderInput;
}

/**
 * A written, signed invasive-ventilation order the tests share: volume control
 * at 6 mL/kg PBW (4–8), rate 12–30 /min, plateau limit 30 and driving-pressure
 * limit 15 cmH2O, FiO2 0.30–0.80 and PEEP 5–14 cmH2O. Invented; override what a
 * test is about.
 */
export function ventilatorOrder(
  patientId: number,
  overrides: Partial<OrderInput> = {},
): OrderInput {
  return {
    entryMode: "written",
    password: "tidemark-demo",
    patientId,
    device: "invasive",
    spo2Lower: 88,
    spo2Upper: 95,
    fio2Min: 0.3,
    fio2Max: 0.8,
    peepMin: 5,
    peepMax: 14,
    initialFio2: 0.4,
    initialPeep: 10,
    ventMode: "volume_control",
    vtTarget: 6,
    vtMin: 4,
    vtMax: 8,
    rateMin: 12,
    rateMax: 30,
    plateauLimit: 30,
    drivingLimit: 15,
    reassessMinutes: 60,
    rationale: "ARDS on invasive ventilation, lung-protective settings (test order)",
    supersedesOrderId: null,
    ...overrides,
  } as OrderInput;
}
