/**
 * Word-length search: the smallest coefficient width (and data width) that keeps the loop stable, its
 * phase margin within a tolerance of the unquantised loop, and its filter response within a dB
 * tolerance — with the curve of those figures against width, for the design editor's plot.
 *
 * Coefficient widths are judged by analysis (quantizeSections, then discreteLoopMargins on the quantised
 * sections): quantisation moves poles most where they crowd z = 1, which is where narrow loop filters
 * live (OS3 Sec. 6.8 (memory)). Data widths have no closed form worth trusting (rounding of the
 * section states, dead bands, limit cycles), so they are judged by the bit-true simulation of a small
 * tone offset against the float loop on the same input (sim module's simulateLoop).
 * The reported minimum is the smallest width from which every wider width in the range also passes.
 */
import type { LoopSpec } from '../spec/schema.ts';
import type { Sos } from '../types/filter.ts';
import type { CoefficientFormat } from '../types/fixed.ts';
import { designLoopFilter } from '../design.ts';
import { discreteLoopMargins } from '../analysis/discreteLoop.ts';
import { quantizeSections } from '../fixed/quantizeSections.ts';
import { EXACT_INTEGER_BITS, WIDTH_LIMITS } from '../spec/limits.ts';
import { FieldError } from '../fixed/fieldError.ts';
import { SimulationAbortedError, simulateLoop } from '../sim/simulate.ts';
import { planBitTrue } from '../sim/bitTruePlan.ts';
import { ncoTuning } from '../nco/tuningWord.ts';
import { specControlScaling } from '../nco/controlScaling.ts';
import type { AbortFlag } from '../types/sim.ts';
import { acquisitionEstimates } from '../analysis/estimates.ts';
import { secondOrderParameters } from '../analysis/secondOrder.ts';
import { loopGain } from '../analysis/loopGain.ts';
import type { Scenario } from '../spec/scenario.ts';
import { datapathNoise } from '../analysis/datapathNoise.ts';
import { datapathFigures } from '../analysis/datapath.ts';
import { logGrid } from '../analysis/grid.ts';

export interface WordLengthOptions {
  readonly minCoefficientBits?: number;
  readonly maxCoefficientBits?: number;
  /** |PM(quantised) − PM(unquantised)| allowed, degrees (default 2). */
  readonly phaseMarginToleranceDeg?: number;
  /** Largest filter response deviation allowed, dB (default 0.5), as quantizeSections measures it. */
  readonly responseToleranceDb?: number;
  /** Also search the data width (default true). */
  readonly data?: boolean;
  readonly minDataBits?: number;
  readonly maxDataBits?: number;
  /** Allowed difference of the bit-true steady-state phase error (mean and jitter) from float, degrees (default 0.5). */
  readonly phaseErrorToleranceDeg?: number;
  /** Samples per data-width simulation (default 200 000); longer settling spans are cut to this. */
  readonly maxSamplesPerRun?: number;
  /** Grid points of each margin evaluation (default 400). */
  readonly points?: number;
  /** Progress in (0, 1] with the stage being searched. */
  readonly onProgress?: (fraction: number, stage: 'coefficients' | 'data') => void;
}

export interface CoefficientWidthPoint {
  readonly coefficientBits: number;
  readonly fractionBits: number | null;
  readonly stable: boolean;
  readonly phaseMarginDeg: number | null;
  readonly gainMarginDb: number | null;
  readonly crossoverHz: number | null;
  /** Quantised minus unquantised phase margin, degrees. */
  readonly phaseMarginErrorDeg: number | null;
  readonly maxDeviationDb: number | null;
  readonly passes: boolean;
  readonly reasons: readonly string[];
}

export interface DataWidthPoint {
  readonly dataBits: number;
  /** The MAC word used at this data width (fixedPoint.accumulatorBits, widened so it never limits). */
  readonly accumulatorBits: number;
  readonly locked: boolean;
  readonly steadyStatePhaseErrorDeg: number;
  readonly phaseJitterDeg: number;
  readonly cycleSlips: number;
  /** Predicted roundoff SNR at the filter output at this width (a full-scale sinusoid over the roundoff noise; datapathNoise), dB; null when the loop does not settle. */
  readonly predictedSnrDb: number | null;
  /** Predicted RMS roundoff jitter of the NCO phase at this width, degrees; null as above. */
  readonly predictedPhaseJitterDeg: number | null;
  readonly passes: boolean;
  readonly reasons: readonly string[];
}

