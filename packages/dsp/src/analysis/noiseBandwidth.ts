/**
 * One-sided loop noise bandwidth B_L = ∫₀^∞ |H(j2πf)|² df in Hz (G3 Ch. 2; the digital loop integrates
 * to fs/2). For H = (b1·s + b0)/(s² + a1·s + a0) the closed form is (b1²·a0 + b0²)/(4·a0·a1)
 * (standard integral table, e.g. G3 Ch. 2 (memory)). The high-gain expression (ωn/2)(ζ + 1/(4ζ)) holds
 * for the PI loop only: for a single-pole loop the exact value is K/4 (REFERENCES.md).
 *
 * Every other order is exact too, without an integral over frequency (Parseval: the integral of |H|² is
 * the energy of the impulse response, As70, ZDG96): the analog loop's ∫₀^∞ h(t)² dt is C·P·Cᵀ with P the
 * controllability Gramian of a realisation of H, the solution of the Lyapunov equation A·P + P·Aᵀ + B·Bᵀ = 0
 * (lyapunov.ts), so B_L = ½·C·P·Cᵀ; the discrete loop's Σ h[n]² is c·P·cᵀ with P = A·P·Aᵀ + b·bᵀ for a state-space
 * model of the loop (discreteLoopStateSpace), so B_L = (fs/2)·Σ h[n]²
 * (∫₀^{fs/2} df = (fs/2π)·∫₀^π dω and (1/2π)·∫_{−π}^{π} |H|² dω = Σ h[n]²). The numeric integral stays as
 * the reference the tests check both against, and as the fallback should a Gramian not converge.
 */
import type { LoopSpec } from '../spec/schema.ts';
import type { LoopFilterDesign } from '../design.ts';
import type { AnalogTf, Sos } from '../types/filter.ts';
import { type ResponseFn, analogLoopResponse, closedLoop, discreteLoopResponse } from './response.ts';
import { analogClosedLoop } from './loopPolynomials.ts';
import { continuousEnergy, discreteEnergy } from './lyapunov.ts';

/** Simpson intervals in ln f to start from; doubled until converged (checked against SciPy's quad). */
export const DEFAULT_INTERVALS = 300;
export const MAX_INTERVALS = 1 << 18;
export const RELATIVE_TOL = 1e-9;

/** Closed form for a second-order H = (b1 s + b0)/(s² + a1 s + a0), Hz. */
export function secondOrderNoiseBandwidthHz(b1: number, b0: number, a1: number, a0: number): number {
  return (b1 * b1 * a0 + b0 * b0) / (4 * a0 * a1);
}

/** High-gain approximation (ωn/2)(ζ + 1/(4ζ)) in Hz (G3 Ch. 2; exact for the PI loop only). */
export function highGainNoiseBandwidthHz(wnRadPerS: number, damping: number): number {
  return (wnRadPerS / 2) * (damping + 1 / (4 * damping));
}

/**
 * ∫ |H|² df from 0 to fMaxHz in u = ln f over [fMinHz, fMaxHz] (|H|² df = |H|²·f du) by Simpson's rule
 * with interval doubling until two successive values agree to RELATIVE_TOL (Romberg's first step,
 * reusing every evaluation), so a sharply peaked closed loop gets as many points as it needs. The part
 * below fMinHz is taken as fMinHz·|H(fMinHz)|² (|H| is flat there) and, for an analog loop, the tail above
 * fMaxHz assuming |H|² ∝ f^−p with p from the last decade.
 */
