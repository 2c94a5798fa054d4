import type { Metadata } from "next";
import Link from "next/link";
import { DischargeForm } from "@/components/admissions/MoveDischargeForms";
import { buttonClasses } from "@/components/ui/Button";
import { loadAdmissionChange } from "../admission-change";
import { DEVICE_PROFILES } from "@/lib/devices";

export const metadata: Metadata = { title: "Discharge patient" };

/** Discharge: home, another hospital or death; the Chart stays readable afterwards. */
export default async function DischargePage({
  params,
}: {
  params: Promise<{ patientId: string }>;
}) {
  const { patient, order, openAlerts } = await loadAdmissionChange(params);
  const consequences = [
    order
      ? `discontinue order #${order.id} (${DEVICE_PROFILES[order.device].label}) with the discharge as its reason`
      : "no order is in effect",
    openAlerts ? `resolve ${openAlerts} open alert(s)` : "no alert is open",
    `free bed ${patient.admission.bed.label}`,
    "keep every record of the stay readable on the Chart and in the ledger",
  ];
  return (
    <div className="max-w-2xl space-y-4">
      <div className="space-y-1">
        <h1 className="text-2xl font-semibold tracking-tight">
          Discharge {patient.givenName} {patient.familyName}
        </h1>
        <p className="text-sm text-ink-muted">
          MRN {patient.mrn}, bed {patient.admission.bed.label}, {patient.admission.unit.name}.
        </p>
      </div>
      <DischargeForm
        admissionId={patient.admission.id}
        patientId={patient.id}
        timeZone={patient.admission.unit.timeZone}
        consequences={consequences}
      />
      <Link href={`/patients/${patient.id}`} className={buttonClasses("secondary")}>
        Back to the Chart
      </Link>
    </div>
  );
}
