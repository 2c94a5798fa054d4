import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import { NotFoundError } from "../errors";
import type { ImportKind, ImportStatus } from "./kinds";
import { reportToCsv, type ImportPreview, type StoredReport } from "./report";

export type ImportRow = {
  id: number;
  kind: ImportKind;
  status: ImportStatus;
  unit_id: number;
  unit_code: string;
  file_name: string;
  content_sha256: string;
  source_message_id: string | null;
  original_content: Buffer;
  byte_size: number;
  options_json: string;
  rows_total: number;
  rows_accepted: number;
  rows_rejected: number;
  report_json: string;
  created_at: Date;
  imported_at: Date | null;
};

/** One import with its stored file (used by the services; never sent to a browser as is). */
export async function getImportRow(
  knex: Knex | Knex.Transaction,
  id: number,
): Promise<ImportRow | undefined> {
  return (await knex("imports as i")
    .join("units as u", "u.id", "i.unit_id")
    .where("i.id", id)
    .first("i.*", "u.code as unit_code")) as ImportRow | undefined;
}

export function toPreview(
  row: Omit<ImportRow, "original_content">,
  extra: { alreadyImported?: boolean },
): ImportPreview {
  const report = JSON.parse(row.report_json || "{}") as Partial<StoredReport>;
  const options = JSON.parse(row.options_json || "{}") as { mrn?: string; bed?: string };
  return {
    id: row.id,
    kind: row.kind,
    status: row.status,
    unitId: row.unit_id,
    unitCode: row.unit_code,
    fileName: row.file_name,
    sha256: row.content_sha256,
    byteSize: row.byte_size,
    createdAt: row.created_at.toISOString(),
    importedAt: row.imported_at?.toISOString() ?? null,
    counts: { total: row.rows_total, accepted: row.rows_accepted, rejected: row.rows_rejected },
    monitor:
      row.kind === "monitor_csv" && options.mrn && options.bed
        ? { mrn: options.mrn, bed: options.bed }
        : null,
    alreadyImported: extra.alreadyImported ?? false,
    rejected: report.rejected ?? [],
    sample: report.sample ?? [],
    notes: report.notes ?? [],
    ...(report.header ? { header: report.header } : {}),
    ...(report.mapping ? { mapping: report.mapping } : {}),
    ...(report.mappingErrors ? { mappingErrors: report.mappingErrors } : {}),
  };
}

/** An import of one of the actor's units, as its preview/report; another unit's is "not found". */
export async function getImportPreview(
  knex: Knex,
  actor: Actor,
  id: number,
): Promise<ImportPreview> {
  const row = (await knex("imports as i")
    .join("units as u", "u.id", "i.unit_id")
    .where("i.id", id)
    .first(
      "i.id",
      "i.kind",
      "i.status",
      "i.unit_id",
      "u.code as unit_code",
      "i.file_name",
      "i.content_sha256",
      "i.source_message_id",
      "i.byte_size",
      "i.options_json",
      "i.rows_total",
      "i.rows_accepted",
      "i.rows_rejected",
      "i.report_json",
      "i.created_at",
      "i.imported_at",
    )) as Omit<ImportRow, "original_content"> | undefined;
  if (!row || !actor.unitIds.includes(row.unit_id))
    throw new NotFoundError("No import with that id on your units.");
  return toPreview(row, {});
}

export type ImportSummary = {
  id: number;
  kind: ImportKind;
  status: ImportStatus;
  unitCode: string;
  fileName: string;
  counts: { total: number; accepted: number; rejected: number };
  createdAt: string;
  importedAt: string | null;
  by: string;
};

/** The latest imports of the actor's units, newest first. */
export async function listImports(knex: Knex, actor: Actor, limit = 25): Promise<ImportSummary[]> {
  const rows = (await knex("imports as i")
    .join("units as u", "u.id", "i.unit_id")
    .leftJoin("users as c", "c.id", "i.created_by")
    .leftJoin("api_tokens as t", "t.id", "i.api_token_id")
    .whereIn("i.unit_id", actor.unitIds.length ? actor.unitIds : [0])
    .orderBy("i.id", "desc")
    .limit(Math.max(1, Math.min(100, limit)))
    .select(
      "i.id",
      "i.kind",
      "i.status",
      "u.code as unit_code",
      "i.file_name",
      "i.rows_total",
      "i.rows_accepted",
      "i.rows_rejected",
      "i.created_at",
      "i.imported_at",
      "c.name as user_name",
      "t.name as token_name",
    )) as {
    id: number;
    kind: ImportKind;
    status: ImportStatus;
    unit_code: string;
    file_name: string;
    rows_total: number;
    rows_accepted: number;
    rows_rejected: number;
    created_at: Date;
    imported_at: Date | null;
    user_name: string | null;
    token_name: string | null;
  }[];
  return rows.map((r) => ({
    id: r.id,
    kind: r.kind,
    status: r.status,
    unitCode: r.unit_code,
    fileName: r.file_name,
    counts: { total: r.rows_total, accepted: r.rows_accepted, rejected: r.rows_rejected },
    createdAt: r.created_at.toISOString(),
    importedAt: r.imported_at?.toISOString() ?? null,
    by: r.user_name ?? (r.token_name ? `API token “${r.token_name}”` : "—"),
  }));
}

/** The downloadable report: every rejected row with its reasons, as CSV. */
export async function importReportCsv(
  knex: Knex,
  actor: Actor,
  id: number,
): Promise<{ fileName: string; csv: string }> {
  const preview = await getImportPreview(knex, actor, id);
  const base =
    preview.fileName
      .replace(/\.[A-Za-z0-9]{1,5}$/, "")
      .replace(/[^A-Za-z0-9._-]+/g, "-")
      .slice(0, 60) || "import";
  return { fileName: `import-${preview.id}-${base}-report.csv`, csv: reportToCsv(preview) };
}
