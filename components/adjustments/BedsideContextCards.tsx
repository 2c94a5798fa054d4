import type { ReactNode } from "react";
import { formatPressureNumber } from "@/components/oxygenation/format";
import { formatFio2Value, formatUnitTime } from "@/components/bedside/BedsideFormParts";
import { StatusBadge, type Status } from "@/components/ui/StatusBadge";
import type { PressureUnit } from "@/lib/oxygen";
import { DEVICE_PROFILES } from "@/lib/devices";
import type { BedsideContext } from "@/lib/chart/bedside";
import { classifySpo2 } from "@/lib/time-in-band";
import { Spo2Value } from "@/components/readings/Spo2Value";

/** In band, below, or above on oxygen (the excursion rule of lib/time-in-band): by word and icon as well as colour. */
export function spo2Status(
  spo2: number,
  band: { lower: number; upper: number },
  setting: { fio2: number; flow?: number | null },
): Status {
  return ({ below: "below", inBand: "in-band", above: "above" } as const)[
    classifySpo2(spo2, setting, band)
  ];
}

function Card({
  title,
  children,
  testId,
}: {
  title: string;
  children: ReactNode;
  testId?: string;
}) {
  return (
    <section
      className="min-w-0 rounded-card border border-border bg-surface p-3 shadow-card"
      data-testid={testId}
    >
      <h2 className="text-sm font-semibold">{title}</h2>
      {children}
    </section>
  );
}

function Facts({ rows }: { rows: [string, ReactNode][] }) {
  return (
    <dl className="mt-1.5 grid grid-cols-[auto_minmax(0,1fr)] gap-x-3 gap-y-0.5 text-sm">
      {rows.map(([term, value]) => (
        <div key={term} className="contents">
          <dt className="text-ink-muted">{term}</dt>
          <dd className="tabular">{value}</dd>
        </div>
      ))}
    </dl>
  );
}

const estimatedMark = <span className="ml-1 text-xs text-ink-muted">(estimated)</span>;

/**
 * What a bedside change starts from: the order in effect (device, target band,
 * limits), the applied settings, and the latest reading and blood gas.
 */
export function BedsideContextCards({
  context,
  pressureUnit,
  timeZone,
}: {
  context: BedsideContext;
  pressureUnit: PressureUnit;
  timeZone: string;
}) {
  const { order, settings, latestReading, latestBloodGas } = context;
  const unit = pressureUnit;
  return (
    <div className="grid gap-3 md:grid-cols-3">
      <Card
        title={order ? `Order in effect #${order.id}` : "Order in effect"}
        testId="context-order"
      >
        {order ? (
          <>
            <div className="mt-1">
              {order.status === "awaiting_cosign" ? (
                <StatusBadge status="overdue" label="Awaiting co-sign" />
              ) : (
                <StatusBadge status="in-band" label="Active" />
              )}
            </div>
            <Facts
              rows={[
                ["Device", DEVICE_PROFILES[order.device].label],
                ["SpO2 band", `${order.spo2Band.lower}–${order.spo2Band.upper} %`],
                [
                  "FiO2 limits",
                  `${formatFio2Value(order.limits.fio2Min)}–${formatFio2Value(order.limits.fio2Max)}`,
                ],
                ...(order.limits.peepMin !== null && order.limits.peepMax !== null
                  ? ([["PEEP limits", `${order.limits.peepMin}–${order.limits.peepMax} cmH2O`]] as [
                      string,
                      string,
                    ][])
                  : []),
                ...(order.limits.flowMin !== null && order.limits.flowMax !== null
                  ? ([["Flow limits", `${order.limits.flowMin}–${order.limits.flowMax} L/min`]] as [
                      string,
                      string,
                    ][])
                  : []),
                ["Prescriber", order.prescriber.name],
              ]}
            />
          </>
        ) : (
          <p className="mt-1.5 text-sm text-ink-muted">No order in effect.</p>
        )}
      </Card>

      <Card title="Applied settings" testId="context-settings">
        {settings ? (
          <Facts
            rows={[
              [
                "FiO2",
                <>
                  {formatFio2Value(settings.fio2)}
                  {settings.fio2Estimated ? estimatedMark : null}
                </>,
              ],
              ...(settings.peep !== null
                ? ([["PEEP", `${settings.peep} cmH2O`]] as [string, string][])
                : []),
              ...(settings.flow !== null
                ? ([["Flow", `${settings.flow} L/min`]] as [string, string][])
                : []),
              ["Since", formatUnitTime(settings.updatedAt, timeZone)],
              ["Version", String(settings.version)],
            ]}
          />
        ) : (
          <p className="mt-1.5 text-sm text-ink-muted">No settings applied yet.</p>
        )}
      </Card>

      <Card title="Latest observations" testId="context-latest">
        <Facts
          rows={[
            [
              "SpO2",
              latestReading ? (
                <span className="inline-flex flex-wrap items-center gap-1">
                  <span>
                    <Spo2Value pct={latestReading.spo2} /> at{" "}
                    {formatUnitTime(latestReading.takenAt, timeZone)}
                  </span>
                  {order ? (
                    <StatusBadge
                      status={spo2Status(latestReading.spo2, order.spo2Band, latestReading)}
                    />
                  ) : null}
                </span>
              ) : (
                <span className="text-ink-muted">No reading yet</span>
              ),
            ],
            ...(latestReading?.respiratoryRate != null
              ? ([["RR", `${latestReading.respiratoryRate} /min`]] as [string, string][])
              : []),
            [
              "Blood gas",
              latestBloodGas ? (
                <span>
                  {latestBloodGas.sampleType === "arterial" ? "Arterial" : "Venous"}, PaO2{" "}
                  {formatPressureNumber(latestBloodGas.pao2, unit)} {unit}, PaCO2{" "}
                  {formatPressureNumber(latestBloodGas.paco2, unit)} {unit} at FiO2{" "}
                  {formatFio2Value(latestBloodGas.fio2)}
                  {latestBloodGas.fio2Estimated ? estimatedMark : null}
                  {latestBloodGas.pfRatio !== null
                    ? `, P/F ${formatPressureNumber(latestBloodGas.pfRatio, unit)} ${unit}`
                    : ""}{" "}
                  <span className="text-ink-muted">
                    ({formatUnitTime(latestBloodGas.sampledAt, timeZone)})
                  </span>
                </span>
              ) : (
                <span className="text-ink-muted">No blood gas yet</span>
              ),
            ],
          ]}
        />
      </Card>
    </div>
  );
}