export interface WordLengthResult {
  readonly reference: { readonly phaseMarginDeg: number | null; readonly gainMarginDb: number | null; readonly crossoverHz: number | null };
  readonly tolerances: { readonly phaseMarginDeg: number; readonly responseDb: number; readonly phaseErrorDeg: number };
  readonly coefficients: { readonly curve: readonly CoefficientWidthPoint[]; readonly minBits: number | null; readonly note: string | null };
  readonly data: {
    readonly curve: readonly DataWidthPoint[];
    readonly minBits: number | null;
    /** The coefficient width the data search ran with (the spec's own). */
    readonly coefficientBits: number;
    readonly scenario: Scenario;
    readonly floatReference: { readonly steadyStatePhaseErrorDeg: number; readonly phaseJitterDeg: number; readonly locked: boolean };
    readonly note: string | null;
  } | null;
  /** Why `data` is null although the data search was asked for. */
  readonly dataNote: string | null;
}

/** Run the search for a validated spec. */
export function wordLengthSearch(spec: LoopSpec, options: WordLengthOptions = {}): WordLengthResult {
  const steps = wordLengthSteps(spec, options);
  for (;;) {
    const r = steps.next();
    if (r.done) return r.value;
  }
}

/**
 * As wordLengthSearch, yielding to the event loop after each width so that a Web Worker can take a
 * cancel message; throws SimulationAbortedError (name "AbortError") once `signal.aborted` is seen.
 */
export async function wordLengthSearchAsync(
  spec: LoopSpec,
  options: WordLengthOptions & { readonly signal?: AbortFlag } = {},
): Promise<WordLengthResult> {
  const steps = wordLengthSteps(spec, options);
  for (;;) {
    if (options.signal?.aborted) throw new SimulationAbortedError();
    const r = steps.next();
    if (r.done) return r.value;
    await new Promise<void>((resolve) => setTimeout(resolve, 0));
  }
}

/** The search as a generator: one step per width evaluated. */
export function* wordLengthSteps(spec: LoopSpec, options: WordLengthOptions = {}): Generator<void, WordLengthResult> {
  const pmTol = options.phaseMarginToleranceDeg ?? 2;
  const dbTol = options.responseToleranceDb ?? 0.5;
  const errTol = options.phaseErrorToleranceDeg ?? 0.5;
  const points = options.points ?? 400;
  const sections = designLoopFilter(spec).sections;
  const ref = discreteLoopMargins(spec, sections, { points, closedLoop: false }).margins;
  const wantData = options.data ?? true;
  const coefficientShare = wantData ? 0.3 : 1;
  const progress = options.onProgress;
  const coefficients = yield* searchCoefficients(spec, sections, ref.phaseMarginDeg, { pmTol, dbTol, points, options }, (f) =>
    progress?.(f * coefficientShare, 'coefficients'),
  );
  const dataSearch = wantData ? yield* searchDataSafely(spec, sections, errTol, options, (f) => progress?.(coefficientShare + f * (1 - coefficientShare), 'data')) : { data: null, note: null };
  return {
    reference: { phaseMarginDeg: ref.phaseMarginDeg, gainMarginDb: ref.gainMarginDb, crossoverHz: ref.crossoverHz },
    tolerances: { phaseMarginDeg: pmTol, responseDb: dbTol, phaseErrorDeg: errTol },
    coefficients,
    data: dataSearch.data,
    dataNote: dataSearch.note,
  };
}

/** Smallest width from which every wider point passes; null when the widest fails. */
function minimumPassing<T extends { readonly passes: boolean }>(curve: readonly T[], width: (p: T) => number): number | null {
  let min: number | null = null;
  for (let i = curve.length - 1; i >= 0 && curve[i]!.passes; i--) min = width(curve[i]!);
  return min;
}

function coefficientFormatAt(spec: LoopSpec, bits: number): CoefficientFormat {
  const fp = spec.fixedPoint;
  // An explicit Q format keeps its integer bits as the word shrinks or grows; "auto" re-chooses.
  const fractionBits = fp.coefficientFractionBits === 'auto' ? 'auto' : Math.max(0, bits - (fp.coefficientBits - fp.coefficientFractionBits));
  return { coefficientBits: bits, coefficientFractionBits: fractionBits, rounding: fp.rounding, overflow: fp.overflow };
}

