/**
 * The roundoff-noise prediction against a measurement: over seeded random loops, the variance of
 * (bit-true − float) filter output and NCO phase in a long noisy simulation agrees with the predicted
 * roundoff noise within 1 dB; and a loop whose peak gain from the detector exceeds its headroom does
 * overflow in simulation while one with headroom does not. The model under test is the additive white
 * roundoff model (WK08, OS3 Sec. 6.9 (memory)) with Jackson's noise gains and L1 scaling (Ja70).
 *
 * To measure the data path alone, the float loop is given what the bit-true loop realises besides its
 * rounding: the quantised sections, the realised NCO gain and a centre frequency the tuning word holds
 * exactly; the NCO is wide (16 address bits, 20 amplitude bits) so its table errors sit more than
 * 15 dB below the data path's roundoff. The input noise (10 dB SNR) keeps the dropped bits busy, which
 * the white-noise model needs (WK08; at 30 dB a narrow Butterworth section's errors are already
 * correlated enough to fall 1.4 dB below it: its b0·x term moves the dropped bits by well under an LSB).
 * The data width of each loop is chosen by inLinearRegime (below): a truncating PI loop at 10 bits
 * sits half a radian off lock, where the linearisation — the model's premise — no longer holds.
 */
import { describe, expect, it } from 'vitest';
import { planDesign, requireValidSpec, simulateLoop, type LoopSpec, type RoundingMode } from '../../src/index.ts';
import { logUniform, mulberry32, pick, uniform } from '../reference/random.ts';

const SAMPLES = 1 << 19;
const SETTLE = SAMPLES / 4;
const N_BITS = 32;
const SNR_DB = 20;

/** A random loop with a natural frequency of 0.2–1 % of the loop rate, so the run spans thousands of loop time constants. */
function noisySpec(rnd: () => number, i: number): LoopSpec {
  const fs = pick(rnd, [48_000, 100_000, 250_000]);
  const amplitude = uniform(rnd, 0.5, 0.9);
  const kd = amplitude / 2;
  const fn = fs * logUniform(rnd, 2e-3, 1e-2);
  const wn = 2 * Math.PI * fn;
  const zeta = uniform(rnd, 0.5, 1);
  const kind = (['pi', 'single-pole', 'lag-lead', 'butterworth', 'pi', 'lag-lead'] as const)[i % 6]!;
  let k: number;
  let filter: LoopSpec['filter'];
  if (kind === 'single-pole') {
    k = wn / (2 * zeta); // ωn = √(K/τ), ζ = 1/(2√(Kτ)) (G3 Ch. 2)
    filter = { kind, cutoffHz: (4 * zeta * zeta * k) / (2 * Math.PI) };
  } else if (kind === 'butterworth') {
    k = wn;
    filter = { kind, order: 2, cutoffHz: fn * 4 };
  } else {
    k = wn * logUniform(rnd, 3, 20);
    filter = { kind, naturalHz: fn, damping: zeta };
  }
  // a centre frequency the 32-bit tuning word holds exactly: M·fs/2^N (TRG71)
  const m = Math.round(uniform(rnd, 0.05, 0.2) * 2 ** N_BITS);
  return {
    specVersion: 1,
    name: `noise_${i}`,
    clockHz: fs,
    sampleRateHz: fs,
    centerHz: (m * fs) / 2 ** N_BITS,
    input: { amplitude },
    detector: { kind: 'multiplier' },
    nco: { accumulatorBits: N_BITS, phaseBits: 16, amplitudeBits: 20, gainHzPerUnit: k / (2 * Math.PI * kd), waveform: 'sine' },
    filter,
    rippleFilter: i % 4 === 1 ? { order: 2, cutoffHz: fn * 20 } : null,
    discretization: { method: 'bilinear', prewarpHz: null },
    fixedPoint: {
      coefficientBits: 30,
      coefficientFractionBits: 'auto',
      dataBits: 10,
      accumulatorBits: 64,
      // truncation on type-1 loops: a truncating PI integrator sits q/(2·Kd·B(1)) off lock, checked on its own below
      rounding: (['nearest', 'truncate', 'half-even', 'truncate', 'half-even', 'nearest'] as readonly RoundingMode[])[i % 6]!,
      overflow: 'saturate',
    },
  };
}

