import { EmptyState } from "@/components/ui/EmptyState";
import { StatusBadge } from "@/components/ui/StatusBadge";
import { IMPORT_KIND_LABELS } from "@/lib/imports/kinds";
import type { ImportSummary } from "@/lib/imports/queries";

const when = (iso: string) => `${iso.slice(0, 16).replace("T", " ")} UTC`;

/** The latest imports of the user's units, with their report downloads. */
export function RecentImports({ imports }: { imports: ImportSummary[] }) {
  return (
    <section aria-labelledby="recent-imports" className="space-y-2">
      <h2 id="recent-imports" className="text-lg font-semibold">
        Recent uploads
      </h2>
      {imports.length === 0 ? (
        <EmptyState title="No uploads yet">
          Files you upload, and messages from interface engines, are listed here.
        </EmptyState>
      ) : (
        <div className="overflow-x-auto rounded-card border border-border bg-surface shadow-card">
          <table className="w-full text-left text-sm">
            <caption className="sr-only">Recent uploads, newest first</caption>
            <thead className="border-b border-border bg-surface-muted text-xs tracking-wide text-ink-muted">
              <tr>
                <th scope="col" className="px-3 py-2">
                  File
                </th>
                <th scope="col" className="px-3 py-2">
                  Kind
                </th>
                <th scope="col" className="px-3 py-2">
                  Unit
                </th>
                <th scope="col" className="px-3 py-2">
                  Status
                </th>
                <th scope="col" className="px-3 py-2 text-right">
                  Rows
                </th>
                <th scope="col" className="px-3 py-2 text-right">
                  Imported
                </th>
                <th scope="col" className="px-3 py-2 text-right">
                  Rejected
                </th>
                <th scope="col" className="px-3 py-2">
                  By
                </th>
                <th scope="col" className="px-3 py-2">
                  Uploaded
                </th>
                <th scope="col" className="px-3 py-2">
                  Report
                </th>
              </tr>
            </thead>
            <tbody>
              {imports.map((i) => (
                <tr key={i.id} className="border-b border-border last:border-0">
                  <th scope="row" className="max-w-56 truncate px-3 py-2 font-medium">
                    {i.fileName}
                  </th>
                  <td className="px-3 py-2">{IMPORT_KIND_LABELS[i.kind]}</td>
                  <td className="px-3 py-2">{i.unitCode}</td>
                  <td className="px-3 py-2">
                    {i.status === "imported" ? (
                      <StatusBadge status="in-band" label="Imported" />
                    ) : (
                      <StatusBadge status="overdue" label="Checked, not imported" />
                    )}
                  </td>
                  <td className="tabular px-3 py-2 text-right">{i.counts.total}</td>
                  <td className="tabular px-3 py-2 text-right">
                    {i.status === "imported" ? i.counts.accepted : "—"}
                  </td>
                  <td className="tabular px-3 py-2 text-right">{i.counts.rejected}</td>
                  <td className="px-3 py-2">{i.by}</td>
                  <td className="tabular px-3 py-2">{when(i.createdAt)}</td>
                  <td className="px-3 py-2">
                    <a
                      className="text-accent underline-offset-2 hover:underline"
                      href={`/api/v1/imports/${i.id}/report`}
                    >
                      CSV<span className="sr-only"> report of {i.fileName}</span>
                    </a>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </section>
  );
}