function* searchCoefficients(
  spec: LoopSpec,
  sections: readonly Sos[],
  refPm: number | null,
  cfg: { pmTol: number; dbTol: number; points: number; options: WordLengthOptions },
  progress: (f: number) => void,
): Generator<void, WordLengthResult['coefficients']> {
  // Only widths a spec may hold are searched (limits.ts): a recommendation must be one the designer can enter.
  const [fewestBits, mostBits] = WIDTH_LIMITS['fixedPoint.coefficientBits'];
  const lo = Math.max(fewestBits, cfg.options.minCoefficientBits ?? 4);
  const hi = Math.min(mostBits, cfg.options.maxCoefficientBits ?? mostBits);
  const curve: CoefficientWidthPoint[] = [];
  for (let bits = lo; bits <= hi; bits++) {
    curve.push(coefficientPoint(spec, sections, bits, refPm, cfg));
    progress((bits - lo + 1) / (hi - lo + 1));
    yield;
  }
  const minBits = minimumPassing(curve, (p) => p.coefficientBits);
  return { curve, minBits, note: minBits === null ? `no width up to ${hi} bits meets every criterion` : null };
}

function coefficientPoint(
  spec: LoopSpec,
  sections: readonly Sos[],
  bits: number,
  refPm: number | null,
  cfg: { pmTol: number; dbTol: number; points: number },
): CoefficientWidthPoint {
  let q;
  try {
    q = quantizeSections(sections, coefficientFormatAt(spec, bits));
  } catch (err) {
    if (!(err instanceof FieldError)) throw err;
    return {
      coefficientBits: bits, fractionBits: null, stable: false, phaseMarginDeg: null, gainMarginDb: null, crossoverHz: null,
      phaseMarginErrorDeg: null, maxDeviationDb: null, passes: false, reasons: [err.message],
    };
  }
  const loop = discreteLoopMargins(spec, q.sections.map((s) => s.quantized), { points: cfg.points, closedLoop: false });
  const m = loop.margins;
  const stable = q.stable && loop.stable;
  const pmErr = m.phaseMarginDeg !== null && refPm !== null ? m.phaseMarginDeg - refPm : null;
  const reasons: string[] = [];
  if (!stable) reasons.push('unstable');
  if (pmErr === null) reasons.push(m.phaseMarginDeg === null ? 'no phase margin: the quantised loop gain does not cross 0 dB' : 'no phase margin to compare with: the unquantised loop gain does not cross 0 dB');
  else if (Math.abs(pmErr) > cfg.pmTol) reasons.push(`phase margin off by ${pmErr.toFixed(2)}° (tolerance ${cfg.pmTol}°)`);
  if (q.maxDeviationDb === null) reasons.push('quantised response is zero (numerator rounded away)');
  else if (q.maxDeviationDb > cfg.dbTol) reasons.push(`response off by ${q.maxDeviationDb.toFixed(3)} dB (tolerance ${cfg.dbTol} dB)`);
  return {
    coefficientBits: bits,
    fractionBits: q.format.fractionBits,
    stable,
    phaseMarginDeg: m.phaseMarginDeg,
    gainMarginDb: m.gainMarginDb,
    crossoverHz: m.crossoverHz,
    phaseMarginErrorDeg: pmErr,
    maxDeviationDb: q.maxDeviationDb,
    passes: reasons.length === 0,
    reasons,
  };
}

/**
 * A tone at a small offset (a tenth of the crossover, and within a quarter of the lock-in estimate)
 * for about ten crossover periods of settling, so the steady state is reached in both loops.
 */
function dataScenario(spec: LoopSpec, crossoverHz: number, maxSamples: number): { scenario: Scenario; cut: boolean } {
  const k = loopGain(spec).kRadPerS;
  const second = secondOrderParameters(spec, k, designLoopFilter(spec).tau);
  const lockInHz = acquisitionEstimates(second, k, 1).lockInHz;
  const offsetHz = Math.min(crossoverHz / 10, lockInHz === null ? Infinity : lockInHz / 4);
  const wantS = 20 / crossoverHz;
  const maxS = maxSamples / spec.sampleRateHz;
  return { scenario: { kind: 'tone', offsetHz, durationS: Math.min(wantS, maxS), seed: 1 }, cut: wantS > maxS };
}

/** The data search, or no data search with the reason when the spec cannot be simulated bit-true. */
function* searchDataSafely(
  ...args: Parameters<typeof searchData>
): Generator<void, { data: WordLengthResult['data']; note: string | null }> {
  try {
    return { data: yield* searchData(...args), note: null };
  } catch (err) {
    if (err instanceof FieldError) return { data: null, note: `data width not searched: ${err.message}` };
    throw err;
  }
}

