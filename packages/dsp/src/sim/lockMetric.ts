/**
 * Lock and lock time of one simulated run (float or bit-true), the one definition every screen,
 * release and search reads (REFERENCES.md, "Lock and lock time"):
 *
 * - The phase error is averaged over one period of the detector's 2·centerHz ripple (the boxcar of
 *   runAccumulator.ts) and unwrapped, so a cycle slip shows as a 2π jump.
 * - Under FM the designed loop cannot hold the error still: it follows the modulation with the
 *   tracking error (1 − H)·θi of the linear discrete loop (G3 Ch. 2 on tracking; H = L/(1 + L) as
 *   in analysis/response.ts). That periodic course is subtracted first (modulationReference). For
 *   the other inputs a type-1 loop rests at asin(Δω/(K·F(0))) for the offset Δω of the moment (G3
 *   Ch. 2; a type-2 loop at 0): that is subtracted instead, so a slow sweep is not taken for a transient.
 * - Lock time is the settling time of what is left (Og5): the moment after which it stays within
 *   ±lockToleranceRad of its final value (the mean over the last tenth of the run). A slip after
 *   that moment would leave the band by 2π, so "locked" also means "no cycle slip since".
 * - The band is tested on buckets laid on a grid fixed from the start of the run (LockTracker), so the
 *   same input gives the same lock time whatever the run's length. The reported time is moved back
 *   by the boxcar's delay.
 * - A run is locked when the band has held from the lock time for at least the final tenth of the run
 *   and at least six loop time constants 1/ωc (ωc the crossover of the designed loop), so a slow
 *   transient in a short run is not taken for a final value: a run that ends during the transient,
 *   or that never settles, reports "not locked" and no lock time.
 *
 * Everything is accumulated a chunk at a time (pushRange), after the recurrences of the accumulator.
 */
import type { Scenario } from '../spec/scenario.ts';
import type { Sos } from '../types/filter.ts';
import { closedLoop, discreteLoopResponse } from '../analysis/response.ts';
import { loopGain, type LoopGainInput } from '../analysis/loopGain.ts';
import { integratorCount } from '../analysis/discreteLoop.ts';
import { modulationWaveform } from './inputSignal.ts';

/** What the screens say the two metrics mean (kept beside the code that computes them). */
export const LOCK_DEFINITION =
  'Locked means the phase error, averaged over one period of the 2·fc detector ripple and less the error the designed loop should show (under FM its tracking error of the modulation; otherwise, for a type-1 loop, asin(offset/hold-in)), ' +
  'stays within ± the lock tolerance of its final value (its mean over the last tenth of the run), with no cycle slip, for at least that last tenth and six loop time constants. ' +
  'Lock time is the moment it enters that band for good (the settling time of a step response, Og5); one input gives one lock time whatever the run’s length.';

const TWO_PI = 2 * Math.PI;
/** Buckets per doubling of the bucket width (the band's relative time resolution after the first level). */
const LOCK_BUCKETS_PER_LEVEL = 4096;
/** Points of one modulation period in the reference table. */
const REFERENCE_POINTS = 1024;
/** Harmonics of the modulation the reference sums (the high ones add only a negligible correction). */
const MAX_HARMONIC = 255;

/** Loop time constants 1/ωc the band must hold for before a run counts as locked (common practice, no source). */
const HOLD_TIME_CONSTANTS = 6;

/** What the lock test needs to know of the loop and the scenario, computed once per simulation. */
export interface LockModel {
  /** The tracking error under the scenario's FM; null for the other scenarios. */
  readonly reference: ModulationReference | null;
  /**
   * Not under FM, for a type-1 loop: K·F(0)/(2π) in Hz, the offset whose equilibrium error is π/2, so
   * that the error rests at asin(offsetHz/this); null for FM and for a type-2 loop (rest at 0).
   */
  readonly staticHoldInHz: number | null;
  /** Shortest stretch, in seconds, the band must hold to the end of the run (HOLD_TIME_CONSTANTS/ωc; 0 when |L| has no crossover). */
  readonly minHoldS: number;
}

/** The tracking error of the linear loop over one modulation period, as a table of REFERENCE_POINTS radians. */
export interface ModulationReference {
  readonly rateHz: number;
  readonly errorRad: Float64Array;
}