export function numericNoiseBandwidthHz(
  h: ResponseFn,
  fMinHz: number,
  fMaxHz: number,
  options: { readonly intervals?: number; readonly tail?: boolean } = {},
): number {
  const m2 = (f: number) => {
    const v = h(f);
    return v.re * v.re + v.im * v.im;
  };
  const u0 = Math.log(fMinHz);
  const span = Math.log(fMaxHz) - u0;
  const g = (u: number) => {
    const f = Math.exp(u);
    return m2(f) * f;
  };
  let n = Math.max(2, options.intervals ?? DEFAULT_INTERVALS);
  // Trapezoid sum T(n) and Simpson S(2n) = (4·T(2n) − T(n))/3; each doubling evaluates only the new midpoints.
  let sumEnds = 0.5 * (g(u0) + g(u0 + span));
  let sumInner = 0;
  for (let i = 1; i < n; i++) sumInner += g(u0 + (i * span) / n);
  let trap = ((sumEnds + sumInner) * span) / n;
  let simpson = Number.NaN;
  for (;;) {
    let mids = 0;
    for (let i = 0; i < n; i++) mids += g(u0 + ((i + 0.5) * span) / n);
    sumInner += mids;
    n *= 2;
    const trap2 = ((sumEnds + sumInner) * span) / n;
    const next = (4 * trap2 - trap) / 3;
    const converged = Math.abs(next - simpson) <= RELATIVE_TOL * Math.abs(next);
    simpson = next;
    trap = trap2;
    if (converged || n >= MAX_INTERVALS) break;
  }
  let total = simpson + fMinHz * m2(fMinHz);
  if (options.tail) {
    const end = m2(fMaxHz);
    const p = Math.log10(m2(fMaxHz / 10) / end);
    if (p > 1.01 && Number.isFinite(p)) total += (end * fMaxHz) / (p - 1);
  }
  return total;
}

/** How analogHz was found: the second-order formula, a Lyapunov solve of a higher order, or (fallback) the integral. */
export type NoiseBandwidthMethod = 'closed-form' | 'state-space' | 'numeric';

export interface NoiseBandwidth {
  /** ∫₀^∞ |H(j2πf)|² df of the analog prototype loop (closed form when second order); null if unstable. */
  readonly analogHz: number | null;
  readonly analogMethod: NoiseBandwidthMethod | null;
  /** ∫₀^{fs/2} |H(e^{j2πf/fs})|² df of the discrete loop ((fs/2)·Σ h[n]² from its state-space model); null if unstable. */
  readonly discreteHz: number | null;
  /** (ωn/2)(ζ + 1/(4ζ)): the high-gain approximation, exact for PI only; null when ωn, ζ do not apply. */
  readonly highGainApproximationHz: number | null;
  /** Why a figure is null. */
  readonly notes: readonly string[];
}

/** Noise bandwidth of the analog prototype (closed form when second order) and of the discrete loop. */
export function loopNoiseBandwidth(
  spec: LoopSpec,
  design: LoopFilterDesign,
  k: number,
  range: { fMinHz: number; fMaxAnalogHz: number; nyquistHz: number },
  second: { wnRadPerS: number; damping: number } | null,
  stable: { readonly analog: boolean; readonly discrete: boolean },
): NoiseBandwidth {
  const highGainApproximationHz = second ? highGainNoiseBandwidthHz(second.wnRadPerS, second.damping) : null;
  const notes: string[] = [];
  if (!stable.analog) notes.push('analog: the closed loop is unstable, so ∫|H|² df does not exist');
  if (!stable.discrete) notes.push('discrete: the closed loop is unstable, so ∫|H|² df does not exist');
  const analog = stable.analog ? analogNoiseBandwidth(design, k, range) : { hz: null, method: null };
  const discreteHz = stable.discrete ? discreteNoiseBandwidthHz(design.sections, k, spec.sampleRateHz, range) : null;
  return { analogHz: analog.hz, analogMethod: analog.method, discreteHz, highGainApproximationHz, notes };
}

/** (fs/2)·Σ h[n]² of the discrete closed loop H = L/(1 + L) (discreteLoopStateSpace); the integral should the solve fail. */
export function discreteNoiseBandwidthHz(sections: readonly Sos[], k: number, sampleRateHz: number, range: { fMinHz: number; nyquistHz: number }): number {
  const ss = sections.every((s) => s.a[0] === 1) ? discreteLoopStateSpace(sections, k / sampleRateHz) : null;
  const energy = ss ? discreteEnergy(ss.a, ss.b, ss.c, ss.n) : null;
  if (energy !== null) return (sampleRateHz / 2) * energy;
  return numericNoiseBandwidthHz(closedLoop(discreteLoopResponse(sections, k, sampleRateHz)), range.fMinHz, range.nyquistHz);
}

