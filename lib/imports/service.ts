import { createHash } from "node:crypto";
import type { Knex } from "knex";
import { z } from "zod";
import { afterBloodGasRecorded, afterReadingsCharted } from "../alerts/service";
import type { TokenActor } from "../api-tokens/service";
import type { Actor } from "../auth/actor";
import { insertBloodGas } from "../blood-gases/service";
import { duplicateIndex } from "../db-errors";
import { ConflictError, DomainError, NotFoundError, type FieldErrors } from "../errors";
import { appendLedger, type LedgerActor } from "../ledger/service";
import { parseInput } from "../validation";
import { ImportFileError, type BloodGasMapping } from "./csv";
import {
  alertAdmissionOf,
  chartedReadings,
  fileStream,
  loadUnit,
  planBloodGasCsv,
  planHl7,
  readingInsertRow,
  sampleOf,
  streamMonitorCsv,
  type ImportUnit,
  type MonitorOutcome,
  type SmallPlan,
} from "./evaluate";
import { Hl7MessageError } from "./hl7";
import { IMPORT_KINDS, IMPORT_LEDGER_ACTIONS, type ImportKind, type RejectedRow } from "./kinds";
import type { MatchedPatient } from "./matching";
import { getImportRow, toPreview, type ImportRow } from "./queries";
import type { ImportPreview, StoredReport } from "./report";
import { assertCan } from "../auth/permissions";

/** Size caps per kind: a day of 1 Hz monitor data is about 2.5 MB. */
export const MAX_IMPORT_BYTES: Record<ImportKind, number> = {
  blood_gas_csv: 5 * 1024 * 1024,
  hl7: 1024 * 1024,
  monitor_csv: 12 * 1024 * 1024,
};

/** A signed-in user uploading in the app, or an interface engine with an API token. */
export type Importer = { kind: "user"; actor: Actor } | { kind: "token"; token: TokenActor };

const ledgerActorOf = (who: Importer): LedgerActor =>
  who.kind === "user" ? { id: who.actor.id, role: who.actor.role } : { id: null, role: "interface" };
const recordedByOf = (who: Importer) => (who.kind === "user" ? who.actor.id : null);

/** Refusal of an import with its rejected rows, as field errors keyed by row ("line 7", "OBR 2"). */
export class ImportRefusedError extends DomainError {
  constructor(
    message: string,
    readonly rejected: RejectedRow[],
  ) {
    super(message, 422, rowsAsFieldErrors(rejected));
  }
}

function rowsAsFieldErrors(rows: RejectedRow[]): FieldErrors {
  const out: FieldErrors = {};
  for (const r of rows) (out[r.label] ??= []).push(...r.reasons.map((x) => x.message));
  return out;
}

/** File-level problems (not CSV, truncated HL7, unknown monitor patient) become a 422 naming the problem. */
function asDomain(error: unknown): unknown {
  if (error instanceof ImportFileError || error instanceof Hl7MessageError) {
    return new DomainError(`${error.message}`, 422, { file: [error.message] });
  }
  return error;
}

const sha256 = (data: Buffer | string) => createHash("sha256").update(data).digest("hex");

function dedupeKey(kind: ImportKind, unitId: number, scope: string, contentSha: string): string {
  return sha256([kind, unitId, scope, contentSha].join("\n"));
}

const fileName = z
  .string()
  .trim()
  .max(255, "File name must be at most 255 characters.")
  .transform((s) => s.replace(/[\u0000-\u001f]/g, "") || "upload");

/** The fields of an upload besides the file; monitor files name the patient's MRN and bed. */
export const uploadSchema = z
  .object({
    kind: z.enum(IMPORT_KINDS, { error: "Choose what the file holds." }),
    unitId: z.coerce.number({ error: "Choose the unit." }).int().positive("Choose the unit."),
    fileName,
    delimiter: z.enum([",", ";", "\t"]).default(","),
    mrn: z.string().trim().max(20, "MRN must be at most 20 characters.").optional(),
    bed: z.string().trim().max(16, "Bed must be at most 16 characters.").optional(),
  })
  .superRefine((v, ctx) => {
    if (v.kind === "monitor_csv") {
      if (!v.mrn) ctx.addIssue({ code: "custom", path: ["mrn"], message: "Give the MRN of the patient the monitor was on." });
      if (!v.bed) ctx.addIssue({ code: "custom", path: ["bed"], message: "Give the bed of the monitor." });
    }
  });