/** The loop the reference is computed for: its gain inputs, loop rate and float sections. */
export interface ReferenceLoop {
  readonly spec: LoopGainInput & { readonly sampleRateHz: number };
  readonly sections: readonly Sos[];
}

export function lockModel(loop: ReferenceLoop, scenario: Scenario): LockModel {
  const open = discreteLoopResponse(loop.sections, loopGain(loop.spec).kRadPerS, loop.spec.sampleRateHz);
  const fcHz = crossoverHz((f) => {
    const l = open(f);
    return Math.hypot(l.re, l.im);
  }, loop.spec.sampleRateHz);
  const dc = integratorCount(loop.sections) > 0 ? null : loop.sections.reduce((g, sec) => (g * (sec.b[0] + sec.b[1] + sec.b[2])) / (sec.a[0] + sec.a[1] + sec.a[2]), 1);
  const staticHoldInHz = scenario.kind === 'fm' || dc === null ? null : (loopGain(loop.spec).kRadPerS * dc) / TWO_PI;
  return {
    reference: modulationReference(loop, scenario),
    staticHoldInHz: staticHoldInHz !== null && Number.isFinite(staticHoldInHz) && staticHoldInHz !== 0 ? staticHoldInHz : null,
    minHoldS: fcHz === null ? 0 : HOLD_TIME_CONSTANTS / (TWO_PI * fcHz),
  };
}

/** The highest frequency below fs/2 where |L| falls through 1 (a log scan, then bisection); null when it never does. */
function crossoverHz(magnitude: (f: number) => number, sampleRateHz: number): number | null {
  const points = 240;
  const f0 = sampleRateHz * 1e-9;
  const f1 = sampleRateHz / 2;
  const at = (i: number) => f0 * (f1 / f0) ** (i / (points - 1));
  let hi = -1;
  for (let i = points - 1; i >= 0; i--) {
    if (magnitude(at(i)) >= 1) {
      hi = i;
      break;
    }
  }
  if (hi < 0 || hi === points - 1) return null;
  let a = at(hi);
  let b = at(hi + 1);
  for (let k = 0; k < 60; k++) {
    const m = Math.sqrt(a * b);
    if (magnitude(m) >= 1) a = m;
    else b = m;
  }
  return Math.sqrt(a * b);
}

/**
 * θe = (1 − H)·θi over one period for an FM scenario (null for the others, whose reference is 0).
 * θi is the zero-mean part of the input phase 2π·∫deviationHz·m(rateHz·t)dt, tabulated from the
 * same waveform the input uses; its DFT coefficients C_k give θe = θi − 2·Re Σ_k H(k·rateHz)·C_k·e^{j2πkp}
 * (H(z) periodic in fs, so harmonics above fs/2 get their aliased response).
 */
export function modulationReference(loop: ReferenceLoop, scenario: Scenario): ModulationReference | null {
  if (scenario.kind !== 'fm') return null;
  const { rateHz, deviationHz, modulation } = scenario;
  const n = REFERENCE_POINTS;
  const theta = inputPhaseTable(modulation, (TWO_PI * deviationHz) / rateHz, n);
  const h = closedLoop(discreteLoopResponse(loop.sections, loopGain(loop.spec).kRadPerS, loop.spec.sampleRateHz));
  const errorRad = Float64Array.from(theta);
  const cos = new Float64Array(n);
  const sin = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    cos[i] = Math.cos((TWO_PI * i) / n);
    sin[i] = Math.sin((TWO_PI * i) / n);
  }
  // Odd harmonics only: the three waveforms are half-wave antisymmetric, m(p + ½) = −m(p), and so is
  // the zero-mean phase, whose even coefficients vanish. Indices step by k modulo N without a division.
  for (let k = 1; k <= Math.min(MAX_HARMONIC, n / 2 - 1); k += 2) {
    // C_k = (1/N)·Σ θ[i]·e^{−j2πki/N}
    let cr = 0;
    let ci = 0;
    for (let i = 0, m = 0; i < n; i++) {
      cr += (theta[i] as number) * (cos[m] as number);
      ci -= (theta[i] as number) * (sin[m] as number);
      m += k;
      if (m >= n) m -= n;
    }
    cr /= n;
    ci /= n;
    const hk = h(k * rateHz);
    const pr = hk.re * cr - hk.im * ci;
    const pi = hk.re * ci + hk.im * cr;
    if (Math.hypot(pr, pi) < 1e-9) continue; // below a nanoradian: nothing to add
    for (let i = 0, m = 0; i < n; i++) {
      errorRad[i] = (errorRad[i] as number) - 2 * (pr * (cos[m] as number) - pi * (sin[m] as number));
      m += k;
      if (m >= n) m -= n;
    }
  }
  return { rateHz, errorRad };
}

