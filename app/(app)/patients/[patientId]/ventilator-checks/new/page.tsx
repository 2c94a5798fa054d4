import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { BedsideFormHeader, loadBedsidePage } from "@/components/adjustments/BedsideFormPage";
import { EmptyState } from "@/components/ui/EmptyState";
import { HeightForm } from "@/components/ventilation/HeightForm";
import { VentilatorCheckForm } from "@/components/ventilation/VentilatorCheckForm";
import { pagePermission } from "@/lib/auth/page-guard";
import { bodyWeightOf } from "@/lib/ventilation/settings";

export const metadata: Metadata = { title: "Ventilator check" };

/** Record a ventilator check against the ventilator order in effect (therapist, physician). */
export default async function NewVentilatorCheckPage({
  params,
}: {
  params: Promise<{ patientId: string }>;
}) {
  const actor = await pagePermission("ventilator_check.record");
  const { patient, context, timeZone } = await loadBedsidePage(actor, params);
  // A discharged patient's Chart is a record: nothing more is written to it.
  if (patient.admission.dischargedAt) notFound();
  const ventilator = context.order?.ventilator ?? null;
  return (
    <div className="space-y-4">
      <BedsideFormHeader patient={patient} title="Ventilator check" />
      {ventilator === null ? (
        <EmptyState title="No ventilator order in effect">
          A check is held against a ventilator order&apos;s lung-protective limits. A physician
          writes one (invasive ventilation or NIV) first.
        </EmptyState>
      ) : (
        <>
          {bodyWeightOf(patient) === null ? (
            <HeightForm
              patientId={patient.id}
              reason="No usable height is recorded for this patient: VT per kg of predicted body weight needs it. Tidemark never estimates it."
            />
          ) : null}
          <VentilatorCheckForm patientId={patient.id} timeZone={timeZone} ventilator={ventilator} />
        </>
      )}
    </div>
  );
}
