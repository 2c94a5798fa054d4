import { createHash } from "node:crypto";
import { z } from "zod";
import type { TokenActor } from "../api-tokens/service";
import type { Actor } from "../auth/actor";
import { DomainError, type FieldErrors } from "../errors";
import { ImportFileError, type BloodGasMapping } from "./csv";
import { sampleOf, type SmallPlan } from "./evaluate";
import type { MonitorOutcome } from "./monitor-csv";
import { Hl7MessageError } from "./hl7";
import { IMPORT_KINDS, type ImportKind, type RejectedRow } from "./kinds";
import type { StoredReport } from "./report";

/** Size caps per kind: a day of 1 Hz monitor data is about 2.5 MB. */
export const MAX_IMPORT_BYTES: Record<ImportKind, number> = {
  blood_gas_csv: 5 * 1024 * 1024,
  hl7: 1024 * 1024,
  monitor_csv: 12 * 1024 * 1024,
};

/** A signed-in user uploading in the app, or an interface engine with an API token. */
export type Importer = { kind: "user"; actor: Actor } | { kind: "token"; token: TokenActor };

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
export function asDomain(error: unknown): unknown {
  if (error instanceof ImportFileError || error instanceof Hl7MessageError) {
    return new DomainError(`${error.message}`, 422, { file: [error.message] });
  }
  return error;
}

export const sha256 = (data: Buffer | string) => createHash("sha256").update(data).digest("hex");

export function dedupeKey(
  kind: ImportKind,
  unitId: number,
  scope: string,
  contentSha: string,
): string {
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
      if (!v.mrn)
        ctx.addIssue({
          code: "custom",
          path: ["mrn"],
          message: "Give the MRN of the patient the monitor was on.",
        });
      if (!v.bed)
        ctx.addIssue({ code: "custom", path: ["bed"], message: "Give the bed of the monitor." });
    }
  });
export type UploadInput = z.input<typeof uploadSchema>;

// The mapping is validated again each time the file is checked (planBloodGasCsv).
export type Options = {
  delimiter?: BloodGasMapping["delimiter"];
  mapping?: unknown;
  mrn?: string;
  bed?: string;
};

export function assertSize(kind: ImportKind, bytes: number): void {
  if (bytes === 0)
    throw new DomainError("The file is empty.", 422, { file: ["The file is empty."] });
  if (bytes > MAX_IMPORT_BYTES[kind]) {
    throw new DomainError(
      `The file is larger than ${MAX_IMPORT_BYTES[kind] / 1024 / 1024} MB.`,
      413,
    );
  }
}

export type Checked = {
  report: StoredReport;
  counts: { total: number; accepted: number; rejected: number };
  sourceMessageId: string | null;
  unitId: number;
};

export function checkedFromPlan(plan: SmallPlan): Checked {
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

export function checkedFromMonitor(outcome: MonitorOutcome, unitId: number): Checked {
  return {
    report: { rejected: outcome.rejected, sample: outcome.sample, notes: [] },
    counts: { total: outcome.total, accepted: outcome.accepted, rejected: outcome.rejected.length },
    sourceMessageId: null,
    unitId,
  };
}

export const hl7SourceId = (m: NonNullable<SmallPlan["hl7"]>) =>
  `${m.sendingApplication}|${m.sendingFacility}|${m.controlId}`.slice(0, 255);

export const confirmSchema = z.object({
  importId: z.number().int().positive(),
  /** The number of good rows the person saw in the preview; a different count now means the preview is stale. */
  expectedAccepted: z.number().int().min(0),
});
export type ConfirmInput = z.input<typeof confirmSchema>;

/** Parsed input, as the services receive it from the boundary (lib/boundary). */
export type ConfirmData = z.output<typeof confirmSchema>;
export type UploadData = z.output<typeof uploadSchema>;
