/**
 * The oracle of src/sim/decimate.ts: one call per sample, as it was before it took ranges.
 *
 * Min/max decimation for plotting long runs: `buckets` consecutive groups of samples, each kept as
 * its minimum and maximum, so a plot of the envelope shows every excursion (a plain subsample would
 * miss spikes). Bucket k holds samples [floor(k·total/buckets), floor((k+1)·total/buckets)).
 */
import type { DecimatedTrace } from '../../../src/types/sim.ts';

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

  /** Samples must arrive in order, one call per sample. */
  push(n: number, v: number): void {
    while (n >= this.nextBoundary && this.bucket < this.count - 1) {
      this.bucket++;
      this.nextBoundary = Math.floor(((this.bucket + 1) * this.total) / this.count);
    }
    const b = this.bucket;
    if (v < (this.min[b] as number)) this.min[b] = v;
    if (v > (this.max[b] as number)) this.max[b] = v;
  }

  trace(): DecimatedTrace {
    return { bucketStartS: this.bucketStartS, min: this.min, max: this.max };
  }
}
