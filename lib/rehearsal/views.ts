import type { StayResult } from "./care";
import type { BasisEntry } from "./parameters";
import type { ModelSummary } from "./run";
import type { RehearsalSettings } from "./schema";

/** Where a stored run stands: queued → running → done, or failed with its reason. */
export const REHEARSAL_STATUSES = ["queued", "running", "done", "failed"] as const;
export type RehearsalStatus = (typeof REHEARSAL_STATUSES)[number];

/** The step table a run used for one device, as it was when the run was asked for. */
export type RehearsalTableRef = {
  /** null: the default high-flow ladder (no stored table). */
  id: number | null;
  name: string;
  /** Published source of a built-in table; null for a unit's own or the default ladder. */
  source: string | null;
  builtIn: boolean;
  rows: number;
};

/** What a finished run came to. Shares are fractions (0–1) of the cohort's time. */
export type RehearsalOutcome = {
  /** One summary per care model: fixed-interval, tidemark, reference. */
  models: ModelSummary[];
  /** Every patient under every model. */
  stays: StayResult[];
  /** Every figure the run used, with its source. */
  basis: BasisEntry[];
  /** How long the run took in the worker. */
  elapsedMs: number;
};

/** A stored run (GET /api/v1/rehearsals/[rehearsalId]). Times are ISO 8601 (UTC). */
export type RehearsalView = {
  id: number;
  unitId: number;
  unitCode: string;
  label: string;
  status: RehearsalStatus;
  /** 0–1: patients done over patients asked for. */
  progress: number;
  settings: RehearsalSettings;
  tables: { ventilated: RehearsalTableRef; hfnc: RehearsalTableRef };
  requestedBy: { id: number; name: string };
  createdAt: string;
  startedAt: string | null;
  finishedAt: string | null;
  /** Why a failed run failed, in words. */
  error: string | null;
  outcome: RehearsalOutcome | null;
};

/** A run in the unit's list (GET /api/v1/rehearsals?unitId=): no per-patient rows. */
export type RehearsalListItem = Omit<RehearsalView, "outcome"> & {
  models: ModelSummary[] | null;
};