/** Zero-mean input phase over one modulation period, radians: scale·∫₀^p m(q)dq minus its mean (midpoint rule, 8 steps a point). */
function inputPhaseTable(kind: 'sine' | 'triangle' | 'square', scale: number, n: number): Float64Array {
  const sub = 8;
  const table = new Float64Array(n);
  let integral = 0;
  for (let i = 0; i < n; i++) {
    table[i] = scale * integral;
    for (let j = 0; j < sub; j++) integral += modulationWaveform(kind, (i + (j + 0.5) / sub) / n) / (n * sub);
  }
  let mean = 0;
  for (let i = 0; i < n; i++) mean += table[i] as number;
  mean /= n;
  for (let i = 0; i < n; i++) table[i] = (table[i] as number) - mean;
  return table;
}

export interface LockSetup {
  readonly total: number;
  readonly sampleRateHz: number;
  readonly lockToleranceRad: number;
  /** Samples of the ripple boxcar (its delay is (length − 1)/2). */
  readonly boxcarLength: number;
  readonly model: LockModel;
}

export interface LockFigures {
  readonly lockTimeS: number | null;
  readonly locked: boolean;
}

/** Width of the first buckets: a quarter of the ripple boxcar (the smoothing blurs finer detail anyway). */
function firstBucketSamples(boxcarLength: number): number {
  return Math.max(1, Math.round(boxcarLength / 4));
}

/**
 * Min and max of the ripple-free, reference-corrected phase error per bucket, on a grid fixed from the
 * start of the run: 2·LOCK_BUCKETS_PER_LEVEL buckets of the first width, then LOCK_BUCKETS_PER_LEVEL
 * buckets for every doubling of the time, each level twice as wide as the one before. The resolution is
 * one first width up to 8192 of them and a 4096th of the time after that, whatever the run's length;
 * a run of 50 M samples needs about 60 000 buckets.
 */
/**
 * The per-sample loops of pushRange run elsewhere (the WebAssembly module, wasmTraced.ts) on arrays
 * in its memory: the same comparisons and additions in the same order.
 */
export interface LockKernel {
  /** An array of the kernel's memory for the corrected error (a chunk's worth). */
  readonly scratch: Float64Array;
  /**
   * The open bucket's min and max, the tail sum, the bucket's end, width and place in its level, and
   * how many buckets the last `buckets` call closed: what `buckets` and `sum` read and advance.
   */
  readonly slots: Float64Array;
  /** The min, max and end of each bucket the last `buckets` call closed. */
  readonly closedMin: Float64Array;
  readonly closedMax: Float64Array;
  readonly closedEnds: Float64Array;
  /**
   * pushRange's loop and nextBucket over values[i0..count) of the chunk from sample n0 (values in the
   * kernel's memory), perLevel buckets a level; returns where it stopped: count, or earlier when
   * `closed` is full (then call again from there).
   */
  buckets(values: Float64Array, n0: number, i0: number, count: number, perLevel: number): number;
  /** Add values[i0..i1) to slots[2], in order. */
  sum(values: Float64Array, i0: number, i1: number): void;
}

export class LockTracker {
  /**
   * The closed buckets' min and max and one past the last sample of each, the first closedCount of
   * each array (typed arrays sized for the run's grid: a long run closes tens of thousands, which arrays
   * of numbers would keep reallocating and the collector copying; grown by doubling should more come).
   */
  private min: Float64Array;
  private max: Float64Array;
  private ends: Float64Array;
  private closedCount = 0;
  private bucketEnd = 0;
  private bucketWidth: number;
  private inLevel = LOCK_BUCKETS_PER_LEVEL;
  private lo = Infinity;
  private hi = -Infinity;
  private readonly delaySamples: number;
  private readonly tailStart: number;
  /** The last sample the band may be entered at for the run to count as locked. */
  private readonly latestEnter: number;
  private tailSum = 0;
  private tailCount = 0;
  /** The reference table with its first point repeated at the end (interpolation never wraps), or null. */
  private readonly table: Float64Array | null;
  /** Table points per sample. */
  private readonly tableStep: number;
  private scratch: Float64Array = new Float64Array(0);

