import type { Knex } from "knex";
import { z } from "zod";
import type { TokenActor } from "../api-tokens/service";
import type { Actor } from "../auth/actor";
import { duplicateIndex } from "../db-errors";
import { ConflictError, DomainError, NotFoundError } from "../errors";
import { loadUnit, planBloodGasCsv, planHl7, type ImportUnit } from "./evaluate";
import { fileStream, streamMonitorCsv } from "./monitor-csv";
import type { ImportKind } from "./kinds";
import { getImportRow, toPreview, type ImportRow } from "./queries";
import type { ImportPreview, StoredReport } from "./report";
import {
  asDomain,
  assertSize,
  checkedFromMonitor,
  checkedFromPlan,
  dedupeKey,
  hl7SourceId,
  ImportRefusedError,
  sha256,
  type Checked,
  type ConfirmData,
  type Importer,
  type Options,
  type UploadData,
} from "./upload-rules";
import { writeImport } from "./write";
import { assertCan } from "../auth/permissions";
import { transact } from "../transaction";

// The upload rules (schemas, size caps, Importer) live in ./upload-rules; re-exported for callers.
export {
  confirmSchema,
  ImportRefusedError,
  MAX_IMPORT_BYTES,
  uploadSchema,
  type ConfirmData,
  type Importer,
  type UploadInput,
} from "./upload-rules";

/** The unit an upload names, if it is one of the actor's (else "not found", no leak). */
async function actorUnit(knex: Knex, actor: Actor, unitId: number): Promise<ImportUnit> {
  const unit = actor.unitIds.includes(unitId) ? await loadUnit(knex, unitId) : undefined;
  if (!unit) throw new NotFoundError("No unit with that id on your units.");
  return unit;
}

/** Checks a stored or uploaded file without writing rows: the preview. */
async function checkFile(
  knex: Knex | Knex.Transaction,
  kind: ImportKind,
  content: Buffer,
  unit: ImportUnit,
  options: Options,
  now: Date,
): Promise<Checked> {
  try {
    switch (kind) {
      case "blood_gas_csv":
        return checkedFromPlan(
          await planBloodGasCsv(
            knex,
            content,
            unit,
            { delimiter: options.delimiter ?? ",", mapping: options.mapping },
            now,
          ),
        );
      case "hl7":
        return checkedFromPlan(await planHl7(knex, content, [unit.id], unit, now));
      case "monitor_csv":
        return checkedFromMonitor(
          await streamMonitorCsv(
            knex,
            fileStream(content),
            unit,
            { mrn: options.mrn!, bed: options.bed! },
            now,
            null,
          ),
          unit.id,
        );
    }
  } catch (error) {
    throw asDomain(error);
  }
}

/**
 * Upload in the app: stores the file as it arrived (status "previewed") and
 * answers the preview. The same file for the same place again returns the
 * same import: still a preview (with the new mapping), or "already imported".
 */
export async function uploadForPreview(
  knex: Knex,
  actor: Actor,
  input: UploadData,
  content: Buffer,
  now: Date = new Date(),
): Promise<ImportPreview> {
  assertSize(input.kind, content.length);
  const unit = await actorUnit(knex, actor, input.unitId);
  const options: Options =
    input.kind === "monitor_csv"
      ? { mrn: input.mrn!, bed: input.bed! }
      : input.kind === "blood_gas_csv"
        ? { delimiter: input.delimiter }
        : {};
  const checked = await checkFile(knex, input.kind, content, unit, options, now);
  if (checked.report.mapping) options.mapping = checked.report.mapping;
  const contentSha = sha256(content);
  const key = dedupeKey(
    input.kind,
    unit.id,
    input.kind === "monitor_csv" ? `${options.mrn}|${options.bed}` : "",
    contentSha,
  );

  const existing = await findExisting(knex, key, checked.sourceMessageId, contentSha);
  if (existing) {
    if (existing.status === "imported") return toPreview(existing, { alreadyImported: true });
    await knex("imports")
      .where({ id: existing.id, status: "previewed" })
      .update(previewColumns(checked, options, input.fileName));
    return toPreview((await getImportRow(knex, existing.id))!, {});
  }
  try {
    const [id] = await knex("imports").insert({
      kind: input.kind,
      status: "previewed",
      unit_id: unit.id,
      content_sha256: contentSha,
      dedupe_key: key,
      source_message_id: checked.sourceMessageId,
      original_content: content,
      byte_size: content.length,
      created_by: actor.id,
      created_at: now,
      ...previewColumns(checked, options, input.fileName),
    });
    return toPreview((await getImportRow(knex, Number(id)))!, {});
  } catch (error) {
    // The same file uploaded twice at once: the first insert wins, both see it.
    if (duplicateIndex(error)) {
      const again = await findExisting(knex, key, checked.sourceMessageId, contentSha);
      if (again) return toPreview(again, { alreadyImported: again.status === "imported" });
    }
    throw error;
  }
}

