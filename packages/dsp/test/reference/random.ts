/**
 * Seeded generators for the cross-check tests: mulberry32 (a small, well-known 32-bit PRNG), so every
 * run checks the same cases and a failure can be replayed.
 */
import type { LoopSpec } from '../../src/spec/schema.ts';
import { parseLoopSpec } from '../../src/spec/schema.ts';

export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export const uniform = (rnd: () => number, lo: number, hi: number) => lo + (hi - lo) * rnd();
export const logUniform = (rnd: () => number, lo: number, hi: number) => 10 ** uniform(rnd, Math.log10(lo), Math.log10(hi));
export const pick = <T>(rnd: () => number, xs: readonly T[]): T => xs[Math.floor(rnd() * xs.length)]!;

/**
 * A random valid spec of a well-behaved loop: natural frequency 1e-5…3e-3 of the loop rate, damping
 * 0.3…1.5, filter corners kept well below Nyquist, an optional ripple filter a decade or more above
 * the loop. Loop filter kinds, target-vs-time-constant forms and prewarping all vary.
 */
export function randomLoopSpec(rnd: () => number, index: number): LoopSpec {
  const fs = logUniform(rnd, 1e3, 1e8);
  const amplitude = uniform(rnd, 0.1, 1);
  const kd = amplitude / 2;
  const fn = fs * logUniform(rnd, 1e-5, 3e-3);
  const wn = 2 * Math.PI * fn;
  const zeta = uniform(rnd, 0.3, 1.5);
  const kind = pick(rnd, ['single-pole', 'lag-lead', 'pi', 'butterworth'] as const);
  let k: number;
  let filter: LoopSpec['filter'];
  if (kind === 'single-pole') {
    k = wn / (2 * zeta); // ωn = √(K/τ), ζ = 1/(2√(Kτ)) ⇒ K = ωn/(2ζ), τ = 1/(4ζ²K) (G3 Ch. 2)
    filter = { kind, cutoffHz: (4 * zeta * zeta * k) / (2 * Math.PI) };
  } else if (kind === 'butterworth') {
    k = wn;
    filter = { kind, order: 1 + Math.floor(rnd() * 4), cutoffHz: fn * logUniform(rnd, 3, 30) };
  } else {
    k = wn * logUniform(rnd, kind === 'pi' ? 1 : 3, 100);
    if (rnd() < 0.5) {
      filter = { kind, naturalHz: fn, damping: zeta };
    } else if (kind === 'pi') {
      filter = { kind, tau1S: k / (wn * wn), tau2S: (2 * zeta) / wn };
    } else {
      const tau2S = (2 * zeta) / wn - 1 / k;
      filter = { kind, tau1S: k / (wn * wn) - tau2S, tau2S };
    }
  }
  const rippleFilter = rnd() < 0.35 ? { order: 1 + Math.floor(rnd() * 4), cutoffHz: fn * logUniform(rnd, 15, 100) } : null;
  const prewarpHz = rnd() < 0.4 ? fn * logUniform(rnd, 0.5, 50) : null;
  return {
    specVersion: 1,
    name: `case_${index}`,
    clockHz: fs * (1 + Math.floor(rnd() * 20)),
    sampleRateHz: fs,
    centerHz: fs * uniform(rnd, 0.01, 0.45),
    input: { amplitude },
    detector: { kind: 'multiplier' },
    nco: { accumulatorBits: 32, phaseBits: 12, amplitudeBits: 16, gainHzPerUnit: k / (2 * Math.PI * kd), waveform: 'sine' },
    filter,
    rippleFilter,
    discretization: { method: 'bilinear', prewarpHz },
    fixedPoint: { coefficientBits: 24, coefficientFractionBits: 'auto', dataBits: 18, accumulatorBits: 48, rounding: 'nearest', overflow: 'saturate' },
  };
}

/** `count` random specs that pass parseLoopSpec (throws if the generator itself produces invalid specs). */
export function randomValidSpecs(seed: number, count: number): LoopSpec[] {
  const rnd = mulberry32(seed);
  const out: LoopSpec[] = [];
  for (let i = 0; i < count; i++) {
    const r = parseLoopSpec(randomLoopSpec(rnd, i));
    if (!r.ok) throw new Error(`generated spec ${i} is invalid: ${JSON.stringify(r.issues)}`);
    out.push(r.spec);
  }
  return out;
}