  constructor(
    private readonly s: LockSetup,
    private readonly kernel: LockKernel | null = null,
  ) {
    const ref = s.model.reference;
    this.table = ref ? Float64Array.from([...ref.errorRad, ref.errorRad[0] as number]) : null;
    this.tableStep = ref ? (ref.rateHz / s.sampleRateHz) * ref.errorRad.length : 0;
    // The first level has twice the buckets, so every later level starts where the time doubles.
    this.bucketWidth = firstBucketSamples(s.boxcarLength);
    this.inLevel = -LOCK_BUCKETS_PER_LEVEL;
    this.delaySamples = (s.boxcarLength - 1) / 2;
    this.tailStart = Math.floor(0.9 * s.total);
    this.latestEnter = Math.min(this.tailStart, s.total - s.model.minHoldS * s.sampleRateHz);
    // Sized for the run's whole grid at once: grown by doubling, a 10^6-sample run allocated and copied five times as much.
    const capacity = gridBuckets(s.total, this.bucketWidth);
    this.min = new Float64Array(capacity);
    this.max = new Float64Array(capacity);
    this.ends = new Float64Array(capacity);
  }

  /** Room for `more` closed buckets. */
  private reserve(more: number): void {
    const need = this.closedCount + more;
    if (need <= this.min.length) return;
    const size = Math.max(need, 2 * this.min.length);
    const grown = (a: Float64Array) => {
      const b = new Float64Array(size);
      b.set(a.subarray(0, this.closedCount));
      return b;
    };
    this.min = grown(this.min);
    this.max = grown(this.max);
    this.ends = grown(this.ends);
  }

  private close(lo: number, hi: number, end: number): void {
    this.reserve(1);
    const n = this.closedCount++;
    this.min[n] = lo;
    this.max[n] = hi;
    this.ends[n] = end;
  }

  /** Close the current bucket (if it holds samples) and open the next one on the grid. */
  private nextBucket(): void {
    if (this.bucketEnd > 0) this.close(this.lo, this.hi, this.bucketEnd);
    if (this.inLevel === LOCK_BUCKETS_PER_LEVEL) {
      this.inLevel = 0;
      this.bucketWidth *= 2;
    }
    this.inLevel++;
    this.bucketEnd += this.bucketWidth;
    this.lo = Infinity;
    this.hi = -Infinity;
  }

  /** Smoothed unwrapped phase error (rad) and the input's frequency offset (Hz) of samples n0 … n0 + count − 1, in order. */
  pushRange(n0: number, count: number, smooth: Float64Array, offsetHz: Float64Array): void {
    const d = this.corrected(n0, count, smooth, offsetHz);
    if (this.kernel) {
      this.kernelRange(this.kernel, n0, count, d);
      return;
    }
    let i = 0;
    while (i < count) {
      if (n0 + i >= this.bucketEnd) this.nextBucket();
      const end = Math.min(count, this.bucketEnd - n0);
      let lo = this.lo;
      let hi = this.hi;
      for (; i < end; i++) {
        const v = d[i] as number;
        if (v < lo) lo = v;
        if (v > hi) hi = v;
        if (v !== v) {
          lo = NaN; // a NaN keeps the bucket out of band
          hi = NaN;
        }
      }
      this.lo = lo;
      this.hi = hi;
    }
    for (let k = Math.max(0, this.tailStart - n0); k < count; k++) this.tailSum += d[k] as number;
    this.tailCount += Math.max(0, n0 + count - Math.max(n0, this.tailStart));
  }

  /** pushRange's bucket and tail loops through the kernel, on the corrected chunk d in its memory. */
  private kernelRange(kernel: LockKernel, n0: number, count: number, d: Float64Array): void {
    const { slots, closedMin, closedMax, closedEnds } = kernel;
    slots[0] = this.lo;
    slots[1] = this.hi;
    slots[3] = this.bucketEnd;
    slots[4] = this.bucketWidth;
    slots[5] = this.inLevel;
    for (let i = 0; i < count; ) {
      i = kernel.buckets(d, n0, i, count, LOCK_BUCKETS_PER_LEVEL);
      const n = slots[6] as number;
      this.reserve(n);
      this.min.set(closedMin.subarray(0, n), this.closedCount);
      this.max.set(closedMax.subarray(0, n), this.closedCount);
      this.ends.set(closedEnds.subarray(0, n), this.closedCount);
      this.closedCount += n;
    }
    this.lo = slots[0] as number;
    this.hi = slots[1] as number;
    this.bucketEnd = slots[3] as number;
    this.bucketWidth = slots[4] as number;
    this.inLevel = slots[5] as number;
    const from = Math.max(0, this.tailStart - n0);
    if (from < count) {
      slots[2] = this.tailSum;
      kernel.sum(d, from, count);
      this.tailSum = slots[2] as number;
    }
    this.tailCount += Math.max(0, n0 + count - Math.max(n0, this.tailStart));
  }

