/**
 * Seeded random numbers, so a rehearsal repeats exactly. mulberry32 (Tommy
 * Ettinger's 32-bit generator, public domain; common practice for small
 * deterministic simulations): fast, allocation-free, period 2^32.
 */
export class Random {
  private state: number;
  private spare: number | null = null;

  constructor(seed: number) {
    this.state = seed >>> 0;
  }

  /** Uniform on [0, 1). */
  next(): number {
    this.state = (this.state + 0x6d2b79f5) >>> 0;
    let t = this.state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  }

  /** Uniform on [low, high). */
  between(low: number, high: number): number {
    return low + (high - low) * this.next();
  }

  /** Standard normal, by the Box–Muller transform (one spare kept, so no allocation). */
  normal(): number {
    if (this.spare !== null) {
      const value = this.spare;
      this.spare = null;
      return value;
    }
    const u = 1 - this.next();
    const v = this.next();
    const r = Math.sqrt(-2 * Math.log(u));
    this.spare = r * Math.sin(2 * Math.PI * v);
    return r * Math.cos(2 * Math.PI * v);
  }

  /** Log-normal with the given median and geometric spread (σ of the log). */
  logNormal(median: number, sigma: number): number {
    return median * Math.exp(sigma * this.normal());
  }

  /** True with probability `p`. */
  chance(p: number): boolean {
    return this.next() < p;
  }
}

/**
 * A well-mixed 32-bit seed from several integers (the run's seed, a patient's
 * index, a stream's number), so the streams of one run do not overlap in an
 * obvious way. Mixing by the murmur3 finaliser (common practice).
 */
export function mixSeed(...parts: number[]): number {
  let h = 0x9e3779b9;
  for (const part of parts) {
    h = Math.imul(h ^ (part >>> 0), 0x85ebca6b);
    h ^= h >>> 13;
    h = Math.imul(h, 0xc2b2ae35);
    h ^= h >>> 16;
  }
  return h >>> 0;
}
