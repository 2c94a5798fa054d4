import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { z } from "zod";
import { OrderRequestForm } from "@/components/order-requests/OrderRequestForm";
import { requestFromBedside } from "@/components/order-requests/request-defaults";
import { buttonClasses } from "@/components/ui/Button";
import { getPatientForActor } from "@/lib/admissions/queries";
import { pagePermission } from "@/lib/auth/page-guard";
import { db } from "@/lib/db";
import { NotFoundError } from "@/lib/errors";
import { getCurrentOrder } from "@/lib/orders/queries";

export const metadata: Metadata = { title: "Ask for a new order" };

const paramsSchema = z.object({ patientId: z.coerce.number().int().positive() });
const querySchema = z.object({
  from: z.enum(["alert", "chart"]).catch("chart"),
  alertId: z.coerce.number().int().positive().optional().catch(undefined),
});

/** A therapist or nurse asks for a new order from the Chart or from "Order limits reached". */
export default async function OrderRequestPage({
  params,
  searchParams,
}: {
  params: Promise<{ patientId: string }>;
  searchParams: Promise<{ from?: string; alertId?: string }>;
}) {
  const actor = await pagePermission("order_request.send");
  const parsed = paramsSchema.safeParse(await params);
  if (!parsed.success) notFound();
  const query = querySchema.parse(await searchParams);
  const patient = await getPatientForActor(db(), actor, parsed.data.patientId).catch(
    (error: unknown) => {
      if (error instanceof NotFoundError) notFound();
      throw error;
    },
  );
  if (patient.admission.dischargedAt) notFound();
  const order = await getCurrentOrder(db(), patient.id);
  const start = requestFromBedside(
    patient.id,
    query.from === "alert" ? "limits_alert" : "chart",
    order?.device ?? null,
    query.from === "alert" ? query.alertId : undefined,
  );
  return (
    <div className="max-w-3xl space-y-4">
      <header className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <h1 className="text-2xl font-semibold tracking-tight">Ask for a new order</h1>
          <p className="text-sm text-ink-muted">
            {patient.givenName} {patient.familyName} · bed {patient.admission.bed.label} ·{" "}
            {patient.admission.unit.code}
          </p>
        </div>
        <Link href={`/patients/${patient.id}`} className={buttonClasses("secondary")}>
          Back to the Chart
        </Link>
      </header>
      <OrderRequestForm start={start} />
    </div>
  );
}
