import type { Metadata } from "next";
import Link from "next/link";
import { MoveForm } from "@/components/admissions/MoveDischargeForms";
import { buttonClasses } from "@/components/ui/Button";
import { loadAdmissionChange } from "../admission-change";
import { db } from "@/lib/db";
import { DEVICE_PROFILES } from "@/lib/devices";
import { listFreeBeds } from "@/lib/units/queries";

export const metadata: Metadata = { title: "Move patient" };

/** Move the patient to another bed; the order, alerts and records follow. */
export default async function MovePage({ params }: { params: Promise<{ patientId: string }> }) {
  const { actor, patient, order, openAlerts } = await loadAdmissionChange(params);
  const beds = await listFreeBeds(db(), actor.unitIds);
  return (
    <div className="max-w-2xl space-y-4">
      <div className="space-y-1">
        <h1 className="text-2xl font-semibold tracking-tight">
          Move {patient.givenName} {patient.familyName}
        </h1>
        <p className="text-sm text-ink-muted">
          Now in bed {patient.admission.bed.label}, {patient.admission.unit.name}.{" "}
          {order
            ? `The order in effect (#${order.id}, ${DEVICE_PROFILES[order.device].label}) moves with the patient`
            : "No order in effect"}
          {openAlerts
            ? `; ${openAlerts} open alert(s) move to the new bed and its team is told.`
            : "."}
        </p>
      </div>
      <MoveForm
        admissionId={patient.admission.id}
        patientId={patient.id}
        beds={beds}
        device={order?.device ?? null}
      />
      <Link href={`/patients/${patient.id}`} className={buttonClasses("secondary")}>
        Back to the Chart
      </Link>
    </div>
  );
}
