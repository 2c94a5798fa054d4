import type { Knex } from "knex";
import { afterBloodGasRecorded, afterReadingsCharted } from "../alerts/service";
import { refreshAfterReadingRows } from "../rollups/store";
import { insertBloodGas } from "../blood-gases/service";
import { DomainError } from "../errors";
import { appendLedger, type LedgerActor } from "../ledger/service";
import { planBloodGasCsv, planHl7, type ImportUnit } from "./evaluate";
import {
  alertAdmissionOf,
  chartedReadings,
  fileStream,
  readingInsertRow,
  streamMonitorCsv,
} from "./monitor-csv";
import { IMPORT_LEDGER_ACTIONS } from "./kinds";
import type { MatchedPatient } from "./matching";
import type { ImportRow } from "./queries";
import type { StoredReport } from "./report";
import {
  checkedFromMonitor,
  checkedFromPlan,
  type Checked,
  type Importer,
  type Options,
} from "./upload-rules";

const ledgerActorOf = (who: Importer): LedgerActor =>
  who.kind === "user"
    ? { id: who.actor.id, role: who.actor.role }
    : { id: null, role: "interface" };
const recordedByOf = (who: Importer) => (who.kind === "user" ? who.actor.id : null);

/**
 * Writes the good rows of a stored import, with the import's report and one
 * ledger row per patient touched, inside the caller's transaction.
 *
 * One ledger row per patient (not one per import) because the ledger chains
 * per patient: each patient's chain then holds the data that entered their
 * record, and reading a patient's history never needs another chain. A blood
 * gas file touches a handful of patients; HL7 and monitor imports one.
 */
export async function writeImport(
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
  const base = {
    importId: row.id,
    kind: row.kind,
    fileName: row.file_name,
    sha256: row.content_sha256,
  };
  let checked: Checked;
  const touched = new Map<number, { patient: MatchedPatient; after: Record<string, unknown> }>();

  if (row.kind === "monitor_csv") {
    const outcome = await streamMonitorCsv(
      trx,
      fileStream(row.original_content),
      unit,
      { mrn: options.mrn!, bed: options.bed! },
      now,
      {
        trx,
        importId: row.id,
        recordedBy,
        ledgerActor,
      },
    );
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
        ? await planHl7(
            trx,
            row.original_content,
            who.kind === "token" ? who.token.unitIds : [unit.id],
            unit,
            now,
          )
        : await planBloodGasCsv(
            trx,
            row.original_content,
            unit,
            { delimiter: options.delimiter ?? ",", mapping: options.mapping },
            now,
          );
    if (plan.mappingErrors) {
      throw new DomainError("Complete the column mapping first.", 400, plan.mappingErrors);
    }
    checked = checkedFromPlan(plan);
    gate(checked.counts.accepted, checked.counts.rejected);
    for (const g of plan.gases) {
      const view = await insertBloodGas(
        trx,
        { admissionId: g.patient.admissionId },
        g.values,
        g.evaluated,
        {
          recordedBy,
          importId: row.id,
        },
      );
      await afterBloodGasRecorded(
        trx,
        ledgerActor,
        alertAdmissionOf(g.patient),
        {
          sampledAt: g.values.sampledAt,
          sampleType: g.values.sampleType,
          pao2: g.values.pao2,
          fio2: view.fio2,
          flow: g.values.flow ?? null,
        },
        now,
      );
      const entry = touched.get(g.patient.patientId) ?? {
        patient: g.patient,
        after: { bloodGasIds: [] as number[], readings: 0 },
      };
      (entry.after.bloodGasIds as number[]).push(view.id);
      touched.set(g.patient.patientId, entry);
    }
    const byPatient = new Map<number, typeof plan.readings>();
    for (const r of plan.readings)
      byPatient.set(r.patient.patientId, [...(byPatient.get(r.patient.patientId) ?? []), r]);
    for (const [patientId, readings] of byPatient) {
      const rows = readings.map((r) => readingInsertRow(r, row.id, recordedBy));
      await trx("readings").insert(rows);
      await refreshAfterReadingRows(trx, rows);
      const patient = readings[0]!.patient;
      await afterReadingsCharted(
        trx,
        ledgerActor,
        alertAdmissionOf(patient),
        chartedReadings(rows),
        now,
      );
      const entry = touched.get(patientId) ?? {
        patient,
        after: { bloodGasIds: [] as number[], readings: 0 },
      };
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
      report_json: JSON.stringify({
        ...JSON.parse(row.report_json || "{}"),
        ...checked.report,
      } as StoredReport),
    });
  for (const { patient, after } of [...touched.values()].sort(
    (a, b) => a.patient.patientId - b.patient.patientId,
  )) {
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
          ...(who.kind === "token"
            ? { apiTokenId: who.token.tokenId, apiTokenName: who.token.name }
            : {}),
        },
      },
      now,
    );
  }
}
