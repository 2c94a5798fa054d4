import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import type { ReactNode } from "react";
import { z } from "zod";
import { CosignForm } from "@/components/orders/CosignForm";
import { DiscontinueForm } from "@/components/orders/DiscontinueForm";
import {
  formatDuration,
  formatOrderTime,
  ORDER_STATUS_LABELS,
  OrderFacts,
  OrderStatusBadge,
} from "@/components/orders/OrderFacts";
import { buttonClasses } from "@/components/ui/Button";
import { inputClasses } from "@/components/ui/Field";
import { IconInfo } from "@/components/ui/icons";
import { pageActor } from "@/lib/auth/page-guard";
import { OrderNoticeList } from "@/components/order-notices/OrderNoticeList";
import { unreadOrderNotices } from "@/lib/order-notices/queries";
import { db } from "@/lib/db";
import { NotFoundError } from "@/lib/errors";
import { listLedgerForEntity } from "@/lib/ledger/queries";
import { cosignersFor, cosignersText, mayCosign } from "@/lib/orders/cosigners";
import { getOrder, type OrderView } from "@/lib/orders/queries";
import { getAdmissionPatient } from "@/lib/admissions/queries";
import { getStepTableName } from "@/lib/step-tables/queries";
import { listUnits } from "@/lib/units/queries";
import { wallTimeToInstant, zoneOffsetMs } from "@/lib/time/zone";
import { can } from "@/lib/auth/permissions";

export const metadata: Metadata = { title: "Order" };

const paramsSchema = z.object({ orderId: z.coerce.number().int().positive() });

// ---------------------------------------------------------------------------
// "As it stood": a wall-clock time on the unit's clock, to the second
// ---------------------------------------------------------------------------

const WALL_TIME = /^(\d{4})-(\d{2})-(\d{2})[T ](\d{2}):(\d{2})(?::(\d{2})(?:\.\d{1,3})?)?$/;

/**
 * The moment a wall-clock time in `timeZone` names; ISO strings with a zone
 * are taken as they are. Null when the text is not a date and time.
 */
function parseAsOf(text: string, timeZone: string): Date | null {
  const m = WALL_TIME.exec(text.trim());
  if (!m) {
    if (!/(Z|[+-]\d{2}:?\d{2})$/.test(text.trim())) return null;
    const d = new Date(text);
    return Number.isNaN(d.getTime()) ? null : d;
  }
  const [, y, mo, d, h, mi, s] = m;
  const wall = Date.UTC(
    Number(y),
    Number(mo) - 1,
    Number(d),
    Number(h),
    Number(mi),
    Number(s ?? "0"),
  );
  if (Number.isNaN(wall)) return null;
  return wallTimeToInstant(wall, timeZone);
}

/** A moment as the datetime-local input shows it, on the unit's clock. */
function toWallText(date: Date, timeZone: string): string {
  return new Date(date.getTime() + zoneOffsetMs(date.getTime(), timeZone))
    .toISOString()
    .slice(0, 19);
}

const ACTION_WORDS: Record<string, string> = {
  "order.write": "Written and signed",
  "order.verbal": "Entered as a verbal or telephone order",
  "order.cosign": "Co-signed",
  "order.supersede": "Superseded",
  "order.discontinue": "Discontinued",
};

// ---------------------------------------------------------------------------

function Card({ title, children, id }: { title: string; children: ReactNode; id: string }) {
  return (
    <section
      aria-labelledby={id}
      className="rounded-card border border-border bg-surface p-4 shadow-card"
    >
      <h2 id={id} className="mb-2 text-base font-semibold">
        {title}
      </h2>
      {children}
    </section>
  );
}

