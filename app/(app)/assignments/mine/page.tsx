import type { Metadata } from "next";
import Link from "next/link";
import { EmptyState } from "@/components/ui/EmptyState";
import { myBeds } from "@/lib/assignments/queries";
import { pagePermission } from "@/lib/auth/page-guard";
import { db } from "@/lib/db";
import { loadMyWork } from "@/lib/board/my-work";
import { MyWorkPanels } from "@/components/board/MyWorkPanels";

export const metadata: Metadata = { title: "My beds" };

const DUTY_WORDS = { nurse: "Nurse", therapist: "Therapist", physician: "Physician" } as const;

export default async function MyBedsPage() {
  const actor = await pagePermission("record.read");
  const [beds, work] = await Promise.all([myBeds(db(), actor), loadMyWork(db(), actor)]);
  const endsAt = beds[0]?.endsAt;

  return (
    <div className="space-y-4">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight">My beds</h1>
        <p className="text-sm text-ink-muted">
          The beds assigned to you in the current shift
          {endsAt
            ? `, until ${new Date(endsAt).toLocaleTimeString("en-GB", { hour: "2-digit", minute: "2-digit", timeZone: "UTC", timeZoneName: "short" })}`
            : ""}
          .
        </p>
      </div>
      <MyWorkPanels work={{ ...work, waiting: null }} />
      {beds.length === 0 ? (
        <EmptyState title="No beds assigned to you now">
          The charge nurse or an administrator sets the shift&apos;s assignments on the{" "}
          <Link href="/assignments" className="underline">
            Assignments
          </Link>{" "}
          page.
        </EmptyState>
      ) : (
        <ul className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
          {beds.map((b) => (
            <li
              key={`${b.bedId}:${b.duty}`}
              className="rounded-card border border-border bg-surface p-4 shadow-card"
            >
              <p className="text-sm text-ink-muted">
                {b.unitCode} · {DUTY_WORDS[b.duty]}
              </p>
              <p className="text-lg font-semibold">{b.bedLabel}</p>
              {b.patient ? (
                <Link href={`/patients/${b.patient.id}`} className="text-accent underline">
                  {b.patient.name}
                </Link>
              ) : (
                <p className="text-sm text-ink-muted">Empty bed</p>
              )}
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