  /** The chunk less the reference (in the scratch array), or the chunk itself when there is none. */
  private corrected(n0: number, count: number, smooth: Float64Array, offsetHz: Float64Array): Float64Array {
    const table = this.table;
    const holdInHz = this.s.model.staticHoldInHz;
    if (!table && holdInHz === null) return smooth;
    if (this.kernel) this.scratch = this.kernel.scratch;
    else if (this.scratch.length < count) this.scratch = new Float64Array(count);
    const out = this.scratch;
    if (!table) {
      // asin(Δf/hold-in), beyond hold-in the nearest equilibrium ±π/2 (there is none: the loop slips);
      // recomputed only when the offset changes (a tone or a step keeps it for many samples).
      let lastHz = NaN;
      let rest = 0;
      for (let i = 0; i < count; i++) {
        const f = offsetHz[i] as number;
        if (f !== lastHz) {
          lastHz = f;
          rest = Math.asin(Math.max(-1, Math.min(1, f / (holdInHz as number))));
        }
        out[i] = (smooth[i] as number) - rest;
      }
      return out;
    }
    const points = table.length - 1;
    const step = this.tableStep;
    // Table position of sample n: the boxcar's centre, less the half sample by which the input phase,
    // a sum over earlier samples, trails the integral of the offset; advanced by one step a sample.
    let x = (n0 - this.delaySamples - 0.5) * step;
    x -= points * Math.floor(x / points);
    for (let i = 0; i < count; i++) {
      const j = x | 0;
      const a = table[j] as number;
      out[i] = (smooth[i] as number) - (a + (x - j) * ((table[j + 1] as number) - a));
      x += step;
      if (x >= points) x -= points;
    }
    return out;
  }

  finish(): LockFigures {
    if (this.bucketEnd > 0) {
      this.close(this.lo, this.hi, Math.min(this.bucketEnd, this.s.total));
      this.bucketEnd = 0;
    }
    const final = this.tailSum / Math.max(1, this.tailCount);
    const tol = this.s.lockToleranceRad;
    const { ends, closedCount } = this;
    const k = bandEntry(this.min, this.max, closedCount, final - tol, final + tol);
    if (k === closedCount) return { lockTimeS: null, locked: false };
    const enterSample = k === 0 ? 0 : Math.max(0, (ends[k - 1] as number) - this.delaySamples);
    if (enterSample > this.latestEnter) return { lockTimeS: null, locked: false };
    return { lockTimeS: enterSample / this.s.sampleRateHz, locked: true };
  }
}

/**
 * The first of the last closed buckets that all lie within [lo, hi] (count when the last does not).
 * A function of its own: the engine compiles this loop while it runs (on-stack replacement), and
 * inside finish that compile came in the first run, before the code after the loop had ever run; the
 * compiled loop, entered again at every later run, then fell back to the interpreter there each time
 * (--trace-deopt: 18 times in 40 float runs, none now).
 */
function bandEntry(min: Float64Array, max: Float64Array, count: number, lo: number, hi: number): number {
  let k = count;
  while (k > 0 && (min[k - 1] as number) >= lo && (max[k - 1] as number) <= hi) k--;
  return k;
}

/** Buckets of the lock grid (LockTracker) that start before sample `total`, from buckets of `firstWidth`. */
function gridBuckets(total: number, firstWidth: number): number {
  let count = 0;
  let start = 0;
  let width = firstWidth;
  for (let inLevel = 2 * LOCK_BUCKETS_PER_LEVEL; start < total; inLevel = LOCK_BUCKETS_PER_LEVEL) {
    const n = Math.min(inLevel, Math.ceil((total - start) / width));
    count += n;
    start += n * width;
    width *= 2;
  }
  return Math.max(1, count);
}
