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
