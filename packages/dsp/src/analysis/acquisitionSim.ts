/**
 * Lock-in, pull-out, hold-in and pull-in measured by simulating the NONLINEAR float loop (the same
 * loop as src/sim/floatKernel.ts), because the textbook formulas (G3, B6; src/analysis/estimates.ts)
 * are rough and can be off by up to 2x (Ku23). Definitions used (after Ku23, which makes them precise):
 * - cycle slip: the phase error leaves its starting value by 2π or more at some time, sup|θe(t) − θe(0)| ≥ 2π;
 * - lock-in: largest input offset from which the loop, started at rest (filter state zero, NCO at
 *   centerHz), locks without a cycle slip for every tested initial phase;
 * - pull-out: largest frequency step applied to a locked loop that causes no cycle slip;
 * - hold-in: largest offset a locked loop keeps: the input is ramped slowly from centerHz to the
 *   offset and held there, and the phase error must not pass π (the multiplier detector's unstable
 *   equilibrium, after which it slips) and must settle;
 * - pull-in: largest offset from which the loop, started at rest, ends locked (slips allowed) within
 *   the run length (a multiple of 1/(ζωn) plus the pull-in time estimate Δω²/(2ζωn³), G3).
 * Each is a bisection on the offset in [0, searchLimitHz] assuming pass below / fail above, until the
 * bracket is within 1 % of the figure or 0.5 Hz, whichever is larger.
 */
import type { Sos } from '../types/filter.ts';
import type { LoopSpec } from '../spec/schema.ts';
import type { Scenario } from '../spec/scenario.ts';
import type { AcquisitionLimit, AcquisitionMeasurement, AcquisitionOptions, AcquisitionSimResult } from '../types/sim.ts';
import { designLoopFilter } from '../design.ts';
import { loopGain } from './loopGain.ts';
import { allocInputChunk, inputGenerator } from '../sim/inputSignal.ts';
import { initialFloatState, runFloatChunk, type FloatLoopConfig } from '../sim/floatKernel.ts';
import { SimulationAbortedError } from '../sim/simulate.ts';
import { rippleBoxcarSamples } from '../sim/rippleBoxcar.ts';

const TWO_PI = 2 * Math.PI;
const CHUNK = 4096;
const DEFAULT_PHASES_DEG = [0, 60, 120, 180, 240, 300];
const MAX_RUN_SAMPLES = 400_000;
const MIN_RUN_SAMPLES = 2_000;
/** Locked at the end: the ripple-free phase error moves less than this over the last 20 % of the run. */
const LOCKED_SPAN_RAD = 0.1;
/** The multiplier detector's unstable equilibrium is π from the stable one: passing it starts a slip. */
const HOLD_LOSS_RAD = Math.PI;

interface Trial {
  readonly slipped: boolean;
  readonly lockedAtEnd: boolean;
}

interface Context {
  readonly spec: LoopSpec;
  readonly cfg: FloatLoopConfig;
  readonly options: AcquisitionOptions;
  readonly budget: number;
  used: number;
  runs: number;
  exhausted: boolean;
}

/** F(0) of a cascade; null when a section has a pole at z = 1 (an integrator: type-2 loop). */
export function cascadeDcGain(sections: readonly Sos[]): number | null {
  let g = 1;
  for (const { b, a } of sections) {
    const den = a[0] + a[1] + a[2];
    if (Math.abs(den) <= 1e-12 * (Math.abs(a[0]) + Math.abs(a[1]) + Math.abs(a[2]))) return null;
    g *= (b[0] + b[1] + b[2]) / den;
  }
  return g;
}

/** Simulate one scenario; stop early once a slip is seen when `stopOnSlip`. */
/** Thrown inside a bisection when the sample budget is spent; the bisection keeps its bracket. */
class BudgetSpent extends Error {}

