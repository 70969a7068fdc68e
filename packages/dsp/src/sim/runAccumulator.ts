/**
 * Per-sample observations of one loop run (float or bit-true) turned into decimated traces and the
 * metrics: lock time (lockMetric.ts), steady-state phase error and jitter, cycle slips, final frequency error and the
 * demodulation error (filter output × gainHzPerUnit against the scenario's frequency offset).
 */
import type { SimFullTraces, SimMetrics, SimRun } from '../types/sim.ts';
import { MinMaxDecimator } from './decimate.ts';
import { SweepTracker } from './sweepMetrics.ts';
import { LockTracker, type LockKernel, type LockModel } from './lockMetric.ts';
import { rippleBoxcarSamples } from './rippleBoxcar.ts';

const TWO_PI = 2 * Math.PI;
export const MAX_FULL_TRACE_SAMPLES = 1 << 21;

export interface RunSetup {
  readonly total: number;
  readonly buckets: number;
  readonly sampleRateHz: number;
  readonly centerHz: number;
  readonly gainHzPerUnit: number;
  readonly amplitude: number;
  readonly lockToleranceRad: number;
  readonly deviationHz: number | null;
  /** What the lock test knows of the loop and scenario (lockMetric.ts). */
  readonly lockModel: LockModel;
  readonly fullTraces: boolean;
  /** A sweep's first sample of the way back: the run then traces the input frequency and measures where lock went. */
  readonly sweepTurnSample: number | null;
}

/** One chunk of a run's per-sample observations (arrays of at least the chunk's length). */
export interface ChunkObservations {
  /** Input phase, cycles. */
  readonly inPhase: Float64Array;
  /** NCO phase before it advances, cycles. */
  readonly ncoPhase: Float64Array;
  /** Input sample values. */
  readonly x: Float64Array;
  /** Filter output, control units. */
  readonly y: Float64Array;
  readonly ncoHz: Float64Array;
  /** The scenario's frequency offset, Hz. */
  readonly offsetHz: Float64Array;
}

/**
 * The per-sample part of pushChunk run elsewhere (the WebAssembly twin of wasmTraced.ts): the same
 * recurrences, bucket min/max of the four traces and tail and demodulation sums, in the same order.
 */
export interface AccumulatorCore {
  /**
   * Its state as doubles: 0-3 wrapped and unwrapped error, boxcar sum, lock filter; 4-7 tail sum,
   * its square, frequency error and squared demodulation error; 8-15 min and max of the current
   * bucket of the phase, filter, frequency and lock traces.
   */
  readonly state: Float64Array;
  /** Per sample of the last chunk: the smoothed unwrapped error and the wrapped phase error (rad). */
  readonly smooth: Float64Array;
  readonly phaseErr: Float64Array;
  /** The lock test's loops over those arrays. */
  readonly lock: LockKernel;
  /** Start a run: zero state and boxcar, and the run's constants. */
  reset(constants: { readonly amplitude: number; readonly lockAlpha: number; readonly centerHz: number; readonly gainHzPerUnit: number; readonly boxcarLength: number }): void;
  /** Samples i0 … i1 − 1 of the chunk from sample n0, all in one trace bucket, with or without the tail and demodulation sums. */
  run(n0: number, i0: number, i1: number, tail: boolean, demod: boolean): void;
}

export class RunAccumulator {
  private readonly phase: MinMaxDecimator;
  private readonly filter: MinMaxDecimator;
  private readonly freq: MinMaxDecimator;
  private readonly lock: MinMaxDecimator;
  private readonly settle: LockTracker;
  private readonly full: SimFullTraces | undefined;
  /** Sweep runs only: the input frequency trace and where lock was lost and regained. */
  private readonly sweep: { readonly inputHz: MinMaxDecimator; readonly tracker: SweepTracker; readonly scratch: Float64Array } | null;
  /** Per-sample values of the current chunk that are decimated after its loop. */
  private readonly scratch: { readonly phaseErr: Float64Array; readonly smooth: Float64Array; readonly lock: Float64Array; readonly unwrappedRad: Float64Array };
  private readonly boxcar: Float64Array;
  private boxSum = 0;
  private boxIndex = 0;
  private boxFilled = 0;
  private unwrapped = 0;
  private prevWrapped = 0;
  private lockState = 0;
  private readonly lockAlpha: number;
  private readonly tailStart: number;
  private readonly demodStart: number;
  private tailSum = 0;
  private tailSum2 = 0;
  private tailFreqSum = 0;
  private tailCount = 0;
  private demodSum2 = 0;
  private demodCount = 0;

