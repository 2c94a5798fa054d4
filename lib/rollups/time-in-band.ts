import type { Knex } from "knex";
import type { TimeInBand } from "../time-in-band";
import { MINUTE_MS } from "./buckets";
import { loadRollupPieces } from "./pieces";

/**
 * Time in band of each admission over [from, to), read from the rollups. The
 * window is widened to whole minutes (the rollups' grain): a live view counts
 * the minute in progress whole, as the value held now holds to its end. Time
 * not known — no reading holding, no order in effect — is unknown, as in
 * lib/time-in-band.
 */
export async function timeInBandFromRollups(
  knex: Knex | Knex.Transaction,
  admissionIds: readonly number[],
  from: Date,
  to: Date,
): Promise<Map<number, TimeInBand>> {
  const start = Math.floor(from.getTime() / MINUTE_MS) * MINUTE_MS;
  const end = Math.ceil(to.getTime() / MINUTE_MS) * MINUTE_MS;
  const period = Math.max(0, end - start);
  const sums = new Map(admissionIds.map((id) => [id, { below: 0, inBand: 0, above: 0 }]));
  const pieces = await loadRollupPieces(knex, {
    admissionIds,
    from: new Date(start),
    to: new Date(end),
  });
  for (const p of pieces) {
    const s = sums.get(p.admissionId);
    if (!s) continue;
    s.below += p.m.belowMs;
    s.inBand += p.m.inBandMs;
    s.above += p.m.aboveMs;
  }
  const share = (ms: number) => (period > 0 ? ms / period : 0);
  return new Map(
    [...sums].map(([id, s]) => {
      const unknown = Math.max(0, period - s.below - s.inBand - s.above);
      return [
        id,
        {
          below: share(s.below),
          inBand: share(s.inBand),
          above: share(s.above),
          unknown: period > 0 ? share(unknown) : 0,
          ms: { period, ...s, unknown },
        },
      ];
    }),
  );
}