export type UploadInput = z.input<typeof uploadSchema>;

// The mapping is validated again each time the file is checked (planBloodGasCsv).
type Options = { delimiter?: BloodGasMapping["delimiter"]; mapping?: unknown; mrn?: string; bed?: string };

function assertSize(kind: ImportKind, bytes: number): void {
  if (bytes === 0) throw new DomainError("The file is empty.", 422, { file: ["The file is empty."] });
  if (bytes > MAX_IMPORT_BYTES[kind]) {
    throw new DomainError(`The file is larger than ${MAX_IMPORT_BYTES[kind] / 1024 / 1024} MB.`, 413);
  }
}

/** The unit an upload names, if it is one of the actor's (else "not found", no leak). */
async function actorUnit(knex: Knex, actor: Actor, unitId: number): Promise<ImportUnit> {
  const unit = actor.unitIds.includes(unitId) ? await loadUnit(knex, unitId) : undefined;
  if (!unit) throw new NotFoundError("No unit with that id on your units.");
  return unit;
}

type Checked = {
  report: StoredReport;
  counts: { total: number; accepted: number; rejected: number };
  sourceMessageId: string | null;
  unitId: number;
};

function checkedFromPlan(plan: SmallPlan): Checked {
  const accepted = plan.gases.length + plan.readings.length;
  return {
    report: {
      rejected: plan.rejected,
      sample: sampleOf(plan),
      notes: plan.notes,
      ...(plan.header ? { header: plan.header } : {}),
      ...(plan.mapping ? { mapping: plan.mapping } : {}),
      ...(plan.mappingErrors ? { mappingErrors: plan.mappingErrors } : {}),
    },
    counts: { total: plan.total, accepted, rejected: plan.total - accepted },
    sourceMessageId: plan.hl7 ? hl7SourceId(plan.hl7) : null,
    unitId: plan.unit.id,
  };
}

function checkedFromMonitor(outcome: MonitorOutcome, unitId: number): Checked {
  return {
    report: { rejected: outcome.rejected, sample: outcome.sample, notes: [] },
    counts: { total: outcome.total, accepted: outcome.accepted, rejected: outcome.rejected.length },
    sourceMessageId: null,
    unitId,
  };
}

const hl7SourceId = (m: NonNullable<SmallPlan["hl7"]>) =>
  `${m.sendingApplication}|${m.sendingFacility}|${m.controlId}`.slice(0, 255);

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
          await planBloodGasCsv(knex, content, unit, { delimiter: options.delimiter ?? ",", mapping: options.mapping }, now),
        );
      case "hl7":
        return checkedFromPlan(await planHl7(knex, content, [unit.id], unit, now));
      case "monitor_csv":
        return checkedFromMonitor(
          await streamMonitorCsv(knex, fileStream(content), unit, { mrn: options.mrn!, bed: options.bed! }, now, null),
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
  raw: UploadInput,
  content: Buffer,
  now: Date = new Date(),
): Promise<ImportPreview> {
  assertCan(actor, "import.upload");
  const input = parseInput(uploadSchema, raw);
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
  const key = dedupeKey(input.kind, unit.id, input.kind === "monitor_csv" ? `${options.mrn}|${options.bed}` : "", contentSha);

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
  const byKey = (await knex("imports").where({ dedupe_key: key }).first("id")) as { id: number } | undefined;
  if (byKey) return getImportRow(knex, byKey.id);
  if (!sourceMessageId) return undefined;
  const bySource = (await knex("imports").where({ source_message_id: sourceMessageId }).first("id", "content_sha256")) as
    | { id: number; content_sha256: string }
    | undefined;
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
  if (row.kind !== "blood_gas_csv") throw new DomainError("Only CSV blood gas files have a column mapping.", 400);
  if (row.status !== "previewed") return toPreview(row, { alreadyImported: true });
  const options = JSON.parse(row.options_json) as Options;
  const delimiter =
    typeof mapping === "object" && mapping !== null && "delimiter" in mapping
      ? z.enum([",", ";", "\t"]).catch(options.delimiter ?? ",").parse((mapping as { delimiter: unknown }).delimiter)
      : (options.delimiter ?? ",");
  const unit = (await loadUnit(knex, row.unit_id))!;
  const checked = await checkFile(knex, "blood_gas_csv", row.original_content, unit, { delimiter, mapping }, now);
  const next: Options = { delimiter, ...(checked.report.mapping ? { mapping: checked.report.mapping } : {}) };
  await knex("imports").where({ id: row.id, status: "previewed" }).update(previewColumns(checked, next, row.file_name));
  return toPreview((await getImportRow(knex, row.id))!, {});
}