/**
 * The discrete loop as x[n+1] = A·x[n] + b·θi[n], θo[n] = c·x[n]: the NCO phase θo, then each section
 * in the controllable canonical form of (b0 + b1·z⁻¹ + b2·z⁻²)/(1 + a1·z⁻¹ + a2·z⁻²): states w[n−1],
 * w[n−2] of w = v − a1·w[n−1] − a2·w[n−2], output b0·v + (b1 − a1·b0)·w[n−1] + (b2 − a2·b0)·w[n−2]
 * (OS3 Sec. 6.3 (memory)); θo[n+1] = θo[n] + K·T·y[n] with y the last section's output of v = θi − θo.
 * This form keeps a narrow loop's Gramian to about 1e-12: the direct form I model of linearLoop.ts,
 * whose poles near z = 1 sit in nearly parallel eigenvectors, loses eight digits in the same solve.
 */
function discreteLoopStateSpace(sections: readonly Sos[], kt: number): { a: Float64Array; b: Float64Array; c: Float64Array; n: number } {
  const n = 1 + 2 * sections.length;
  const a = new Float64Array(n * n);
  const x = new Float64Array(n);
  const next = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    x.fill(0);
    x[j] = 1;
    stateSpaceStep(sections, kt, x, 0, next);
    for (let i = 0; i < n; i++) a[i * n + j] = next[i]!;
  }
  x.fill(0);
  const b = new Float64Array(n);
  stateSpaceStep(sections, kt, x, 1, b);
  const c = new Float64Array(n);
  c[0] = 1;
  return { a, b, c, n };
}

/**
 * One step of discreteLoopStateSpace's model from state x and input θi into next (a function of the
 * module, not a closure bound to a name per call: under tsx each such closure has its name defined when made).
 */
function stateSpaceStep(sections: readonly Sos[], kt: number, x: Float64Array, thetaIn: number, next: Float64Array): void {
  let v = thetaIn - x[0]!;
  for (let j = 0; j < sections.length; j++) {
    const { b, a } = sections[j]!;
    const w1 = x[1 + 2 * j]!;
    const w2 = x[2 + 2 * j]!;
    next[1 + 2 * j] = v - a[1] * w1 - a[2] * w2;
    next[2 + 2 * j] = w1;
    v = b[0] * v + (b[1] - a[1] * b[0]) * w1 + (b[2] - a[2] * b[0]) * w2;
  }
  next[0] = x[0]! + kt * v;
}

/** ∫₀^∞ |H(j2πf)|² df = ½·∫₀^∞ h(t)² dt of a strictly proper H = num/den (highest power first); null if the solve fails. */
export function analogNoiseBandwidthHz(h: AnalogTf): number | null {
  const energy = continuousEnergy(h.num, h.den);
  return energy === null ? null : energy / 2;
}

function analogNoiseBandwidth(
  design: LoopFilterDesign,
  k: number,
  range: { fMinHz: number; fMaxAnalogHz: number },
): { hz: number; method: NoiseBandwidthMethod } {
  const { h } = analogClosedLoop(design.analog, k);
  const den = h.den;
  const lead = den[0]!;
  if (den.length === 3 && h.num.length <= 2) {
    const num = h.num.length === 2 ? h.num : [0, h.num[0]!];
    return { hz: secondOrderNoiseBandwidthHz(num[0]! / lead, num[1]! / lead, den[1]! / lead, den[2]! / lead), method: 'closed-form' };
  }
  const exact = analogNoiseBandwidthHz(h);
  if (exact !== null) return { hz: exact, method: 'state-space' };
  const hFn = closedLoop(analogLoopResponse(design.analogSections, k));
  return { hz: numericNoiseBandwidthHz(hFn, range.fMinHz, range.fMaxAnalogHz, { tail: true }), method: 'numeric' };
}