function trial(ctx: Context, scenario: Scenario, samples: number, stopOnSlip: boolean, slipRad = TWO_PI, offsetFnHz?: (tS: number) => number): Trial {
  const { spec, cfg } = ctx;
  if (ctx.options.signal?.aborted) throw new SimulationAbortedError();
  if (ctx.used >= ctx.budget) {
    ctx.exhausted = true;
    throw new BudgetSpent();
  }
  ctx.runs++;
  const gen = inputGenerator(scenario, spec.sampleRateHz, spec.centerHz, spec.input.amplitude, offsetFnHz);
  const input = allocInputChunk(CHUNK);
  const out = { ncoPhaseCycles: new Float64Array(CHUNK), filterOutput: new Float64Array(CHUNK) };
  const st = initialFloatState(cfg);
  // Boxcar over one period of the 2·centerHz ripple for the end-of-run lock test.
  const box = rippleBoxcarSamples(spec.sampleRateHz, spec.centerHz, samples);
  const tailFrom = Math.floor(samples * 0.8);
  let e0 = 0;
  let eu = 0;
  let prev = 0;
  let slipAt: number | null = null;
  let tailMin = Infinity;
  let tailMax = -Infinity;
  let boxSum = 0;
  const ring = new Float64Array(box);
  for (let n0 = 0; n0 < samples; n0 += CHUNK) {
    const count = Math.min(CHUNK, samples - n0);
    gen.next(input, n0, count);
    runFloatChunk(cfg, st, input.x, count, out);
    ctx.used += count;
    for (let i = 0; i < count; i++) {
      const n = n0 + i;
      let e = (input.phaseCycles[i] as number) - (out.ncoPhaseCycles[i] as number);
      e -= Math.round(e);
      let de = e - prev;
      de -= Math.round(de);
      prev = e;
      if (n === 0) {
        e0 = e * TWO_PI;
        eu = e0;
      } else eu += de * TWO_PI;
      if (slipAt === null && Math.abs(eu - e0) >= slipRad) slipAt = n;
      boxSum += eu - (ring[n % box] as number);
      ring[n % box] = eu;
      if (n >= tailFrom && n >= box) {
        const s = boxSum / box;
        if (s < tailMin) tailMin = s;
        if (s > tailMax) tailMax = s;
      }
    }
    if (stopOnSlip && slipAt !== null) break;
  }
  return { slipped: slipAt !== null, lockedAtEnd: tailMax - tailMin < LOCKED_SPAN_RAD };
}

/**
 * Bisection for the largest offset in [0, limit] that passes; `pass` must be monotone (true below).
 * Bisects until the bracket is no wider than its tolerance (1 % of its lower end, or the floor in Hz,
 * whichever is larger) or `maxSteps` is spent. Where the search hits a limit it says which and reports
 * no figure rather than the limit: the loop still passing at the search limit (the control word's
 * range or the search range), or the sample budget spent before the bracket was tight.
 */
function bisect(q: Search, pass: (hz: number) => boolean, definition: string, progress: (fraction: number) => void): AcquisitionMeasurement {
  let lo = 0;
  let hi = q.limitHz;
  const tolerance = (): number => Math.max(q.relativeTolerance * lo, q.floorToleranceHz);
  const result = (limitedBy: AcquisitionLimit | null, failHz: number | null): AcquisitionMeasurement => ({
    valueHz: limitedBy === null && lo > 0 && failHz !== null ? (lo + failHz) / 2 : null,
    passHz: lo,
    failHz,
    toleranceHz: tolerance(),
    limitedBy,
    atSearchLimit: limitedBy === 'control-range' || limitedBy === 'search-range',
    definition,
  });
  try {
    if (pass(q.limitHz)) {
      lo = q.limitHz;
      return result(q.limitKind, null);
    }
    for (let k = 0; k < q.maxSteps && hi - lo > tolerance(); k++) {
      const mid: number = (lo + hi) / 2;
      if (pass(mid)) lo = mid;
      else hi = mid;
      progress(Math.min(1, (k + 1) / q.expectedSteps));
    }
  } catch (err) {
    if (!(err instanceof BudgetSpent)) throw err;
    return result('sample-budget', hi);
  }
  return result(hi - lo > tolerance() ? 'bisection-steps' : null, hi);
}

