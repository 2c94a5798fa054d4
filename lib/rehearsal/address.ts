/**
 * The Rehearsal page's choices, kept in the address: the unit (`unit`, as the
 * Reports page writes it; `unitId` is read too), the run shown (`run`) and a
 * second run to compare it with (`compare`). Pure: the page, its links and the
 * tests read and write the address the same way.
 */

export type RehearsalSearch = {
  unit?: string | string[];
  unitId?: string | string[];
  run?: string | string[];
  compare?: string | string[];
};

export type RehearsalChoice = {
  unitId: number | null;
  /** The runs chosen, in the order they were chosen: none, one, or two to compare. */
  runs: number[];
};

/** At most two runs are compared. */
export const MAX_CHOSEN = 2;

const one = (v: string | string[] | undefined) => (Array.isArray(v) ? v.at(-1) : v);

function positiveInt(v: string | string[] | undefined): number | null {
  const text = one(v);
  if (text === undefined || !/^\d{1,10}$/.test(text.trim())) return null;
  const n = Number(text);
  return Number.isSafeInteger(n) && n > 0 ? n : null;
}

/** Reads the address; anything that is not a positive whole number is left out. */
export function parseRehearsalSearch(search: RehearsalSearch): RehearsalChoice {
  const unitId = positiveInt(search.unit) ?? positiveInt(search.unitId);
  const run = positiveInt(search.run);
  const compare = positiveInt(search.compare);
  const runs = [run, compare].filter((id): id is number => id !== null);
  return { unitId, runs: [...new Set(runs)] };
}

/** The page's address for a unit and the runs chosen. */
export function rehearsalHref(unitId: number, runs: readonly number[]): string {
  const params = new URLSearchParams({ unit: String(unitId) });
  const [run, compare] = runs;
  if (run !== undefined) params.set("run", String(run));
  if (compare !== undefined) params.set("compare", String(compare));
  return `/rehearsals?${params.toString()}`;
}

/** Ticking a run's box: off if it was on; on if fewer than two are chosen; else unchanged. */
export function toggleRun(runs: readonly number[], id: number): number[] {
  if (runs.includes(id)) return runs.filter((r) => r !== id);
  if (runs.length >= MAX_CHOSEN) return [...runs];
  return [...runs, id];
}