async function accessibleImport(knex: Knex | Knex.Transaction, actor: Actor, importId: number): Promise<ImportRow> {
  const row = await getImportRow(knex, importId);
  if (!row || !actor.unitIds.includes(row.unit_id)) throw new NotFoundError("No import with that id on your units.");
  return row;
}

export const confirmSchema = z.object({
  importId: z.number().int().positive(),
  /** The number of good rows the person saw in the preview; a different count now means the preview is stale. */
  expectedAccepted: z.number().int().min(0),
});
export type ConfirmInput = z.input<typeof confirmSchema>;

/**
 * Confirm in the app: derives the rows again from the stored file (never from
 * what the browser sends) and imports the good ones, in one transaction with
 * the ledger. A second confirm changes nothing.
 */
export async function confirmImport(
  knex: Knex,
  actor: Actor,
  raw: ConfirmInput,
  now: Date = new Date(),
): Promise<ImportPreview> {
  assertCan(actor, "import.upload");
  const input = parseInput(confirmSchema, raw);
  await accessibleImport(knex, actor, input.importId);
  const who: Importer = { kind: "user", actor };
  try {
    const id = await knex.transaction(async (trx) => {
      const locked = (await trx("imports").where({ id: input.importId }).forUpdate().first("id", "status")) as {
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
          throw new DomainError("Nothing to import: every row was rejected. The report lists why.", 422);
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

/**
 * Writes the good rows of a stored import, with the import's report and one
 * ledger row per patient touched, inside the caller's transaction.
 *
 * One ledger row per patient (not one per import) because the ledger chains
 * per patient: each patient's chain then holds the data that entered their
 * record, and reading a patient's history never needs another chain. A blood
 * gas file touches a handful of patients; HL7 and monitor imports one.
 */
async function writeImport(
  trx: Knex.Transaction,
  who: Importer,
  row: ImportRow,
  unit: ImportUnit,
  options: Options,
  now: Date,
  gate: (accepted: number, rejected: number) => void,
): Promise<void> {
  const recordedBy = recordedByOf(who);
  const ledgerActor = ledgerActorOf(who);
  const action = IMPORT_LEDGER_ACTIONS[row.kind];
  const base = { importId: row.id, kind: row.kind, fileName: row.file_name, sha256: row.content_sha256 };
  let checked: Checked;
  const touched = new Map<number, { patient: MatchedPatient; after: Record<string, unknown> }>();

  if (row.kind === "monitor_csv") {
    const outcome = await streamMonitorCsv(trx, fileStream(row.original_content), unit, { mrn: options.mrn!, bed: options.bed! }, now, {
      trx,
      importId: row.id,
      recordedBy,
      ledgerActor,
    });
    checked = checkedFromMonitor(outcome, unit.id);
    gate(checked.counts.accepted, checked.counts.rejected);
    touched.set(outcome.patient.patientId, {
      patient: outcome.patient,
      after: {
        readings: outcome.accepted,
        from: outcome.firstAt?.toISOString() ?? null,
        to: outcome.lastAt?.toISOString() ?? null,
      },
    });
  } else {
    const plan =
      row.kind === "hl7"
        ? await planHl7(trx, row.original_content, who.kind === "token" ? who.token.unitIds : [unit.id], unit, now)
        : await planBloodGasCsv(trx, row.original_content, unit, { delimiter: options.delimiter ?? ",", mapping: options.mapping }, now);
    if (plan.mappingErrors) {
      throw new DomainError("Complete the column mapping first.", 400, plan.mappingErrors);
    }
    checked = checkedFromPlan(plan);
    gate(checked.counts.accepted, checked.counts.rejected);
    for (const g of plan.gases) {
      const view = await insertBloodGas(trx, { admissionId: g.patient.admissionId }, g.values, g.evaluated, {
        recordedBy,
        importId: row.id,
      });
      await afterBloodGasRecorded(
        trx,
        ledgerActor,
        alertAdmissionOf(g.patient),
        { sampledAt: g.values.sampledAt, sampleType: g.values.sampleType, pao2: g.values.pao2, fio2: view.fio2, flow: g.values.flow ?? null },
        now,
      );
      const entry = touched.get(g.patient.patientId) ?? { patient: g.patient, after: { bloodGasIds: [] as number[], readings: 0 } };
      (entry.after.bloodGasIds as number[]).push(view.id);
      touched.set(g.patient.patientId, entry);
    }
    const byPatient = new Map<number, typeof plan.readings>();
    for (const r of plan.readings) byPatient.set(r.patient.patientId, [...(byPatient.get(r.patient.patientId) ?? []), r]);
    for (const [patientId, readings] of byPatient) {
      const rows = readings.map((r) => readingInsertRow(r, row.id, recordedBy));
      await trx("readings").insert(rows);
      const patient = readings[0]!.patient;
      await afterReadingsCharted(trx, ledgerActor, alertAdmissionOf(patient), chartedReadings(rows), now);
      const entry = touched.get(patientId) ?? { patient, after: { bloodGasIds: [] as number[], readings: 0 } };
      entry.after.readings = rows.length;
      touched.set(patientId, entry);
    }
  }
  await trx("imports")
    .where({ id: row.id })
    .update({
      status: "imported",
      imported_at: now,
      imported_by: recordedBy,
      rows_total: checked.counts.total,
      rows_accepted: checked.counts.accepted,
      rows_rejected: checked.counts.rejected,
      report_json: JSON.stringify({ ...JSON.parse(row.report_json || "{}"), ...checked.report } as StoredReport),
    });
  for (const { patient, after } of [...touched.values()].sort((a, b) => a.patient.patientId - b.patient.patientId)) {
    await appendLedger(
      trx,
      ledgerActor,
      {
        action,
        entityType: "import",
        entityId: row.id,
        patientId: patient.patientId,
        unitId: patient.unitId,
        after: {
          ...base,
          ...after,
          rowsInFile: checked.counts.total,
          rowsRejected: checked.counts.rejected,
          ...(who.kind === "token" ? { apiTokenId: who.token.tokenId, apiTokenName: who.token.name } : {}),
        },
      },
      now,
    );
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
  if (token.scope !== "write") throw new DomainError("This API token may only read; imports need a token with the write scope.", 403);
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
  const key = dedupeKey(input.kind, unit.id, input.kind === "monitor_csv" ? `${options.mrn}|${options.bed}` : "", contentSha);
  const existing = await findExisting(knex, key, sourceMessageId, contentSha);
  if (existing?.status === "imported") return { created: false, preview: toPreview(existing, { alreadyImported: true }) };

  try {
    const id = await knex.transaction(async (trx) => {
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
      if (again?.status === "imported") return { created: false, preview: toPreview(again, { alreadyImported: true }) };
    }
    throw asDomain(error);
  }
}
