/**
 * One-sided loop noise bandwidth B_L = ∫₀^∞ |H(j2πf)|² df in Hz (G3 Ch. 2; the digital loop integrates
 * to fs/2). For H = (b1·s + b0)/(s² + a1·s + a0) the closed form is (b1²·a0 + b0²)/(4·a0·a1)
 * (standard integral table, e.g. G3 Ch. 2 (memory)). The high-gain expression (ωn/2)(ζ + 1/(4ζ)) holds
 * for the PI loop only: for a single-pole loop the exact value is K/4 (REFERENCES.md).
 */
import type { LoopSpec } from '../spec/schema.ts';
import type { LoopFilterDesign } from '../design.ts';
import { type ResponseFn, analogLoopResponse, closedLoop, discreteLoopResponse } from './response.ts';
import { analogClosedLoop } from './loopPolynomials.ts';

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

export interface NoiseBandwidth {
  /** ∫₀^∞ |H(j2πf)|² df of the analog prototype loop (closed form when second order); null if unstable. */
  readonly analogHz: number | null;
  readonly analogMethod: 'closed-form' | 'numeric' | null;
  /** ∫₀^{fs/2} |H(e^{j2πf/fs})|² df of the discrete loop (numeric); null if unstable. */
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
  const hd = closedLoop(discreteLoopResponse(design.sections, k, spec.sampleRateHz));
  const discreteHz = stable.discrete ? numericNoiseBandwidthHz(hd, range.fMinHz, range.nyquistHz) : null;
  return { analogHz: analog.hz, analogMethod: analog.method, discreteHz, highGainApproximationHz, notes };
}

function analogNoiseBandwidth(
  design: LoopFilterDesign,
  k: number,
  range: { fMinHz: number; fMaxAnalogHz: number },
): { hz: number; method: 'closed-form' | 'numeric' } {
  const { h } = analogClosedLoop(design.analog, k);
  const den = h.den;
  const lead = den[0]!;
  let analogHz: number;
  let analogMethod: 'closed-form' | 'numeric';
  if (den.length === 3 && h.num.length <= 2) {
    const num = h.num.length === 2 ? h.num : [0, h.num[0]!];
    analogHz = secondOrderNoiseBandwidthHz(num[0]! / lead, num[1]! / lead, den[1]! / lead, den[2]! / lead);
    analogMethod = 'closed-form';
  } else {
    const hFn = closedLoop(analogLoopResponse(design.analogSections, k));
    analogHz = numericNoiseBandwidthHz(hFn, range.fMinHz, range.fMaxAnalogHz, { tail: true });
    analogMethod = 'numeric';
  }
  return { hz: analogHz, method: analogMethod };
}

