import type { Metadata } from "next";
import { BedsideFormHeader, loadBedsidePage } from "@/components/adjustments/BedsideFormPage";
import { ReadingForm } from "@/components/readings/ReadingForm";
import { pagePermission } from "@/lib/auth/page-guard";

export const metadata: Metadata = { title: "Chart SpO2" };

/** Chart one observation: SpO2 with the device and oxygen in use (nurse, therapist, physician). */
export default async function NewReadingPage({
  params,
}: {
  params: Promise<{ patientId: string }>;
}) {
  const actor = await pagePermission("reading.chart");
  const { patient, context, timeZone } = await loadBedsidePage(actor, params);
  return (
    <div className="space-y-4">
      <BedsideFormHeader patient={patient} title="Chart SpO2" />
      <ReadingForm patientId={patient.id} context={context} timeZone={timeZone} />
    </div>
  );
}
