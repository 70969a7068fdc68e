/**
 * Min/max decimation for plotting long runs: `buckets` consecutive groups of samples, each kept as
 * its minimum and maximum, so a plot of the envelope shows every excursion (a plain subsample would
 * miss spikes). Bucket k holds samples [floor(k·total/buckets), floor((k+1)·total/buckets)).
 */
import type { DecimatedTrace } from '../types/sim.ts';

export class MinMaxDecimator {
  readonly min: Float64Array;
  readonly max: Float64Array;
  readonly bucketStartS: Float64Array;
  private bucket = 0;
  private nextBoundary: number;
  private readonly total: number;
  private readonly count: number;

  constructor(total: number, buckets: number, sampleRateHz: number) {
    this.total = total;
    this.count = Math.max(1, Math.min(buckets, total));
    this.min = new Float64Array(this.count).fill(Infinity);
    this.max = new Float64Array(this.count).fill(-Infinity);
    this.bucketStartS = new Float64Array(this.count);
    for (let k = 0; k < this.count; k++) this.bucketStartS[k] = Math.floor((k * total) / this.count) / sampleRateHz;
    this.nextBoundary = Math.floor(total / this.count);
  }

  /**
   * Samples n0 … n0 + count − 1 (values[0..count)); ranges must arrive in order. Each bucket's part of
   * the range is one tight loop, the values compared in order (so ties of −0 and +0 keep the first).
   */
  pushRange(n0: number, count: number, values: Float64Array): void {
    let i = 0;
    while (i < count) {
      const b = this.bucketAt(n0 + i);
      const end = Math.min(count, this.bucketEnd() - n0);
      let lo = this.min[b] as number;
      let hi = this.max[b] as number;
      for (; i < end; i++) {
        const v = values[i] as number;
        if (v < lo) lo = v;
        if (v > hi) hi = v;
      }
      this.min[b] = lo;
      this.max[b] = hi;
    }
  }

  /** The bucket of sample n, moving on to it (samples arrive in order). */
  bucketAt(n: number): number {
    const last = this.count - 1;
    while (n >= this.nextBoundary && this.bucket < last) {
      this.bucket++;
      this.nextBoundary = Math.floor(((this.bucket + 1) * this.total) / this.count);
    }
    return this.bucket;
  }

  /** One past the last sample of the current bucket (Infinity for the last bucket, which takes the rest). */
  bucketEnd(): number {
    return this.bucket < this.count - 1 ? this.nextBoundary : Infinity;
  }

  trace(): DecimatedTrace {
    return { bucketStartS: this.bucketStartS, min: this.min, max: this.max };
  }
}
