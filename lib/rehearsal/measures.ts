import {
  addMeasures,
  emptyMeasures,
  minuteMeasures,
  type Fio2Period,
  type RollupMeasures,
} from "../rollups/buckets";
import type { BandPeriod, SeriesReading } from "../time-in-band";

/** One hour of samples is measured at a time, so a stay's series is never held whole. */
export const CHUNK_MS = 3_600_000;

/**
 * Measures a 1 Hz series as it streams past, with the app's own rollup
 * function ({@link minuteMeasures}, which walks the series by time in band's
 * carry rules) over one chunk at a time. The last two samples of a chunk are
 * carried into the next, so each sample holds exactly as it would in one walk
 * over the whole series (its hold depends on the gap since the sample before).
 */
export class StreamMeasures {
  readonly total: RollupMeasures = emptyMeasures();
  private readonly pool: SeriesReading[] = [];
  private readonly view: SeriesReading[] = [];
  private count = 0;
  private chunkStart: number;
  private readonly bands: BandPeriod[];
  private readonly fio2: Fio2Period[] = [];
  private fio2Now: number;
  private fio2Since: number;

  constructor(
    from: number,
    band: { lower: number; upper: number },
    fio2: number,
    private readonly flow: number | null,
  ) {
    this.chunkStart = from;
    this.bands = [{ from: new Date(from), to: null, lower: band.lower, upper: band.upper }];
    this.fio2Now = fio2;
    this.fio2Since = from;
  }

  /** FiO2 applied from `t` on. */
  setFio2(t: number, fio2: number): void {
    if (fio2 === this.fio2Now) return;
    if (t > this.fio2Since) this.fio2.push({ from: this.fio2Since, to: t, fio2: this.fio2Now });
    this.fio2Now = fio2;
    this.fio2Since = t;
  }

  /** One monitor sample (t in ms, in time order). */
  add(t: number, spo2: number, fio2: number): void {
    while (t >= this.chunkStart + CHUNK_MS) this.flush(this.chunkStart + CHUNK_MS);
    let r = this.pool[this.count];
    if (!r) {
      r = { t, spo2, fio2, flow: this.flow, source: "monitor" };
      this.pool.push(r);
    } else {
      r.t = t;
      r.spo2 = spo2;
      r.fio2 = fio2;
    }
    this.count++;
  }

  /** Ends the stream at `to` (ms) and returns the sums. */
  finish(to: number): RollupMeasures {
    while (to > this.chunkStart + CHUNK_MS) this.flush(this.chunkStart + CHUNK_MS);
    if (to > this.chunkStart) this.flush(to);
    return this.total;
  }

  private flush(to: number): void {
    const from = this.chunkStart;
    if (to > this.fio2Since) this.fio2.push({ from: this.fio2Since, to, fio2: this.fio2Now });
    this.fio2Since = to;
    this.view.length = 0;
    for (let i = 0; i < this.count; i++) this.view.push(this.pool[i]!);
    const minutes = minuteMeasures({
      series: this.view,
      bands: this.bands,
      fio2: this.fio2,
      from,
      to,
    });
    for (const m of minutes.values()) addMeasures(this.total, m);
    this.fio2.length = 0;
    // Keep the chunk's last two samples: the next walk needs the interval before the last.
    const keep = Math.min(2, this.count);
    for (let i = 0; i < keep; i++) {
      const src = this.pool[this.count - keep + i]!;
      const dst = this.pool[i]!;
      if (src !== dst) {
        const { t, spo2, fio2 } = src;
        dst.t = t;
        dst.spo2 = spo2;
        dst.fio2 = fio2;
      }
    }
    this.count = keep;
    this.chunkStart = to;
  }
}