function previewColumns(checked: Checked, options: Options, name: string) {
  return {
    file_name: name,
    options_json: JSON.stringify(options),
    rows_total: checked.counts.total,
    rows_accepted: checked.counts.accepted,
    rows_rejected: checked.counts.rejected,
    report_json: JSON.stringify(checked.report),
  };
}

/**
 * The import a file or message is a repeat of: same dedupe key, or (HL7) the
 * same sender's control id. A control id reused for different content is a
 * conflict, not a repeat.
 */
async function findExisting(
  knex: Knex | Knex.Transaction,
  key: string,
  sourceMessageId: string | null,
  contentSha: string,
): Promise<ImportRow | undefined> {
  const byKey = (await knex("imports").where({ dedupe_key: key }).first("id")) as
    { id: number } | undefined;
  if (byKey) return getImportRow(knex, byKey.id);
  if (!sourceMessageId) return undefined;
  const bySource = (await knex("imports")
    .where({ source_message_id: sourceMessageId })
    .first("id", "content_sha256")) as { id: number; content_sha256: string } | undefined;
  if (!bySource) return undefined;
  if (bySource.content_sha256 !== contentSha) {
    throw new ConflictError(
      `HL7 message control id ${sourceMessageId.split("|").pop()} was already received with different content; a corrected result needs a new control id.`,
    );
  }
  return getImportRow(knex, bySource.id);
}

/** The mapping step of a blood gas CSV: checks the stored file again with the new mapping. */
export async function remapImport(
  knex: Knex,
  actor: Actor,
  importId: number,
  mapping: unknown,
  now: Date = new Date(),
): Promise<ImportPreview> {
  assertCan(actor, "import.upload");
  const row = await accessibleImport(knex, actor, importId);
  if (row.kind !== "blood_gas_csv")
    throw new DomainError("Only CSV blood gas files have a column mapping.", 400);
  if (row.status !== "previewed") return toPreview(row, { alreadyImported: true });
  const options = JSON.parse(row.options_json) as Options;
  const delimiter =
    typeof mapping === "object" && mapping !== null && "delimiter" in mapping
      ? z
          .enum([",", ";", "\t"])
          .catch(options.delimiter ?? ",")
          .parse((mapping as { delimiter: unknown }).delimiter)
      : (options.delimiter ?? ",");
  const unit = (await loadUnit(knex, row.unit_id))!;
  const checked = await checkFile(
    knex,
    "blood_gas_csv",
    row.original_content,
    unit,
    { delimiter, mapping },
    now,
  );
  const next: Options = {
    delimiter,
    ...(checked.report.mapping ? { mapping: checked.report.mapping } : {}),
  };
  await knex("imports")
    .where({ id: row.id, status: "previewed" })
    .update(previewColumns(checked, next, row.file_name));
  return toPreview((await getImportRow(knex, row.id))!, {});
}

async function accessibleImport(
  knex: Knex | Knex.Transaction,
  actor: Actor,
  importId: number,
): Promise<ImportRow> {
  const row = await getImportRow(knex, importId);
  if (!row || !actor.unitIds.includes(row.unit_id))
    throw new NotFoundError("No import with that id on your units.");
  return row;
}

/**
 * Confirm in the app: derives the rows again from the stored file (never from
 * what the browser sends) and imports the good ones, in one transaction with
 * the ledger. A second confirm changes nothing.
 */
export async function confirmImport(
  knex: Knex,
  actor: Actor,
  input: ConfirmData,
  now: Date = new Date(),
): Promise<ImportPreview> {
  await accessibleImport(knex, actor, input.importId);
  const who: Importer = { kind: "user", actor };
  try {
    const id = await transact(knex, async (trx) => {
      const locked = (await trx("imports")
        .where({ id: input.importId })
        .forUpdate()
        .first("id", "status")) as {
        id: number;
        status: string;
      };
      if (locked.status === "imported") return null;
      const row = (await getImportRow(trx, input.importId))!;
      const options = JSON.parse(row.options_json) as Options;
      const unit = (await loadUnit(trx, row.unit_id))!;
      await writeImport(trx, who, row, unit, options, now, (accepted, rejectedCount) => {
        if (accepted !== input.expectedAccepted) {
          throw new ConflictError(
            `The file now checks as ${accepted} good rows (${rejectedCount} rejected), not the ${input.expectedAccepted} in your preview; nothing was imported. Review the new preview.`,
          );
        }
        if (accepted === 0) {
          throw new DomainError(
            "Nothing to import: every row was rejected. The report lists why.",
            422,
          );
        }
      });
      return row.id;
    });
    const row = (await getImportRow(knex, input.importId))!;
    return toPreview(row, { alreadyImported: id === null });
  } catch (error) {
    throw asDomain(error);
  }
}

