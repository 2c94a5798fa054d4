import { SOURCES } from "./sources";

/** A setting that a published table gives either as one value or as a range `[min, max]`. */
export type SettingValue = number | readonly [number, number];

export interface ArdsNetworkStep {
  readonly fio2: SettingValue;
  /** cmH2O */
  readonly peep: SettingValue;
}

export type ArdsNetworkTableName = "lower-peep" | "higher-peep";

const freeze = (rows: ArdsNetworkStep[]): readonly ArdsNetworkStep[] =>
  Object.freeze(rows.map((row) => Object.freeze(row)));

// Values: recalled from memory, then checked against stored secondary sources
// (a protocol pocket card grouping both tables by FiO2, and two independent code
// reproductions of both tables); all agree with the rows below. The primary NEJM tables themselves
// were not available to check. The NIH ARDS Network protocol card writes the
// last lower-PEEP column "18–24" out as 18, 20, 22, 24 at FiO2 1.0.
const TABLES: Record<ArdsNetworkTableName, { rows: readonly ArdsNetworkStep[]; source: string }> = {
  // ARMA trial, lower PEEP/higher FiO2.
  "lower-peep": {
    source: SOURCES.ardsNetworkLowerPeep,
    rows: freeze([
      { fio2: 0.3, peep: 5 },
      { fio2: 0.4, peep: 5 },
      { fio2: 0.4, peep: 8 },
      { fio2: 0.5, peep: 8 },
      { fio2: 0.5, peep: 10 },
      { fio2: 0.6, peep: 10 },
      { fio2: 0.7, peep: 10 },
      { fio2: 0.7, peep: 12 },
      { fio2: 0.7, peep: 14 },
      { fio2: 0.8, peep: 14 },
      { fio2: 0.9, peep: 14 },
      { fio2: 0.9, peep: 16 },
      { fio2: 0.9, peep: 18 },
      { fio2: 1.0, peep: Object.freeze([18, 24] as const) },
    ]),
  },
  // ALVEOLI trial, higher PEEP/lower FiO2.
  "higher-peep": {
    source: SOURCES.ardsNetworkHigherPeep,
    rows: freeze([
      { fio2: 0.3, peep: 5 },
      { fio2: 0.3, peep: 8 },
      { fio2: 0.3, peep: 10 },
      { fio2: 0.3, peep: 12 },
      { fio2: 0.3, peep: 14 },
      { fio2: 0.4, peep: 14 },
      { fio2: 0.4, peep: 16 },
      { fio2: 0.5, peep: 16 },
      { fio2: 0.5, peep: 18 },
      { fio2: Object.freeze([0.5, 0.8] as const), peep: 20 },
      { fio2: 0.8, peep: 22 },
      { fio2: 0.9, peep: 22 },
      { fio2: 1.0, peep: 22 },
      { fio2: 1.0, peep: 24 },
    ]),
  },
};

/**
 * The ARDS Network FiO2/PEEP step tables as published: the lower PEEP/higher
 * FiO2 table of the ARMA trial (NEJM 2000) and the higher PEEP/lower FiO2 table
 * of the ALVEOLI trial (NEJM 2004), in order, with published ranges as `[min, max]`.
 */
export function ardsNetworkTable(name: ArdsNetworkTableName): readonly ArdsNetworkStep[] {
  const table = TABLES[name] as (typeof TABLES)[ArdsNetworkTableName] | undefined;
  if (!table)
    throw new RangeError(
      `Unknown ARDS Network table "${String(name)}"; use "lower-peep" or "higher-peep"`,
    );
  return table.rows;
}

/** The citation of a built-in table, for the basis view. */
export function ardsNetworkTableSource(name: ArdsNetworkTableName): string {
  return TABLES[name].source;
}