function variance(xs: Float64Array): number {
  let mean = 0;
  for (const x of xs) mean += x;
  mean /= xs.length;
  let v = 0;
  for (const x of xs) v += (x - mean) ** 2;
  return v / xs.length;
}

function wrapPi(x: number): number {
  return x - 2 * Math.PI * Math.round(x / (2 * Math.PI));
}

/**
 * The spec with the smallest data width (10…20) at which the measurement measures roundoff: the
 * predicted jitter below 0.05 rad (the loop stays near its linearisation); the predicted NCO phase
 * offset μ small enough that the input noise w, which the two loops then mix with NCO phases μ apart,
 * adds less than a twentieth of the predicted variance to their difference (σw²/2·μ² through the
 * detector's noise gain); and every section's b0 term moving its dropped bits by at least half an LSB
 * RMS (the busy signal the white model needs, WK08).
 */
function inLinearRegime(spec: LoopSpec): LoopSpec {
  const noiseVariance = spec.input.amplitude ** 2 / 2 / 10 ** (SNR_DB / 10);
  const detectorRms = Math.sqrt(noiseVariance / 2);
  for (let d = 10; ; d++) {
    const s = { ...spec, fixedPoint: { ...spec.fixedPoint, dataBits: d } };
    const plan = planDesign(requireValidSpec(s));
    const noise = plan.analysis.quantization.noise!;
    const detector = noise.points.find((p) => p.kind === 'detector')!;
    const offsetTerm = (noiseVariance / 2) * noise.phaseMeanRad ** 2 * detector.outputNoiseGain;
    const busy = plan.quantized!.sections.every((sec, k) => Math.abs(sec.quantized.b[0]) * detectorRms * (k === 0 ? 1 : noise.sections[k - 1]!.l2Gain) * 2 ** (d - 1) >= 0.5);
    if (d === 20 || (noise.phaseJitterRad < 0.05 && offsetTerm < noise.outputNoiseVariance / 20 && busy)) return s;
  }
}

const rnd = mulberry32(20261203);
const specs = Array.from({ length: 6 }, (_, i) => inLinearRegime(noisySpec(rnd, i)));

/** Bit-true and float loops of one spec on the same noisy input: the settled differences of their filter outputs and phase errors. */
function measure(spec: LoopSpec) {
  const plan = planDesign(requireValidSpec(spec));
  const noise = plan.analysis.quantization.noise!;
  const floatSpec = { ...plan.spec, nco: { ...plan.spec.nco, gainHzPerUnit: plan.nco.control!.actualGainHzPerUnit } };
  const sim = simulateLoop(
    { spec: floatSpec, sections: plan.quantized!.sections.map((s) => s.quantized), bitTrue: plan.bitTrue, bitTrueIssue: null },
    { kind: 'tone', offsetHz: 0, durationS: SAMPLES / spec.sampleRateHz, snrDb: SNR_DB, seed: 7 },
    { fullTraces: true, buckets: 10 },
  );
  const bt = sim.bitTrue!.full!;
  const fl = sim.float!.full!;
  const n = SAMPLES - SETTLE;
  const dy = new Float64Array(n);
  const dphi = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    dy[i] = bt.filterOutput[SETTLE + i]! - fl.filterOutput[SETTLE + i]!;
    dphi[i] = wrapPi(bt.phaseErrorRad[SETTLE + i]! - fl.phaseErrorRad[SETTLE + i]!);
  }
  // no cycle slip in either run: both stay at the lock point the linear model is made about
  return { noise, dy, dphi, slips: Math.abs(sim.bitTrue!.metrics.cycleSlips) + Math.abs(sim.float!.metrics.cycleSlips) };
}

const meanOf = (xs: Float64Array) => xs.reduce((a, b) => a + b, 0) / xs.length;

