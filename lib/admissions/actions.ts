"use server";

import type { ActionResult } from "../action-result";
import { runWriteAction, type Revalidation } from "../boundary/next";
import type { HeightView } from "./height";
import {
  admitOperation,
  dischargeOperation,
  recordHeightOperation,
  transferOperation,
} from "./operations";
import type { AdmissionView } from "./lookups";

const admissionPages = (a: AdmissionView): Revalidation[] => ["/board", `/patients/${a.patientId}`];

export async function admitPatientAction(input: unknown): Promise<ActionResult<AdmissionView>> {
  return runWriteAction(admitOperation, input, admissionPages);
}

export async function transferPatientAction(input: unknown): Promise<ActionResult<AdmissionView>> {
  return runWriteAction(transferOperation, input, admissionPages);
}

export async function recordHeightAction(input: unknown): Promise<ActionResult<HeightView>> {
  return runWriteAction(recordHeightOperation, input, (h) => [
    `/patients/${h.patientId}`,
    `/patients/${h.patientId}/orders/new`,
  ]);
}

export async function dischargePatientAction(input: unknown): Promise<ActionResult<AdmissionView>> {
  return runWriteAction(dischargeOperation, input, admissionPages);
}
