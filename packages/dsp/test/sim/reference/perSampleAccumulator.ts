/**
 * The oracle of src/sim/runAccumulator.ts: the accumulator as it was before it took whole chunks, one
 * call per sample, kept as the plain statement of what the chunked one must compute bit for bit
 * (test/sim/fastPaths.test.ts). Per-sample observations of one loop run (float or bit-true) turned into decimated traces and the
 * metrics: lock time, steady-state phase error and jitter, cycle slips, final frequency error and the
 * demodulation error (filter output × gainHzPerUnit against the scenario's frequency offset).
 */
import type { SimFullTraces, SimMetrics, SimRun } from '../../../src/types/sim.ts';
import type { RunSetup } from '../../../src/sim/runAccumulator.ts';
import { MinMaxDecimator } from './perSampleDecimator.ts';
import { LockTracker } from '../../../src/sim/lockMetric.ts';

const TWO_PI = 2 * Math.PI;
const MAX_FULL_TRACE_SAMPLES = 1 << 21;

export class PerSampleAccumulator {
  private readonly phase: MinMaxDecimator;
  private readonly filter: MinMaxDecimator;
  private readonly freq: MinMaxDecimator;
  private readonly lock: MinMaxDecimator;
  /** Lock and lock time have one definition (src/sim/lockMetric.ts), fed here a sample at a time. */
  private readonly settle: LockTracker;
  private readonly one = new Float64Array(1);
  private readonly oneOffset = new Float64Array(1);
  private readonly full: SimFullTraces | undefined;
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

  constructor(private readonly s: RunSetup) {
    const { total, buckets, sampleRateHz } = s;
    this.phase = new MinMaxDecimator(total, buckets, sampleRateHz);
    this.filter = new MinMaxDecimator(total, buckets, sampleRateHz);
    this.freq = new MinMaxDecimator(total, buckets, sampleRateHz);
    this.lock = new MinMaxDecimator(total, buckets, sampleRateHz);
    // A boxcar of one period of the 2·centerHz detector ripple removes it from the settle test. One
    // longer than the run never fills and averages the same samples as one of the run's length, so it
    // is cut there (a centerHz of 1e-4 Hz would otherwise ask for ~1e11 entries).
    this.boxcar = new Float64Array(Math.max(1, Math.min(total, Math.round(sampleRateHz / (2 * s.centerHz)))));
    this.settle = new LockTracker({ total, sampleRateHz, lockToleranceRad: s.lockToleranceRad, boxcarLength: this.boxcar.length, model: s.lockModel });
    // Lock indicator: one-pole low-pass at centerHz/8 of the quadrature arm (common practice, no source).
    this.lockAlpha = 1 - Math.exp((-TWO_PI * (s.centerHz / 8)) / sampleRateHz);
    this.tailStart = Math.floor(0.9 * total);
    this.demodStart = Math.floor(total / 2);
    this.full =
      s.fullTraces && total <= MAX_FULL_TRACE_SAMPLES
        ? { phaseErrorRad: new Float64Array(total), filterOutput: new Float64Array(total), ncoFrequencyHz: new Float64Array(total), offsetHz: new Float64Array(total) }
        : undefined;
  }

  /**
   * One sample: input and NCO phases in cycles, input sample x, filter output (control units),
   * NCO frequency, and the scenario's frequency offset (Hz).
   */
  push(n: number, inPhase: number, ncoPhase: number, x: number, y: number, ncoHz: number, offsetHz: number): void {
    let e = inPhase - ncoPhase;
    e -= Math.round(e);
    let de = e - this.prevWrapped;
    de -= Math.round(de);
    this.prevWrapped = e;
    this.unwrapped = n === 0 ? e * TWO_PI : this.unwrapped + de * TWO_PI;
    const eu = this.unwrapped;
    const box = this.boxcar;
    this.boxSum += eu - (box[this.boxIndex] as number);
    box[this.boxIndex] = eu;
    this.boxIndex = (this.boxIndex + 1) % box.length;
    if (this.boxFilled < box.length) this.boxFilled++;
    const smooth = this.boxSum / this.boxFilled;
    // Quadrature arm: x·sin(θo)·2/A ≈ cos θe after the ripple is filtered (multiplier identity, G3 Ch. 2).
    const q = (2 * x * Math.sin(TWO_PI * ncoPhase)) / this.s.amplitude;
    this.lockState += this.lockAlpha * (q - this.lockState);
    this.phase.push(n, e * TWO_PI);
    this.filter.push(n, y);
    this.freq.push(n, ncoHz);
    this.lock.push(n, this.lockState);
    this.one[0] = smooth;
    this.oneOffset[0] = offsetHz;
    this.settle.pushRange(n, 1, this.one, this.oneOffset);
    if (n >= this.tailStart) {
      this.tailSum += eu;
      this.tailSum2 += eu * eu;
      this.tailFreqSum += ncoHz - (this.s.centerHz + offsetHz);
      this.tailCount++;
    }
    if (n >= this.demodStart) {
      const d = y * this.s.gainHzPerUnit - offsetHz;
      this.demodSum2 += d * d;
      this.demodCount++;
    }
    if (this.full) {
      this.full.phaseErrorRad[n] = e * TWO_PI;
      this.full.filterOutput[n] = y;
      this.full.ncoFrequencyHz[n] = ncoHz;
      this.full.offsetHz[n] = offsetHz;
    }
  }

  finish(): SimRun {
    const run: SimRun = {
      traces: {
        phaseErrorRad: this.phase.trace(),
        filterOutput: this.filter.trace(),
        ncoFrequencyHz: this.freq.trace(),
        lockIndicator: this.lock.trace(),
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
    };
  }
}
