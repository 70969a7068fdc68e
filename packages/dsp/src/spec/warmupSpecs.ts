/**
 * Specs a worker analyses as it starts, off the user's path, and then forgets: the first analysis of
 * a user's spec would otherwise pay the engine's first compile of every function the analysis runs.
 * They are not the demo examples (examples.ts), so a demo's first call is measured as any user
 * spec's would be, and between them they take the branches a spec can select: every filter kind,
 * both ways of giving a second-order filter, ripple filters of order 1–4 and none, prewarping on and
 * off, both NCO waveforms, every rounding and overflow mode, fixed and automatic fraction bits, a
 * quantisation that fails, and specs the analysis warns about. Plain data: any host runs its own
 * analysis job over them and discards the results.
 */
import type { LoopSpecInput } from './schema.ts';
import type { Scenario } from './scenario.ts';

const fixedPoint = {
  coefficientBits: 20,
  coefficientFractionBits: 'auto',
  dataBits: 14,
  accumulatorBits: 36,
  rounding: 'half-even',
  overflow: 'wrap',
} as const;

export const warmupSpecs: readonly LoopSpecInput[] = [
  {
    // PI from its time constants, square NCO, ripple filter of order 1, prewarped.
    specVersion: 1,
    name: 'warmup_pi_tau',
    clockHz: 48e6,
    sampleRateHz: 48e3,
    centerHz: 2e3,
    input: { amplitude: 0.7 },
    detector: { kind: 'multiplier' },
    nco: { accumulatorBits: 28, phaseBits: 9, amplitudeBits: 12, gainHzPerUnit: 150, waveform: 'square' },
    filter: { kind: 'pi', tau1S: 0.05, tau2S: 0.004 },
    rippleFilter: { order: 1, cutoffHz: 1500 },
    discretization: { method: 'bilinear', prewarpHz: 400 },
    fixedPoint: { ...fixedPoint, coefficientFractionBits: 18, rounding: 'truncate' },
  },
  {
    // Lag-lead from its targets, ripple filter of order 3, a clock the loop rate does not divide.
    specVersion: 1,
    name: 'warmup_laglead_targets',
    clockHz: 25e6,
    sampleRateHz: 300e3,
    centerHz: 12e3,
    input: { amplitude: 0.9 },
    detector: { kind: 'multiplier' },
    nco: { accumulatorBits: 24, phaseBits: 8, amplitudeBits: 6, gainHzPerUnit: 900, waveform: 'sine' },
    filter: { kind: 'lag-lead', naturalHz: 150, damping: 0.9 },
    rippleFilter: { order: 3, cutoffHz: 4e3 },
    discretization: { method: 'bilinear', prewarpHz: null },
    fixedPoint,
  },
  {
    // Butterworth of order 3 and a ripple filter of order 4, saturating, rounding to nearest.
    specVersion: 1,
    name: 'warmup_butterworth_3',
    clockHz: 200e6,
    sampleRateHz: 20e6,
    centerHz: 3.2e6,
    input: { amplitude: 0.4 },
    detector: { kind: 'multiplier' },
    nco: { accumulatorBits: 40, phaseBits: 14, amplitudeBits: 18, gainHzPerUnit: 300e3, waveform: 'sine' },
    filter: { kind: 'butterworth', order: 3, cutoffHz: 120e3 },
    rippleFilter: { order: 4, cutoffHz: 1.5e6 },
    discretization: { method: 'bilinear', prewarpHz: 120e3 },
    fixedPoint: { ...fixedPoint, accumulatorBits: 44, rounding: 'nearest', overflow: 'saturate' },
  },
  {
    // Single-pole with an accumulator narrower than the full product, and no ripple filter.
    specVersion: 1,
    name: 'warmup_single_pole',
    clockHz: 10e6,
    sampleRateHz: 100e3,
    centerHz: 7e3,
    input: { amplitude: 1 },
    detector: { kind: 'multiplier' },
    nco: { accumulatorBits: 32, phaseBits: 11, amplitudeBits: 16, gainHzPerUnit: 400, waveform: 'sine' },
    filter: { kind: 'single-pole', cutoffHz: 250 },
    rippleFilter: null,
    discretization: { method: 'bilinear', prewarpHz: null },
    fixedPoint: { ...fixedPoint, coefficientBits: 16, accumulatorBits: 24 },
  },
  {
    // A PI filter whose gain b0 (about 20) a 3-bit coefficient word cannot hold: quantisation fails.
    specVersion: 1,
    name: 'warmup_narrow_words',
    clockHz: 1e6,
    sampleRateHz: 1e6,
    centerHz: 90e3,
    input: { amplitude: 0.6 },
    detector: { kind: 'multiplier' },
    nco: { accumulatorBits: 20, phaseBits: 6, amplitudeBits: 10, gainHzPerUnit: 5e3, waveform: 'sine' },
    filter: { kind: 'pi', tau1S: 2e-4, tau2S: 4e-3 },
    rippleFilter: { order: 2, cutoffHz: 60e3 },
    discretization: { method: 'bilinear', prewarpHz: null },
    fixedPoint: { ...fixedPoint, coefficientBits: 3, dataBits: 8, accumulatorBits: 20 },
  },
];