describe('predicted roundoff noise against the simulated difference of bit-true and float loops', () => {
  it.each(specs.map((s) => [`${s.name} ${s.filter.kind}${s.rippleFilter ? '+ripple' : ''} D=${s.fixedPoint.dataBits} ${s.fixedPoint.rounding}`, s] as const))('%s', (_label, spec) => {
    const { noise, dy, dphi, slips } = measure(spec);
    expect(slips).toBe(0);
    const outputDb = 10 * Math.log10(variance(dy) / noise.outputNoiseVariance);
    const phaseDb = 10 * Math.log10(variance(dphi) / noise.phaseNoiseVarianceRad2);
    expect(Math.abs(outputDb)).toBeLessThan(1);
    expect(Math.abs(phaseDb)).toBeLessThan(1);
    // truncation leaves a mean: the phase error θi − θo moves by minus the predicted NCO phase offset
    if (spec.fixedPoint.rounding === 'truncate') expect(Math.abs(meanOf(dphi) + noise.phaseMeanRad)).toBeLessThan(0.1 * Math.abs(noise.phaseMeanRad));
  });

  it('a truncating PI integrator leaves the static phase offset the model predicts', () => {
    const base = noisySpec(mulberry32(11), 0);
    const spec = { ...base, fixedPoint: { ...base.fixedPoint, dataBits: 14, rounding: 'truncate' as const } };
    const { noise, dphi } = measure(spec);
    expect(Math.abs(noise.phaseMeanRad)).toBeGreaterThan(1e-3);
    expect(Math.abs(meanOf(dphi) + noise.phaseMeanRad)).toBeLessThan(0.1 * Math.abs(noise.phaseMeanRad));
  });
});

/** A PI loop at 10 kHz whose NCO gain sets the proportional gain τ2/τ1 = 2ζωn/K of its only section (G3 Ch. 2). */
function piSpec(gainHzPerUnit: number): LoopSpec {
  return {
    specVersion: 1,
    name: 'pi_headroom',
    clockHz: 10e3,
    sampleRateHz: 10e3,
    centerHz: 500,
    input: { amplitude: 1 },
    detector: { kind: 'multiplier' },
    nco: { accumulatorBits: 32, phaseBits: 12, amplitudeBits: 16, gainHzPerUnit, waveform: 'sine' },
    filter: { kind: 'pi', naturalHz: 10, damping: 0.707 },
    rippleFilter: null,
    discretization: { method: 'bilinear', prewarpHz: null },
    fixedPoint: { coefficientBits: 24, coefficientFractionBits: 'auto', dataBits: 16, accumulatorBits: 48, rounding: 'nearest', overflow: 'saturate' },
  };
}

describe('headroom against overflow in simulation', () => {
  const run = (spec: LoopSpec) => {
    const plan = planDesign(requireValidSpec(spec));
    const sim = simulateLoop(
      { spec: plan.spec, sections: plan.filter.sections, bitTrue: plan.bitTrue, bitTrueIssue: null },
      { kind: 'tone', offsetHz: 2, durationS: 1, initialPhaseDeg: 120 },
      { mode: 'bit-true', keepRecord: true, buckets: 10 },
    );
    const y = sim.bitTrue!.record!.filterCode;
    const railHits = y.filter((c) => c === 2 ** 15 - 1 || c === -(2 ** 15)).length;
    return { scaling: plan.analysis.quantization.noise!.sections[0]!, railHits };
  };

  it('a proportional gain of about 14 (τ2/τ1 at 2 Hz/unit) exceeds the headroom and the section saturates', () => {
    const { scaling, railHits } = run(piSpec(2));
    expect(scaling.mayOverflow).toBe(true);
    expect(scaling.headroomDb).toBeLessThan(-10);
    expect(scaling.shiftBits).toBeGreaterThanOrEqual(4);
    expect(railHits).toBeGreaterThan(0);
  });

  it('the same loop with 100 times the NCO gain keeps its headroom and never reaches the rails', () => {
    const { scaling, railHits } = run(piSpec(200));
    expect(scaling.mayOverflow).toBe(false);
    expect(scaling.headroomDb).toBeGreaterThan(0);
    expect(railHits).toBe(0);
  });
});
