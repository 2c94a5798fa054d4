import type { Metadata } from "next";
import Link from "next/link";
import { AdjustmentForm } from "@/components/adjustments/AdjustmentForm";
import { BedsideFormHeader, loadBedsidePage } from "@/components/adjustments/BedsideFormPage";
import { buttonClasses } from "@/components/ui/Button";
import { EmptyState } from "@/components/ui/EmptyState";
import { pagePermission } from "@/lib/auth/page-guard";
import { db } from "@/lib/db";
import { loadAdmissionForecastPairs } from "@/lib/forecast-accuracy/queries";
import { can, mayAdjustDevice } from "@/lib/auth/permissions";
import { DEVICE_PROFILES } from "@/lib/devices";

export const metadata: Metadata = { title: "Record adjustment" };

/** Record one applied settings change within the order in effect (DEVELOPERS.md, "Roles"). */
export default async function NewAdjustmentPage({
  params,
}: {
  params: Promise<{ patientId: string }>;
}) {
  const actor = await pagePermission("adjustment.record");
  const { patient, context, timeZone } = await loadBedsidePage(actor, params);
  const chart = `/patients/${patient.id}`;
  const { order } = context;

  let body;
  if (!order || !context.settings) {
    body = (
      <EmptyState title="No oxygen order in effect">
        Settings can only be changed within an order. A physician must write one first (device, SpO2
        target band and limits); readings and blood gases can still be charted.
        <span className="mt-3 flex flex-wrap justify-center gap-2">
          {actor.role === "physician" ? (
            <Link href={`${chart}/orders/new`} className={buttonClasses("primary")}>
              Write order
            </Link>
          ) : null}
          <Link href={chart} className={buttonClasses("secondary")}>
            Back to the Chart
          </Link>
        </span>
      </EmptyState>
    );
  } else if (!mayAdjustDevice(actor, DEVICE_PROFILES[order.device])) {
    const device = DEVICE_PROFILES[order.device].label;
    body = (
      <EmptyState title={`${device} changes are recorded by a therapist or physician`}>
        Nurses record settings changes on low-flow devices only (nasal cannula, simple and reservoir
        masks). Ask the respiratory therapist or the physician to record a change on {device}; you
        can still chart SpO2 or enter a blood gas.
        <span className="mt-3 flex flex-wrap justify-center gap-2">
          <Link href={`${chart}/readings/new`} className={buttonClasses("secondary")}>
            Chart SpO2
          </Link>
          <Link href={chart} className={buttonClasses("ghost")}>
            Back to the Chart
          </Link>
        </span>
      </EmptyState>
    );
  } else {
    // This stay's checked forecasts: the empirical interval beside each new forecast.
    const forecastPairs = await loadAdmissionForecastPairs(db(), context.admission.admissionId);
    body = (
      <AdjustmentForm
        patientId={patient.id}
        initialContext={context}
        pressureUnit={actor.pressureUnit}
        timeZone={timeZone}
        forecastPairs={forecastPairs}
        canRequest={can(actor, "order_request.send")}
      />
    );
  }

  return (
    <div className="space-y-4">
      <BedsideFormHeader patient={patient} title="Record adjustment" />
      {body}
    </div>
  );
}
