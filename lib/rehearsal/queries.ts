import type { Knex } from "knex";
import type { RehearsalSettings } from "./schema";
import type {
  RehearsalListItem,
  RehearsalOutcome,
  RehearsalStatus,
  RehearsalTableRef,
  RehearsalView,
} from "./views";

/** What settings_json holds: the form's figures and the tables as they were. */
export type StoredSettings = {
  settings: RehearsalSettings;
  tables: { ventilated: RehearsalTableRef; hfnc: RehearsalTableRef };
};

type RehearsalRow = {
  id: number;
  unit_id: number;
  unit_code: string;
  label: string;
  status: RehearsalStatus;
  progress: string | number;
  settings_json: string;
  outcome_json?: string | null;
  error: string | null;
  requested_by: number;
  requested_by_name: string;
  created_at: Date;
  started_at: Date | null;
  finished_at: Date | null;
};

const iso = (d: Date | null) => (d ? d.toISOString() : null);

function baseView(row: RehearsalRow): Omit<RehearsalView, "outcome"> {
  const stored = JSON.parse(row.settings_json) as StoredSettings;
  return {
    id: row.id,
    unitId: row.unit_id,
    unitCode: row.unit_code,
    label: row.label,
    status: row.status,
    progress: Number(row.progress),
    settings: stored.settings,
    tables: stored.tables,
    requestedBy: { id: row.requested_by, name: row.requested_by_name },
    createdAt: row.created_at.toISOString(),
    startedAt: iso(row.started_at),
    finishedAt: iso(row.finished_at),
    error: row.error,
  };
}

function rehearsalRows(knex: Knex) {
  return knex("rehearsals as r")
    .join("units as u", "u.id", "r.unit_id")
    .join("users as p", "p.id", "r.requested_by")
    .select(
      "r.id",
      "r.unit_id",
      "u.code as unit_code",
      "r.label",
      "r.status",
      "r.progress",
      "r.settings_json",
      "r.error",
      "r.requested_by",
      "p.name as requested_by_name",
      "r.created_at",
      "r.started_at",
      "r.finished_at",
    );
}

/** One stored run with its outcome, or null. Unit access is the caller's check. */
export async function getRehearsal(knex: Knex, id: number): Promise<RehearsalView | null> {
  const row = (await rehearsalRows(knex).where("r.id", id).first("r.outcome_json")) as
    RehearsalRow | undefined;
  if (!row) return null;
  return {
    ...baseView(row),
    outcome: row.outcome_json ? (JSON.parse(row.outcome_json) as RehearsalOutcome) : null,
  };
}

/** How many runs a unit's list shows. */
export const REHEARSAL_LIST_LIMIT = 50;

/**
 * A unit's runs, newest first, each with its care models' summaries (the
 * per-patient rows stay out of the list: read them per run).
 */
export async function listRehearsals(knex: Knex, unitId: number): Promise<RehearsalListItem[]> {
  const rows = (await rehearsalRows(knex)
    .where("r.unit_id", unitId)
    .orderBy("r.id", "desc")
    .limit(REHEARSAL_LIST_LIMIT)
    // The summaries only: JSON_EXTRACT keeps the per-patient rows in the database.
    .select(
      knex.raw("JSON_EXTRACT(r.outcome_json, '$.models') as models_json"),
    )) as (RehearsalRow & {
    // JSON_EXTRACT answers a JSON value, which the driver has parsed already.
    models_json: RehearsalListItem["models"] | string | null;
  })[];
  return rows.map((row) => ({
    ...baseView(row),
    models:
      typeof row.models_json === "string"
        ? (JSON.parse(row.models_json) as RehearsalListItem["models"])
        : row.models_json,
  }));
}