/**
 * How many times a worker analyses the warm-up specs. One pass compiles every step, but the engine
 * optimises a function only once it has run a while, so after one pass the first real analysis
 * still set off most of the optimising compiles: measured in started threads (dsp bench, 8 threads
 * per case, quiet 2-core machine), a demo spec's first call took 2.4-5.2 ms of the thread's CPU and
 * 2.2-12.7 ms wall clock, the gap being the engine's background compiles taking the other core and
 * more; after 4 passes 1.7-2.8 ms CPU and 1.5-3.9 ms wall (warm-up 65-110 ms CPU instead of 35-50).
 * More passes gained little (6: 1.6-2.5 ms; 12: 1.6-2.2 ms).
 */
export const WARMUP_PASSES = 4;

/** The analyses of a worker's warm-up, in order: WARMUP_PASSES passes over warmupSpecs. */
export const warmupSequence: readonly LoopSpecInput[] = Array.from({ length: WARMUP_PASSES }, () => warmupSpecs).flat();

/**
 * Short simulations a compute thread runs as it starts, after its analyses, and forgets: the first
 * simulation of a user's design would otherwise pay the first compile of the simulation's steps (the
 * input generators, both loops, the traces and metrics, the answer's encoding). One per scenario kind,
 * with and without noise, each a few thousand samples at its spec's rate (warm-up specs only, so no
 * demo spec meets compiled code it did not compile itself). Measured in started compute threads
 * (mains demo, a 2 s tone, mode both, quiet machine): the first simulation 21-23 ms of the thread's
 * CPU without them, 6.7-8.5 ms with them.
 */
export const warmupSimulations: readonly { readonly spec: LoopSpecInput; readonly scenario: Scenario }[] = [
  { spec: warmupSpecs[0]!, scenario: { kind: 'tone', offsetHz: 20, durationS: 0.05, snrDb: 30, seed: 1 } },
  { spec: warmupSpecs[1]!, scenario: { kind: 'frequency-step', stepHz: 100, atS: 0.004, durationS: 0.01 } },
  { spec: warmupSpecs[2]!, scenario: { kind: 'phase-step', stepDeg: 30, atS: 5e-5, durationS: 1.5e-4, initialPhaseDeg: 10 } },
  { spec: warmupSpecs[3]!, scenario: { kind: 'fm', modulation: 'sine', rateHz: 500, deviationHz: 5, durationS: 0.03 } },
  { spec: warmupSpecs[1]!, scenario: { kind: 'sweep', fromHz: -200, toHz: 200, rateHzPerS: 2e5, durationS: 0.01 } },
];
