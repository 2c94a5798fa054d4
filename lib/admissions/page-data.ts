import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import type { Device } from "../devices";
import { NotFoundError } from "../errors";
import { getCurrentOrder } from "../orders/queries";
import { getPatientForActor, type ChartPatient } from "./queries";

/** What the move and discharge pages need: the admitted patient, the order in effect, open alerts. */
export async function admissionChangeContext(
  knex: Knex,
  actor: Actor,
  patientId: number,
): Promise<{
  patient: ChartPatient;
  order: { id: number; device: Device } | null;
  openAlerts: number;
}> {
  const patient = await getPatientForActor(knex, actor, patientId);
  if (patient.admission.dischargedAt) throw new NotFoundError("The patient is discharged.");
  const [order, alerts] = await Promise.all([
    getCurrentOrder(knex, patientId),
    knex("alerts").where({ open_admission_id: patient.admission.id }).count({ n: "*" }),
  ]);
  return {
    patient,
    order: order ? { id: order.id, device: order.device } : null,
    openAlerts: Number((alerts[0] as { n: number | string }).n),
  };
}
