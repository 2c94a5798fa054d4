import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { z } from "zod";
import { DischargeForm } from "@/components/admissions/MoveDischargeForms";
import { buttonClasses } from "@/components/ui/Button";
import { admissionChangeContext } from "@/lib/admissions/page-data";
import { pagePermission } from "@/lib/auth/page-guard";
import { db } from "@/lib/db";
import { DEVICE_PROFILES } from "@/lib/devices";
import { NotFoundError } from "@/lib/errors";

export const metadata: Metadata = { title: "Discharge patient" };

const paramsSchema = z.object({ patientId: z.coerce.number().int().positive() });

/** Discharge: home, another hospital or death; the Chart stays readable afterwards. */
export default async function DischargePage({
  params,
}: {
  params: Promise<{ patientId: string }>;
}) {
  const actor = await pagePermission("admission.manage");
  const parsed = paramsSchema.safeParse(await params);
  if (!parsed.success) notFound();
  const context = await admissionChangeContext(db(), actor, parsed.data.patientId).catch(
    (error: unknown) => {
      if (error instanceof NotFoundError) notFound();
      throw error;
    },
  );
  const { patient, order, openAlerts, timeZone } = context;
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
        timeZone={timeZone}
        consequences={consequences}
      />
      <Link href={`/patients/${patient.id}`} className={buttonClasses("secondary")}>
        Back to the Chart
      </Link>
    </div>
  );
}