  constructor(
    private readonly s: RunSetup,
    chunkSamples: number,
    private readonly core: AccumulatorCore | null = null,
  ) {
    const { total, buckets, sampleRateHz } = s;
    // With a core the per-sample arrays are the core's own.
    const own = core ? 0 : chunkSamples;
    this.scratch = { phaseErr: new Float64Array(own), smooth: new Float64Array(own), lock: new Float64Array(own), unwrappedRad: new Float64Array(own) };
    this.phase = new MinMaxDecimator(total, buckets, sampleRateHz);
    this.filter = new MinMaxDecimator(total, buckets, sampleRateHz);
    this.freq = new MinMaxDecimator(total, buckets, sampleRateHz);
    this.lock = new MinMaxDecimator(total, buckets, sampleRateHz);
    const boxcarLength = rippleBoxcarSamples(sampleRateHz, s.centerHz, total);
    this.boxcar = new Float64Array(core ? 0 : boxcarLength);
    this.settle = new LockTracker({ total, sampleRateHz, lockToleranceRad: s.lockToleranceRad, boxcarLength, model: s.lockModel }, core?.lock ?? null);
    // Lock indicator: one-pole low-pass at centerHz/8 of the quadrature arm (common practice, no source).
    this.lockAlpha = 1 - Math.exp((-TWO_PI * (s.centerHz / 8)) / sampleRateHz);
    core?.reset({ amplitude: s.amplitude, lockAlpha: this.lockAlpha, centerHz: s.centerHz, gainHzPerUnit: s.gainHzPerUnit, boxcarLength });
    this.tailStart = Math.floor(0.9 * total);
    this.demodStart = Math.floor(total / 2);
    this.sweep =
      s.sweepTurnSample === null
        ? null
        : { inputHz: new MinMaxDecimator(total, buckets, sampleRateHz), tracker: new SweepTracker(s.sweepTurnSample, sampleRateHz), scratch: new Float64Array(chunkSamples) };
    this.full =
      s.fullTraces && total <= MAX_FULL_TRACE_SAMPLES
        ? { phaseErrorRad: new Float64Array(total), filterOutput: new Float64Array(total), ncoFrequencyHz: new Float64Array(total), offsetHz: new Float64Array(total) }
        : undefined;
  }

  /**
   * Samples n0 … n0 + count − 1 of one chunk: input and NCO phases in cycles, input samples x, filter
   * output (control units), NCO frequency, and the scenario's frequency offset (Hz). The recurrences
   * (unwrapping, the boxcar, the lock indicator) run sample by sample in one loop; the tail and
   * demodulation sums in loops of their own over the part of the chunk they cover (no per-sample test
   * of the sample index), in the same order; the traces are then decimated a bucket at a time.
   */
  pushChunk(n0: number, count: number, o: ChunkObservations): void {
    if (this.core) this.coreChunk(this.core, n0, count);
    else this.ownChunk(n0, count, o);
    const { smooth, phaseErr } = this.core ?? this.scratch;
    this.settle.pushRange(n0, count, smooth, o.offsetHz);
    if (this.sweep) {
      const { scratch, inputHz, tracker } = this.sweep;
      const centerHz = this.s.centerHz;
      const offsetHz = o.offsetHz;
      for (let i = 0; i < count; i++) scratch[i] = centerHz + (offsetHz[i] as number);
      inputHz.pushRange(n0, count, scratch);
      tracker.push(n0, count, smooth, offsetHz);
    }
    if (this.full) {
      this.full.phaseErrorRad.set(phaseErr.subarray(0, count), n0);
      this.full.filterOutput.set(o.y.subarray(0, count), n0);
      this.full.ncoFrequencyHz.set(o.ncoHz.subarray(0, count), n0);
      this.full.offsetHz.set(o.offsetHz.subarray(0, count), n0);
    }
  }