export type TokenImportResult = { created: boolean; preview: ImportPreview };

/**
 * The interface engines' path (no preview step): an HL7 message or a monitor
 * file is imported at once. Rule: any rejected row refuses the whole upload
 * with 422 listing every row, nothing stored — unless `partial` is set
 * (`?partial=accept`), which imports the good rows and reports the others.
 * The same message (MSH-10) or file again answers the first import, unchanged.
 */
export async function importFromToken(
  knex: Knex,
  token: TokenActor,
  input: {
    kind: "hl7" | "monitor_csv";
    content: Buffer;
    fileName: string;
    partial: boolean;
    unit: ImportUnit;
    mrn?: string;
    bed?: string;
  },
  now: Date = new Date(),
): Promise<TokenImportResult> {
  if (token.scope !== "write")
    throw new DomainError(
      "This API token may only read; imports need a token with the write scope.",
      403,
    );
  assertSize(input.kind, input.content.length);
  const contentSha = sha256(input.content);
  const options: Options = input.kind === "monitor_csv" ? { mrn: input.mrn!, bed: input.bed! } : {};
  const who: Importer = { kind: "token", token };

  // HL7: the message says where the patient is; the token's units bound the search.
  let unit = input.unit;
  let sourceMessageId: string | null = null;
  if (input.kind === "hl7") {
    try {
      const plan = await planHl7(knex, input.content, token.unitIds, input.unit, now);
      unit = plan.unit;
      sourceMessageId = plan.hl7 ? hl7SourceId(plan.hl7) : null;
    } catch (error) {
      throw asDomain(error);
    }
  }
  const key = dedupeKey(
    input.kind,
    unit.id,
    input.kind === "monitor_csv" ? `${options.mrn}|${options.bed}` : "",
    contentSha,
  );
  const existing = await findExisting(knex, key, sourceMessageId, contentSha);
  if (existing?.status === "imported")
    return { created: false, preview: toPreview(existing, { alreadyImported: true }) };

  try {
    const id = await transact(knex, async (trx) => {
      let importId: number;
      if (existing) {
        // A preview someone left in the app: the interface engine's delivery completes it.
        importId = existing.id;
        await trx("imports").where({ id: importId }).forUpdate().first("id");
      } else {
        const [inserted] = await trx("imports").insert({
          kind: input.kind,
          status: "previewed",
          unit_id: unit.id,
          file_name: input.fileName,
          content_sha256: contentSha,
          dedupe_key: key,
          source_message_id: sourceMessageId,
          original_content: input.content,
          byte_size: input.content.length,
          options_json: JSON.stringify(options),
          report_json: "{}",
          api_token_id: token.tokenId,
          created_at: now,
        });
        importId = Number(inserted);
      }
      const row = (await getImportRow(trx, importId))!;
      await writeImport(trx, who, row, unit, options, now, () => undefined);
      const written = (await getImportRow(trx, importId))!;
      const report = JSON.parse(written.report_json) as StoredReport;
      if (written.rows_accepted === 0) {
        throw new ImportRefusedError(
          `No row could be imported (${written.rows_rejected} rejected); nothing was stored.`,
          report.rejected,
        );
      }
      if (written.rows_rejected > 0 && !input.partial) {
        throw new ImportRefusedError(
          `${written.rows_rejected} of ${written.rows_total} rows were rejected; nothing was stored. Fix them, or send ?partial=accept to import the good ones (${written.rows_accepted}).`,
          report.rejected,
        );
      }
      return importId;
    });
    return { created: true, preview: toPreview((await getImportRow(knex, id))!, {}) };
  } catch (error) {
    if (duplicateIndex(error)) {
      const again = await findExisting(knex, key, sourceMessageId, contentSha);
      if (again?.status === "imported")
        return { created: false, preview: toPreview(again, { alreadyImported: true }) };
    }
    throw asDomain(error);
  }
}
