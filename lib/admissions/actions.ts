"use server";

import type { ActionResult } from "../action-result";
import { runWriteAction, type Revalidation } from "../boundary/next";
import { admitOperation, dischargeOperation, transferOperation } from "./operations";
import type { AdmissionView } from "./lookups";

const admissionPages = (a: AdmissionView): Revalidation[] => ["/board", `/patients/${a.patientId}`];

export async function admitPatientAction(input: unknown): Promise<ActionResult<AdmissionView>> {
  return runWriteAction(admitOperation, input, admissionPages);
}

export async function transferPatientAction(input: unknown): Promise<ActionResult<AdmissionView>> {
  return runWriteAction(transferOperation, input, admissionPages);
}

export async function dischargePatientAction(input: unknown): Promise<ActionResult<AdmissionView>> {
  return runWriteAction(dischargeOperation, input, admissionPages);
}