/** What every figure's search shares: the limits and the loop's time scale. */
interface Search {
  readonly limitHz: number;
  /** What the search limit is: the bit-true control word's range or the search range (1.5·K·F(0)). */
  readonly limitKind: 'control-range' | 'search-range';
  readonly relativeTolerance: number;
  readonly floorToleranceHz: number;
  readonly maxSteps: number;
  /** Steps the bracket usually needs (for the progress fraction). */
  readonly expectedSteps: number;
  readonly phasesDeg: readonly number[];
  readonly fs: number;
  /** ζωn-based run length (s) and the characteristic rate ωn (rad/s) with damping ζ. */
  readonly settleS: number;
  readonly wn: number;
  readonly zeta: number;
}

type Progress = (fraction: number) => void;

function runSamples(q: Search, seconds: number): number {
  return Math.max(MIN_RUN_SAMPLES, Math.min(MAX_RUN_SAMPLES, Math.ceil(seconds * q.fs)));
}

function lockIn(ctx: Context, q: Search, progress: Progress): AcquisitionMeasurement {
  const n = runSamples(q, q.settleS);
  return bisect(q, (hz) => q.phasesDeg.every((p) => {
    const t = trial(ctx, { kind: 'tone', offsetHz: hz, initialPhaseDeg: p, durationS: n / q.fs }, n, true);
    return !t.slipped && t.lockedAtEnd;
  }), `largest offset that locks from rest without a cycle slip for initial phases ${q.phasesDeg.join(', ')}°`, progress);
}

function pullOut(ctx: Context, q: Search, progress: Progress): AcquisitionMeasurement {
  const atS = 10 / q.fs;
  const n = runSamples(q, q.settleS + atS);
  return bisect(q, (hz) => !trial(ctx, { kind: 'frequency-step', stepHz: hz, atS, durationS: n / q.fs }, n, true).slipped,
    'largest frequency step on a locked loop that causes no cycle slip', progress);
}

/**
 * Ramp slowly from centre to the offset, then hold it. The ramp rate is 2 % of ωn² (rad/s²), so its
 * own phase error (dΔω/dt)/ωn² (G3) is about 0.02 rad; the hold shows whether an equilibrium exists
 * there. Lock is lost when the error passes the detector's unstable equilibrium (π).
 */
function holdIn(ctx: Context, q: Search, progress: Progress): AcquisitionMeasurement {
  const rampHzPerS = (0.02 * q.wn * q.wn) / TWO_PI;
  return bisect(q, (hz) => {
    const rampS = hz / rampHzPerS;
    const n = Math.min(MAX_RUN_SAMPLES * 4, runSamples(q, q.settleS) + Math.ceil(rampS * q.fs));
    const t = trial(ctx, { kind: 'tone', offsetHz: hz, durationS: n / q.fs }, n, true, HOLD_LOSS_RAD, (tS) => hz * Math.min(1, tS / rampS));
    return !t.slipped && t.lockedAtEnd;
  }, 'largest offset a locked loop holds: a slow ramp from centre to the offset, then a hold, without the phase error passing π', progress);
}

/** Run length: the settle time plus three pull-in times Δω²/(2ζωn³) (G3) for the offset tried. */
function pullIn(ctx: Context, q: Search, progress: Progress): AcquisitionMeasurement {
  const pullTimeS = (hz: number) => (TWO_PI * hz) ** 2 / (2 * q.zeta * q.wn ** 3);
  return bisect(q, (hz) => {
    const n = runSamples(q, q.settleS + 3 * pullTimeS(hz));
    return trial(ctx, { kind: 'tone', offsetHz: hz, initialPhaseDeg: 0, durationS: n / q.fs }, n, false).lockedAtEnd;
  }, 'largest offset from which the loop, started at rest, ends locked (cycle slips allowed) within the run', progress);
}

/** The bracket a figure aims for: 1 % of the figure or 0.5 Hz, whichever is larger (issue target). */
export const ACQUISITION_RELATIVE_TOLERANCE = 0.01;
export const ACQUISITION_FLOOR_TOLERANCE_HZ = 0.5;
/** Default sample budget: about half a second of the float loop on one core of this machine. */
export const DEFAULT_ACQUISITION_SAMPLES = 4_000_000;