/** One order: every field, its signature and co-signature, what became of it, and its past. */
export default async function OrderPage({
  params,
  searchParams,
}: {
  params: Promise<{ orderId: string }>;
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const actor = await pageActor();
  const parsed = paramsSchema.safeParse(await params);
  if (!parsed.success) notFound();
  const order = await getOrder(db(), parsed.data.orderId);
  // Another unit's order answers 404, like one that does not exist.
  if (!order || !actor.unitIds.includes(order.unitId)) notFound();

  const [history, patient, tableName, units, notices] = await Promise.all([
    listLedgerForEntity(db(), actor, "order", order.id),
    getAdmissionPatient(db(), actor, order.admissionId).catch((error: unknown) => {
      if (error instanceof NotFoundError) notFound();
      throw error;
    }),
    getStepTableName(db(), order.stepTableId),
    listUnits(db(), [order.unitId]),
    unreadOrderNotices(db(), actor),
  ]);
  const unread = notices.filter((n) => n.orderId === order.id);
  const timeZone = units[0]?.timeZone ?? "UTC";
  const time = (d: string | Date) => formatOrderTime(d, timeZone);
  const now = new Date();

  const query = await searchParams;
  const asOfText = typeof query.asOf === "string" ? query.asOf : "";
  const asOf = asOfText ? parseAsOf(asOfText, timeZone) : null;
  const asOfError =
    asOfText && !asOf ? "Enter a date and time, for example 2026-12-01 14:30:00." : null;
  const past = asOf ? await getOrder(db(), order.id, asOf) : null;
  const pastTableName =
    past && past.stepTableId !== order.stepTableId
      ? await getStepTableName(db(), past.stepTableId)
      : tableName;

  const physician = can(actor, "order.sign");
  // Only the prescriber named on the order, or a designated co-signer, is offered the co-signature.
  const cosigners =
    physician && order.status === "awaiting_cosign" ? await cosignersFor(db(), order) : null;
  const inEffect = order.status === "active" || order.status === "awaiting_cosign";
  const patientName = `${patient.givenName} ${patient.familyName}`;

  // A moment just after each recorded event, but before the next one.
  const moments = history.map((event, i) => {
    const next = history[i + 1];
    const after = Date.parse(event.occurredAt) + 1000;
    const nextAt = next ? Date.parse(next.occurredAt) : null;
    const at = new Date(nextAt !== null && nextAt - 1 < after ? nextAt - 1 : after);
    return { event, at };
  });

  return (
    <div className="space-y-5">
      <header className="flex flex-wrap items-start justify-between gap-3 rounded-card border border-border bg-surface p-4 shadow-card">
        <div className="space-y-1">
          <p className="text-xs font-medium tracking-wide text-ink-muted">Order</p>
          <div className="flex flex-wrap items-center gap-2">
            <h1 className="text-2xl font-semibold tracking-tight">Order #{order.id}</h1>
            <OrderStatusBadge status={order.status} />
          </div>
          <p className="text-sm text-ink-muted">
            {patientName} · Bed <span className="font-medium text-ink">{patient.bed.label}</span> ·{" "}
            {patient.unit.code} · MRN <span className="tabular">{patient.mrn}</span>
            {patient.dischargedAt ? " · discharged" : ""}
          </p>
        </div>
        <div className="flex flex-wrap gap-2">
          {patient.dischargedAt ? null : (
            <Link href={`/patients/${order.patientId}`} className={buttonClasses("secondary")}>
              Back to the Chart
            </Link>
          )}
          {physician ? (
            <Link href="/orders/cosign" className={buttonClasses("ghost")}>
              Co-sign queue
            </Link>
          ) : null}
        </div>
      </header>

      <StateBanner order={order} time={time} now={now} />
      {unread.length ? <OrderNoticeList notices={unread} /> : null}

      <div className="grid items-start gap-5 lg:grid-cols-[minmax(0,1fr)_22rem]">
        <div className="min-w-0 space-y-5">
          <Card title="Prescription" id="order-prescription">
            <OrderFacts order={order} stepTableName={tableName} pressureUnit={actor.pressureUnit} />
          </Card>

          {cosigners && mayCosign(actor.id, cosigners) ? (
            <CosignForm
              orderId={order.id}
              version={order.version}
              enteredBy={order.enteredBy.name}
              prescriber={order.prescriber.name}
              asPrescriber={order.prescriber.id === actor.id}
            />
          ) : cosigners ? (
            <p
              className="flex items-center gap-2 rounded-card border border-border bg-surface p-4 text-sm shadow-card"
              data-testid="cosign-not-yours"
            >
              <IconInfo className="shrink-0 text-ink-muted" />
              {cosignersText(cosigners)}
            </p>
          ) : null}
          {physician && inEffect ? (
            <DiscontinueForm orderId={order.id} version={order.version} />
          ) : null}

          <section
            aria-labelledby="as-of-heading"
            className="space-y-3 rounded-card border border-border bg-surface p-4 shadow-card"
          >
            <h2 id="as-of-heading" className="text-base font-semibold">
              As it stood at a past time
            </h2>
            <form method="get" className="flex flex-wrap items-end gap-3">
              <div className="flex flex-col gap-1">
                <label htmlFor="as-of" className="text-sm font-medium">
                  Date and time ({timeZone})
                </label>
                <input
                  id="as-of"
                  name="asOf"
                  type="datetime-local"
                  step={1}
                  defaultValue={asOf ? toWallText(asOf, timeZone) : ""}
                  className={`${inputClasses} tabular w-auto`}
                  aria-invalid={Boolean(asOfError)}
                  aria-describedby={asOfError ? "as-of-error" : "as-of-hint"}
                />
              </div>
              <button type="submit" className={buttonClasses("secondary")}>
                Show the order as it stood
              </button>
            </form>
            <p id="as-of-hint" className="text-xs text-ink-muted">
              Read from the database&apos;s own history of this order (every version is kept).
            </p>
            {asOfError ? (
              <p id="as-of-error" className="text-xs font-medium text-below" role="alert">
                {asOfError}
              </p>
            ) : null}
            {asOf ? (
              <div
                className="rounded-md border border-border bg-surface-muted p-3"
                data-testid="order-as-of"
              >
                {past ? (
                  <div className="space-y-2">
                    <div className="flex flex-wrap items-center gap-2 text-sm">
                      <span className="font-medium">At {time(asOf)}:</span>
                      <OrderStatusBadge status={past.status} />
                      {past.status !== order.status ? (
                        <span className="text-ink-muted">
                          (now {ORDER_STATUS_LABELS[order.status].toLowerCase()})
                        </span>
                      ) : null}
                    </div>
                    <dl className="grid grid-cols-[minmax(7rem,auto)_1fr] gap-x-4 gap-y-1 text-sm">
                      <dt className="text-ink-muted">Signed</dt>
                      <dd>{past.signedAt ? time(past.signedAt) : "Not yet signed"}</dd>
                      <dt className="text-ink-muted">Co-signed</dt>
                      <dd>
                        {past.cosignedBy && past.cosignedAt
                          ? `${past.cosignedBy.name}, ${time(past.cosignedAt)}`
                          : past.entryMode === "written"
                            ? "Not needed (written order)"
                            : "Not yet"}
                      </dd>
                      {past.discontinuedAt ? (
                        <>
                          <dt className="text-ink-muted">Discontinued</dt>
                          <dd>{time(past.discontinuedAt)}</dd>
                        </>
                      ) : null}
                    </dl>
                    <OrderFacts
                      order={past}
                      stepTableName={pastTableName}
                      pressureUnit={actor.pressureUnit}
                    />
                  </div>
                ) : (
                  <p className="flex items-center gap-2 text-sm">
                    <IconInfo className="shrink-0 text-ink-muted" />
                    Order #{order.id} did not exist yet at {time(asOf)}. It was entered{" "}
                    {time(order.createdAt)}.
                  </p>
                )}
              </div>
            ) : null}
          </section>
        </div>

        <div className="min-w-0 space-y-5">
          <Card title="Signature" id="order-signature">
            <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-1 text-sm">
              <dt className="text-ink-muted">Signed by</dt>
              <dd>
                {order.signedBy?.name ?? <span className="text-ink-muted">Not yet signed</span>}
              </dd>
              <dt className="text-ink-muted">Signed at</dt>
              <dd className="tabular">{order.signedAt ? time(order.signedAt) : "—"}</dd>
              <dt className="text-ink-muted">Meaning</dt>
              <dd>{order.signatureMeaning ? <q>{order.signatureMeaning}</q> : "—"}</dd>
            </dl>
          </Card>
          <Card title="Entry and co-signature" id="order-entry">
            <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-1 text-sm">
              <dt className="text-ink-muted">Entered by</dt>
              <dd>{order.enteredBy.name}</dd>
              <dt className="text-ink-muted">Entered at</dt>
              <dd className="tabular">{time(order.createdAt)}</dd>
              {order.entryMode === "written" ? (
                <>
                  <dt className="text-ink-muted">Co-sign</dt>
                  <dd>Not needed: written and signed by the prescriber</dd>
                </>
              ) : (
                <>
                  <dt className="text-ink-muted">Read back</dt>
                  <dd>
                    {order.readBackConfirmed ? `Yes, to ${order.prescriber.name}` : "Not recorded"}
                  </dd>
                  <dt className="text-ink-muted">Co-sign</dt>
                  <dd>
                    {order.cosignedBy && order.cosignedAt ? (
                      <>
                        {order.cosignedBy.name},{" "}
                        <span className="tabular">{time(order.cosignedAt)}</span>
                      </>
                    ) : order.status === "awaiting_cosign" ? (
                      <>
                        Awaiting co-sign for{" "}
                        {formatDuration(now.getTime() - Date.parse(order.createdAt))}
                      </>
                    ) : (
                      "Never co-signed"
                    )}
                  </dd>
                </>
              )}
              <dt className="text-ink-muted">Version</dt>
              <dd className="tabular">{order.version}</dd>
            </dl>
          </Card>
          <Card title="History" id="order-history">
            {moments.length === 0 ? (
              <p className="text-sm text-ink-muted">No ledger rows for this order.</p>
            ) : (
              <ol className="space-y-2 text-sm">
                {moments.map(({ event, at }) => (
                  <li key={event.id} className="border-l-2 border-border pl-3">
                    <p className="font-medium">{ACTION_WORDS[event.action] ?? event.action}</p>
                    <p className="text-ink-muted">
                      <span className="tabular">{time(event.occurredAt)}</span> ·{" "}
                      {event.actor.name ?? "Unknown"} ({event.actor.role})
                    </p>
                    {event.rationale ? <p className="break-words">{event.rationale}</p> : null}
                    <Link
                      href={`/orders/${order.id}?asOf=${encodeURIComponent(at.toISOString())}`}
                      className="text-accent underline-offset-2 hover:underline"
                    >
                      As it stood just after
                    </Link>
                  </li>
                ))}
              </ol>
            )}
          </Card>
        </div>
      </div>
    </div>
  );
}

/** What became of the order, in one sentence, by word and icon. */
function StateBanner({
  order,
  time,
  now,
}: {
  order: OrderView;
  time: (d: string | Date) => string;
  now: Date;
}) {
  const box = "flex flex-wrap items-center gap-2 rounded-card border p-3 text-sm";
  switch (order.status) {
    case "awaiting_cosign":
      return (
        <p
          className={`${box} border-overdue/50 bg-overdue-soft text-ink`}
          data-testid="order-state"
        >
          <OrderStatusBadge status={order.status} />
          In effect, entered by {order.enteredBy.name} as a {order.entryMode} order from{" "}
          {order.prescriber.name} {formatDuration(now.getTime() - Date.parse(order.createdAt))} ago;
          waiting for the co-signature of the prescriber or a co-signer the unit designates.
        </p>
      );
    case "active":
      return (
        <p className={`${box} border-border bg-surface`} data-testid="order-state">
          <OrderStatusBadge status={order.status} />
          In effect since {time(order.cosignedAt ?? order.createdAt)}.
          {order.replacedOrderId ? (
            <Link
              href={`/orders/${order.replacedOrderId}`}
              className="text-accent underline-offset-2 hover:underline"
            >
              Replaced order #{order.replacedOrderId}
            </Link>
          ) : null}
        </p>
      );
    case "superseded":
      return (
        <p className={`${box} border-border bg-surface-muted`} data-testid="order-state">
          <OrderStatusBadge status={order.status} />
          No longer in effect:
          {order.supersededBy ? (
            <>
              {" "}
              replaced by{" "}
              <Link
                href={`/orders/${order.supersededBy.id}`}
                className="text-accent underline-offset-2 hover:underline"
              >
                order #{order.supersededBy.id}
              </Link>{" "}
              at {time(order.supersededBy.at)}.
            </>
          ) : (
            " replaced by a newer order."
          )}
        </p>
      );
    case "discontinued":
      return (
        <p className={`${box} border-border bg-surface-muted`} data-testid="order-state">
          <OrderStatusBadge status={order.status} />
          Discontinued by {order.discontinuedBy?.name ?? "a physician"}
          {order.discontinuedAt ? ` at ${time(order.discontinuedAt)}` : ""}:{" "}
          {order.discontinueReason}
        </p>
      );
    case "draft":
      return (
        <p className={`${box} border-border bg-surface`} data-testid="order-state">
          <OrderStatusBadge status={order.status} />A draft: not in effect.
        </p>
      );
  }
}
