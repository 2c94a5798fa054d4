import type { Metadata } from "next";
import Link from "next/link";
import { PatientRequests } from "@/components/order-requests/PatientRequests";
import { listOrderRequests } from "@/lib/order-requests/queries";
import { notFound } from "next/navigation";
import { z } from "zod";
import { AlertList } from "@/components/alerts/AlertList";
import { BedsideSummary } from "@/components/bedside/BedsideSummary";
import { Timeline } from "@/components/chart/Timeline";
import { StaySummary } from "@/components/chart/StaySummary";
import { TrendChart } from "@/components/chart/TrendChart";
import { ForecastAccuracyPanel } from "@/components/forecast-accuracy/ForecastAccuracyPanel";
import { BloodGasEvaluator } from "@/components/oxygenation/BloodGasEvaluator";
import { VentilationPanel } from "@/components/ventilation/VentilationPanel";
import { listVentilatorChecks } from "@/lib/ventilator-checks/queries";
import { buttonClasses } from "@/components/ui/Button";
import { listAlerts } from "@/lib/alerts/queries";
import { pageActor } from "@/lib/auth/page-guard";
import { can } from "@/lib/auth/permissions";
import { db } from "@/lib/db";
import { NotFoundError } from "@/lib/errors";
import { getBedsideContext } from "@/lib/chart/bedside";
import { loadAdmissionForecastAccuracy } from "@/lib/forecast-accuracy/queries";
import { ageInYears } from "@/lib/admissions/display";
import { DISPOSITION_LABELS, type Disposition } from "@/lib/admissions/schema";
import { formatUnitTime } from "@/lib/time/zone";
import { loadStaySummary } from "@/lib/rollups/summary";
import { type ChartPatient, getPatientForActor } from "@/lib/admissions/queries";

export const metadata: Metadata = { title: "Chart" };

const paramsSchema = z.object({ patientId: z.coerce.number().int().positive() });

async function loadPatient(...args: Parameters<typeof getPatientForActor>): Promise<ChartPatient> {
  try {
    return await getPatientForActor(...args);
  } catch (error) {
    // Not admitted, not existing and another unit's patient look the same.
    if (error instanceof NotFoundError) notFound();
    throw error;
  }
}

function stayLength(admittedAt: Date, now: Date): string {
  const hours = Math.max(0, Math.round((now.getTime() - admittedAt.getTime()) / 3600_000));
  return hours < 48 ? `${hours} h` : `${Math.round(hours / 24)} d`;
}