  /**
   * The chunk through the core, a piece per trace bucket (split where the tail and demodulation sums
   * start); the current bucket's min and max pass through the core's state.
   */
  private coreChunk(core: AccumulatorCore, n0: number, count: number): void {
    const st = core.state;
    // In the order of their min and max in the core's state, slots 8 + 2k and 9 + 2k.
    const { phase, filter, freq, lock } = this;
    let i = 0;
    while (i < count) {
      const n = n0 + i;
      const b = phase.bucketAt(n);
      filter.bucketAt(n);
      freq.bucketAt(n);
      lock.bucketAt(n);
      let end = Math.min(count, phase.bucketEnd() - n0);
      const tail = n >= this.tailStart;
      if (!tail) end = Math.min(end, this.tailStart - n0);
      const demod = n >= this.demodStart;
      if (!demod) end = Math.min(end, this.demodStart - n0);
      // Written out rather than a loop over the four with a closure: two closures per bucket were most of a run's garbage.
      st[8] = phase.min[b] as number;
      st[9] = phase.max[b] as number;
      st[10] = filter.min[b] as number;
      st[11] = filter.max[b] as number;
      st[12] = freq.min[b] as number;
      st[13] = freq.max[b] as number;
      st[14] = lock.min[b] as number;
      st[15] = lock.max[b] as number;
      core.run(n0, i, end, tail, demod);
      phase.min[b] = st[8] as number;
      phase.max[b] = st[9] as number;
      filter.min[b] = st[10] as number;
      filter.max[b] = st[11] as number;
      freq.min[b] = st[12] as number;
      freq.max[b] = st[13] as number;
      lock.min[b] = st[14] as number;
      lock.max[b] = st[15] as number;
      i = end;
    }
    this.tailCount += Math.max(0, count - Math.max(0, this.tailStart - n0));
    this.demodCount += Math.max(0, count - Math.max(0, this.demodStart - n0));
  }

  /** The chunk in TypeScript: recurrences in one loop, then the sums and the decimation. */
  private ownChunk(n0: number, count: number, o: ChunkObservations): void {
    const { inPhase, ncoPhase, x, y, ncoHz } = o;
    const { phaseErr, smooth, lock, unwrappedRad } = this.scratch;
    const box = this.boxcar;
    const boxLength = box.length;
    const amplitude = this.s.amplitude;
    const alpha = this.lockAlpha;
    let prev = this.prevWrapped;
    let unwrapped = this.unwrapped;
    let boxSum = this.boxSum;
    let boxIndex = this.boxIndex;
    let boxFilled = this.boxFilled;
    let lockState = this.lockState;
    for (let i = 0; i < count; i++) {
      const phaseNco = ncoPhase[i] as number;
      // x − Math.round(x) for x in (−1, 1), written out (Math.round is a slow call here): ties 0.5 → −0.5
      // and −0.5 → −0.5 as Math.round has them, and + 0 turns −0 into +0 as x − Math.round(x) does.
      const d0 = (inPhase[i] as number) - phaseNco;
      const e = d0 >= 0.5 ? d0 - 1 : d0 < -0.5 ? d0 + 1 : d0 + 0;
      const d1 = e - prev;
      const de = d1 >= 0.5 ? d1 - 1 : d1 < -0.5 ? d1 + 1 : d1 + 0;
      prev = e;
      unwrapped = n0 + i === 0 ? e * TWO_PI : unwrapped + de * TWO_PI;
      const eu = unwrapped;
      unwrappedRad[i] = eu;
      boxSum += eu - (box[boxIndex] as number);
      box[boxIndex] = eu;
      if (++boxIndex === boxLength) boxIndex = 0;
      if (boxFilled < boxLength) boxFilled++;
      smooth[i] = boxSum / boxFilled;
      // Quadrature arm: x·sin(θo)·2/A ≈ cos θe after the ripple is filtered (multiplier identity, G3 Ch. 2).
      const q = (2 * (x[i] as number) * Math.sin(TWO_PI * phaseNco)) / amplitude;
      lockState += alpha * (q - lockState);
      lock[i] = lockState;
      phaseErr[i] = e * TWO_PI;
    }
    this.tailSums(n0, count, o);
    this.demodSums(n0, count, o);
    this.prevWrapped = prev;
    this.unwrapped = unwrapped;
    this.boxSum = boxSum;
    this.boxIndex = boxIndex;
    this.boxFilled = boxFilled;
    this.lockState = lockState;
    this.phase.pushRange(n0, count, phaseErr);
    this.filter.pushRange(n0, count, y);
    this.freq.pushRange(n0, count, ncoHz);
    this.lock.pushRange(n0, count, lock);
  }

