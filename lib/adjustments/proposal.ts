import type { Knex } from "knex";
import { DEVICE_PROFILES } from "../devices";
import type { OrderView } from "../orders/queries";
import { barometricPressureAtAltitude, type Proposal } from "../oxygen";
import type { OpenAdmission } from "../admissions/access";
import { loadSteps, proposeAtBedside, type LatestBloodGasView } from "../chart/bedside";

type Settings = { fio2: number; peep: number | null; flow: number | null };

/** Same setting: FiO2 to the hundredth, PEEP and flow to the tenth (their stored precision). */
const same = (a: number, b: number, tolerance: number) => Math.abs(a - b) < tolerance;

/**
 * Whether an applied change is the engine's proposed step: true when the
 * applied settings are the step's (a low-flow device by its flow, its FiO2
 * being an estimate), false when they differ or the engine proposed to hold,
 * null when there was no proposal or it asked for the prescriber (escalate).
 */
export function followsProposal(
  proposal: Proposal | null,
  device: OrderView["device"],
  to: Settings,
): boolean | null {
  if (!proposal || proposal.direction === "escalate") return null;
  const step = proposal.step;
  if (!step) return false;
  if (step.flow !== undefined && (to.flow === null || !same(step.flow, to.flow, 0.05)))
    return false;
  if (step.peep !== undefined && (to.peep === null || !same(step.peep, to.peep, 0.05)))
    return false;
  if (DEVICE_PROFILES[device].uses.fio2 === "estimated") return true;
  return same(step.fio2, to.fio2, 0.005);
}

/**
 * The proposal the bedside showed before the change (the settings in use,
 * the latest reading, the gas the forecast used), compared with what was
 * applied. Null when there was none: no reading yet, or the engine refused.
 */
export async function proposalFollowed(
  trx: Knex.Transaction,
  admission: Pick<OpenAdmission, "admissionId" | "altitudeM">,
  order: OrderView,
  gas: Pick<LatestBloodGasView, "pao2" | "paco2" | "fio2" | "hb" | "peep"> | null,
  current: Settings,
  to: Settings,
): Promise<boolean | null> {
  const admissionId = admission.admissionId;
  const [reading, steps] = await Promise.all([
    // Through (patient_id, taken_at): a monitored patient has tens of thousands of rows.
    trx("readings")
      .where({ patient_id: order.patientId, admission_id: admissionId })
      .orderBy("taken_at", "desc")
      .first("spo2_pct", "fio2") as Promise<{ spo2_pct: number; fio2: number } | undefined>,
    loadSteps(trx, order.stepTableId),
  ]);
  if (!reading) return null;
  let proposal: Proposal;
  try {
    proposal = proposeAtBedside({
      order,
      steps,
      current,
      latestReading: { spo2: Number(reading.spo2_pct), fio2: Number(reading.fio2) },
      gas,
      barometricPressure: barometricPressureAtAltitude(admission.altitudeM),
    });
  } catch {
    return null;
  }
  return followsProposal(proposal, order.device, to);
}
