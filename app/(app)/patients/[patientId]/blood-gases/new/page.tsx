import type { Metadata } from "next";
import { BedsideFormHeader, loadBedsidePage } from "@/components/adjustments/BedsideFormPage";
import { BloodGasForm } from "@/components/blood-gases/BloodGasForm";
import { pagePermission } from "@/lib/auth/page-guard";

export const metadata: Metadata = { title: "Enter blood gas" };

/** Enter one blood gas with the settings in use at sampling (nurse, therapist, physician). */
export default async function NewBloodGasPage({
  params,
}: {
  params: Promise<{ patientId: string }>;
}) {
  const actor = await pagePermission("blood_gas.record");
  const { patient, context, timeZone } = await loadBedsidePage(actor, params);
  return (
    <div className="space-y-4">
      <BedsideFormHeader patient={patient} title="Enter blood gas" />
      <BloodGasForm
        patientId={patient.id}
        context={context}
        pressureUnit={actor.pressureUnit}
        timeZone={timeZone}
      />
    </div>
  );
}