  /** Sums of the last tenth (steady state): unwrapped error, its square, frequency error; in sample order. */
  private tailSums(n0: number, count: number, o: ChunkObservations): void {
    const from = Math.max(0, this.tailStart - n0);
    if (from >= count) return;
    const { ncoHz, offsetHz } = o;
    const eu = this.scratch.unwrappedRad;
    const centerHz = this.s.centerHz;
    let sum = this.tailSum;
    let sum2 = this.tailSum2;
    let freqSum = this.tailFreqSum;
    for (let i = from; i < count; i++) {
      const v = eu[i] as number;
      sum += v;
      sum2 += v * v;
      freqSum += (ncoHz[i] as number) - (centerHz + (offsetHz[i] as number));
    }
    this.tailSum = sum;
    this.tailSum2 = sum2;
    this.tailFreqSum = freqSum;
    this.tailCount += count - from;
  }

  /** Squared demodulation error of the second half (filter output × gainHzPerUnit against the offset); in sample order. */
  private demodSums(n0: number, count: number, o: ChunkObservations): void {
    const from = Math.max(0, this.demodStart - n0);
    if (from >= count) return;
    const { y, offsetHz } = o;
    const gainHzPerUnit = this.s.gainHzPerUnit;
    let sum2 = this.demodSum2;
    for (let i = from; i < count; i++) {
      const d = (y[i] as number) * gainHzPerUnit - (offsetHz[i] as number);
      sum2 += d * d;
    }
    this.demodSum2 = sum2;
    this.demodCount += count - from;
  }

  finish(): SimRun {
    if (this.core) {
      const st = this.core.state;
      this.tailSum = st[4] as number;
      this.tailSum2 = st[5] as number;
      this.tailFreqSum = st[6] as number;
      this.demodSum2 = st[7] as number;
    }
    const run: SimRun = {
      traces: {
        phaseErrorRad: this.phase.trace(),
        filterOutput: this.filter.trace(),
        ncoFrequencyHz: this.freq.trace(),
        lockIndicator: this.lock.trace(),
        ...(this.sweep ? { inputFrequencyHz: this.sweep.inputHz.trace() } : {}),
      },
      metrics: this.metrics(),
    };
    return this.full ? { ...run, full: this.full } : run;
  }

  private metrics(): SimMetrics {
    const c = Math.max(1, this.tailCount);
    const mean = this.tailSum / c;
    const jitter = Math.sqrt(Math.max(0, this.tailSum2 / c - mean * mean));
    const { lockTimeS, locked } = this.settle.finish();
    const wrappedDeg = ((mean - TWO_PI * Math.round(mean / TWO_PI)) * 180) / Math.PI;
    const demodErrorRmsHz = Math.sqrt(this.demodSum2 / Math.max(1, this.demodCount));
    return {
      lockTimeS,
      locked,
      lockToleranceRad: this.s.lockToleranceRad,
      steadyStatePhaseErrorDeg: wrappedDeg === -180 ? 180 : wrappedDeg,
      steadyStatePhaseJitterDeg: (jitter * 180) / Math.PI,
      cycleSlips: Math.abs(Math.round(mean / TWO_PI)),
      finalFrequencyErrorHz: this.tailFreqSum / c,
      demodErrorRmsHz,
      demodErrorRelative: this.s.deviationHz ? demodErrorRmsHz / this.s.deviationHz : null,
      ...(this.sweep ? { sweep: this.sweep.tracker.result(locked) } : {}),
    };
  }
}