/** The loop a search runs and its time scale, from the spec (float loop, designed sections). */
function searchOf(spec: LoopSpec, options: AcquisitionOptions): { readonly cfg: FloatLoopConfig; readonly search: Search; readonly notes: string[] } {
  const design = designLoopFilter(spec);
  const cfg: FloatLoopConfig = {
    sampleRateHz: spec.sampleRateHz,
    centerHz: spec.centerHz,
    gainHzPerUnit: spec.nco.gainHzPerUnit,
    waveform: spec.nco.waveform,
    sections: design.sections,
  };
  const k = loopGain(spec).kRadPerS;
  const dc = cascadeDcGain(design.sections);
  const zeta = design.damping ?? 0.7;
  // Characteristic rate: ωn for second-order loops, else the type-1 loop's K·F(0) (its crossover).
  const wn = design.naturalHz !== undefined ? TWO_PI * design.naturalHz : k * Math.abs(dc ?? 1);
  const notes: string[] = [];
  // Type 1: hold-in is K·F(0); search a little beyond it. Type 2: the bit-true control word saturates at
  // ±1 unit, so the firmware cannot pull the NCO beyond ±gainHzPerUnit: that is the search limit.
  const searchRangeHz = dc === null ? Infinity : (1.5 * k * Math.abs(dc)) / TWO_PI;
  const limitKind = spec.nco.gainHzPerUnit <= searchRangeHz ? 'control-range' : 'search-range';
  const limitHz = Math.min(spec.nco.gainHzPerUnit, searchRangeHz);
  if (dc === null) notes.push('type-2 loop: hold-in and pull-in of the ideal float loop are unbounded; the search stops at ±gainHzPerUnit, the bit-true control range');
  const relativeTolerance = options.relativeTolerance ?? ACQUISITION_RELATIVE_TOLERANCE;
  const floorToleranceHz = options.floorToleranceHz ?? ACQUISITION_FLOOR_TOLERANCE_HZ;
  // Halvings from the search limit down to the tolerance at a figure near the limit.
  const expectedSteps = Math.max(1, Math.ceil(Math.log2(limitHz / Math.max(relativeTolerance * limitHz * 0.5, floorToleranceHz))));
  const search: Search = {
    limitHz,
    limitKind,
    relativeTolerance,
    floorToleranceHz,
    maxSteps: options.bisectionSteps ?? 20,
    expectedSteps,
    phasesDeg: options.initialPhasesDeg ?? DEFAULT_PHASES_DEG,
    fs: spec.sampleRateHz,
    // Long enough that an offset 1 % past a saddle-node (the hold-in edge) visibly drifts in the tail.
    settleS: 60 / (zeta * wn),
    wn,
    zeta,
  };
  return { cfg, search, notes };
}

/**
 * Measure the acquisition figures of a spec's loop by simulation (float, nonlinear, no noise).
 * Bounded by options.maxSamples; reports progress and honours options.signal between runs.
 */
export function measureAcquisition(spec: LoopSpec, options: AcquisitionOptions = {}): AcquisitionSimResult {
  const { cfg, search, notes } = searchOf(spec, options);
  const ctx: Context = { spec, cfg, options, budget: options.maxSamples ?? DEFAULT_ACQUISITION_SAMPLES, used: 0, runs: 0, exhausted: false };
  const measures = [lockIn, pullOut, holdIn, pullIn];
  const figures = measures.map((measure, i) => {
    const m = measure(ctx, search, (f) => options.onProgress?.((i + Math.min(f, 0.99)) / measures.length));
    options.onProgress?.((i + 1) / measures.length);
    return m;
  }) as [AcquisitionMeasurement, AcquisitionMeasurement, AcquisitionMeasurement, AcquisitionMeasurement];
  if (ctx.exhausted) notes.push('sample budget spent: the searches after it report their bracket and no figure');
  return {
    label: 'simulated',
    lockInHz: figures[0],
    pullOutHz: figures[1],
    holdInHz: figures[2],
    pullInHz: figures[3],
    searchLimitHz: search.limitHz,
    searchLimitKind: search.limitKind,
    relativeTolerance: search.relativeTolerance,
    floorToleranceHz: search.floorToleranceHz,
    initialPhasesDeg: search.phasesDeg,
    runs: ctx.runs,
    samplesSimulated: ctx.used,
    sampleBudget: ctx.budget,
    budgetExhausted: ctx.exhausted,
    notes,
  };
}