function* searchData(
  spec: LoopSpec,
  sections: readonly Sos[],
  errTol: number,
  options: WordLengthOptions,
  progress: (f: number) => void,
): Generator<void, WordLengthResult['data']> {
  const fp = spec.fixedPoint;
  const crossoverHz = discreteLoopMargins(spec, sections, { points: 200, closedLoop: false }).margins.crossoverHz ?? loopGain(spec).kRadPerS / (2 * Math.PI);
  const { scenario, cut } = dataScenario(spec, crossoverHz, options.maxSamplesPerRun ?? 200_000);
  const quantized = quantizeSections(sections, fp);
  const quantizedSections = quantized.sections.map((q) => q.quantized);
  // The noise figures need a frequency grid only for the sections' L∞ peaks, which the curve does not show.
  const noiseGrid = logGrid(spec.sampleRateHz * 1e-6, spec.sampleRateHz / 2, 50);
  const tuning = ncoTuning(spec.centerHz, spec.sampleRateHz, spec.nco.accumulatorBits);
  const floatRun = simulateLoop({ spec, sections, bitTrue: null, bitTrueIssue: null }, scenario, { mode: 'float', buckets: 10 }).float!.metrics;
  const [fewestBits, mostBits] = WIDTH_LIMITS['fixedPoint.dataBits'];
  // Only data words a spec may hold with this coefficient word and NCO (limits.ts, exact arithmetic).
  const exactBits = Math.min(EXACT_INTEGER_BITS - 1 - fp.coefficientBits, EXACT_INTEGER_BITS - spec.nco.amplitudeBits);
  const lo = Math.max(fewestBits, options.minDataBits ?? 6);
  const hi = Math.min(mostBits, exactBits, options.maxDataBits ?? 24);
  const curve: DataWidthPoint[] = [];
  for (let bits = lo; bits <= hi; bits++) {
    // A MAC of at least Fc + D + 1 bits never limits the section outputs (datapath.ts), so the search
    // sees the data width alone.
    const accumulatorBits = Math.min(WIDTH_LIMITS['fixedPoint.accumulatorBits'][1], Math.max(fp.accumulatorBits, bits + quantized.format.fractionBits + 1));
    const s: LoopSpec = { ...spec, fixedPoint: { ...fp, dataBits: bits, accumulatorBits } };
    const bitTrue = planBitTrue(s, { quantized, tuning, control: specControlScaling(s) });
    const m = simulateLoop({ spec: s, sections, bitTrue, bitTrueIssue: null }, scenario, { mode: 'bit-true', buckets: 10 }).bitTrue!.metrics;
    const predicted = datapathNoise({
      spec: s,
      sections: quantizedSections,
      coefficientFractionBits: quantized.format.fractionBits,
      control: bitTrue.control,
      outputLimitUnits: datapathFigures(s, quantized.format.fractionBits).outputLimitUnits,
      freqHz: noiseGrid,
    }).noise;
    const reasons: string[] = [];
    if (!m.locked) reasons.push('did not lock');
    if (m.cycleSlips !== 0) reasons.push(`${m.cycleSlips} cycle slips`);
    const dErr = m.steadyStatePhaseErrorDeg - floatRun.steadyStatePhaseErrorDeg;
    if (Math.abs(dErr) > errTol) reasons.push(`steady-state phase error off by ${dErr.toFixed(3)}° from float (tolerance ${errTol}°)`);
    const dJit = m.steadyStatePhaseJitterDeg - floatRun.steadyStatePhaseJitterDeg;
    if (dJit > errTol) reasons.push(`phase jitter ${dJit.toFixed(3)}° above float (tolerance ${errTol}°)`);
    curve.push({
      dataBits: bits,
      accumulatorBits,
      locked: m.locked,
      steadyStatePhaseErrorDeg: m.steadyStatePhaseErrorDeg,
      phaseJitterDeg: m.steadyStatePhaseJitterDeg,
      cycleSlips: m.cycleSlips,
      predictedSnrDb: predicted?.outputSnrDb ?? null,
      predictedPhaseJitterDeg: predicted?.phaseJitterDeg ?? null,
      passes: reasons.length === 0,
      reasons,
    });
    progress((bits - lo + 1) / (hi - lo + 1));
    yield;
  }
  const minBits = minimumPassing(curve, (p) => p.dataBits);
  const notes = [
    cut ? `the simulated span was cut to ${scenario.durationS.toPrecision(3)} s by the sample budget; the loop may not have settled` : null,
    minBits === null ? `no data width up to ${hi} bits meets every criterion` : null,
  ].filter((n): n is string => n !== null);
  return {
    curve,
    minBits,
    coefficientBits: fp.coefficientBits,
    scenario,
    floatReference: { steadyStatePhaseErrorDeg: floatRun.steadyStatePhaseErrorDeg, phaseJitterDeg: floatRun.steadyStatePhaseJitterDeg, locked: floatRun.locked },
    note: notes.length > 0 ? notes.join('; ') : null,
  };
}