/** The Chart (first part): who the patient is, where they lie, and blood-gas evaluation. */
export default async function ChartPage({ params }: { params: Promise<{ patientId: string }> }) {
  const actor = await pageActor();
  const parsed = paramsSchema.safeParse(await params);
  if (!parsed.success) notFound();
  const patient = await loadPatient(db(), actor, parsed.data.patientId);
  const now = new Date();
  const [bedside, alerts, summary, forecasts, requests, ventilatorChecks] = await Promise.all([
    getBedsideContext(db(), actor, patient.id),
    listAlerts(db(), actor, { patientId: patient.id, status: "open" }),
    loadStaySummary(db(), patient.admission, now),
    loadAdmissionForecastAccuracy(db(), patient.id, patient.admission.id),
    listOrderRequests(db(), actor, { patientId: patient.id, status: "all", limit: 5 }),
    listVentilatorChecks(db(), patient.admission.id),
  ]);
  const ventilator = bedside.order?.ventilator ?? null;
  const age = ageInYears(patient.birthDate, now);
  const { bed, unit, dischargedAt, disposition } = patient.admission;
  const mayMove = !dischargedAt && can(actor, "admission.manage");
  const facts: [string, string][] = [
    ["MRN", patient.mrn],
    ["Age", `${age} y`],
    ["Sex", patient.sex === "female" ? "Female" : "Male"],
    ["Height", patient.heightCm === null ? "not recorded" : `${patient.heightCm} cm`],
    ["Bed", bed.label],
    ["Unit", `${unit.name} (${unit.code})`],
    dischargedAt
      ? ["Stay", `${stayLength(patient.admission.admittedAt, dischargedAt)} long`]
      : ["Admitted", `${stayLength(patient.admission.admittedAt, now)} ago`],
  ];

  return (
    <div className="space-y-6">
      <header className="flex flex-wrap items-start justify-between gap-3 rounded-card border border-border bg-surface p-4 shadow-card">
        <div className="space-y-1">
          <p className="text-xs font-medium tracking-wide text-ink-muted">Chart</p>
          <h1 className="text-2xl font-semibold tracking-tight">
            {patient.givenName} {patient.familyName}
          </h1>
          {dischargedAt ? (
            <p
              className="rounded-md border border-border-strong bg-surface-muted px-2 py-1 text-sm font-medium"
              data-testid="discharged-banner"
            >
              Discharged{" "}
              {disposition
                ? `(${DISPOSITION_LABELS[disposition as Disposition].toLowerCase()}) `
                : ""}
              {formatUnitTime(dischargedAt.toISOString(), unit.timeZone)} (unit time) — this Chart
              is a read-only record of the stay.
            </p>
          ) : null}
          <dl className="flex flex-wrap gap-x-5 gap-y-1 text-sm" data-testid="patient-facts">
            {facts.map(([term, value]) => (
              <div key={term} className="flex gap-1.5">
                <dt className="text-ink-muted">{term}</dt>
                <dd className="tabular font-medium">{value}</dd>
              </div>
            ))}
          </dl>
        </div>
        <div className="flex flex-wrap gap-2">
          {/* A file download from the API, not a page: a plain link, not next/link. */}
          <a
            href={`/api/v1/patients/${patient.id}/fhir?download=1`}
            download
            className={buttonClasses("secondary")}
          >
            Export (FHIR R4)
          </a>
          {mayMove ? (
            <>
              <Link href={`/patients/${patient.id}/move`} className={buttonClasses("secondary")}>
                Move
              </Link>
              <Link
                href={`/patients/${patient.id}/discharge`}
                className={buttonClasses("secondary")}
              >
                Discharge
              </Link>
            </>
          ) : null}
          <Link href="/board" className={buttonClasses("secondary")}>
            Back to the Board
          </Link>
        </div>
      </header>

      <section aria-labelledby="alerts-heading" className="space-y-2">
        <h2 id="alerts-heading" className="text-lg font-semibold">
          Open alerts
        </h2>
        <AlertList
          initial={alerts}
          apiUrl={`/api/v1/alerts?status=open&patientId=${patient.id}`}
          canAct={can(actor, "alert.act")}
          canRequest={!dischargedAt && can(actor, "order_request.send")}
          compactEmpty="No open alerts for this patient."
        />
      </section>

      <BedsideSummary actor={actor} context={bedside} now={now} />

      <PatientRequests
        patientId={patient.id}
        requests={requests.filter((r) => r.admissionId === patient.admission.id)}
        canSend={!dischargedAt && can(actor, "order_request.send")}
        canAnswer={!dischargedAt && can(actor, "order_request.answer")}
      />
      {ventilator || ventilatorChecks.length ? (
        <VentilationPanel
          patientId={patient.id}
          ventilator={ventilator}
          checks={ventilatorChecks}
          timeZone={unit.timeZone}
          pressureUnit={actor.pressureUnit}
          mayRecord={!dischargedAt && can(actor, "ventilator_check.record")}
        />
      ) : null}

      <StaySummary windows={summary} />

      <ForecastAccuracyPanel
        data={forecasts}
        pressureUnit={actor.pressureUnit}
        timeZone={unit.timeZone}
      />

      <TrendChart
        patientId={patient.id}
        pressureUnit={actor.pressureUnit}
        admittedAt={patient.admission.admittedAt.toISOString()}
      />

      <Timeline patientId={patient.id} pressureUnit={actor.pressureUnit} />

      <section aria-labelledby="evaluate-heading" className="space-y-3">
        <h2 id="evaluate-heading" className="text-lg font-semibold">
          Evaluate a blood gas
        </h2>
        <BloodGasEvaluator
          pressureUnit={actor.pressureUnit}
          unitId={unit.id}
          ageYears={age}
          unitLabel={`${unit.name} (${unit.altitudeM} m)`}
          latest={bedside.latestArterialGas}
          timeZone={unit.timeZone}
        />
      </section>
    </div>
  );
}
