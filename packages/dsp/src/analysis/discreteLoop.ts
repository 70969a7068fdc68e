/**
 * The discrete loop for ANY digital loop filter (the designed one, or quantised sections from the
 * fixed-point module): L(z) = Kd·F(z)·Ko·T·z⁻¹/(1 − z⁻¹) at the loop rate sampleRateHz (DESIGN.md).
 * Used by analyzeDesign, by the word-length search and by the sim module.
 */
import type { DigitalTf, Sos } from '../types/filter.ts';
import type { LoopSpec } from '../spec/schema.ts';
import { loopGain } from './loopGain.ts';
import { type DigitalFilter, closedDbOfOpen, closedLoop, discreteLoopResponse, isSections, type ResponseFn } from './response.ts';
import { logGrid } from './grid.ts';
import { type SampledResponse, sampleResponse } from './bode.ts';
import { type LoopMargins, loopMargins } from './margins.ts';
import { type ClosedLoopFigures, closedLoopFigures, closedLoopFiguresOfOpen } from './closedLoopFigures.ts';
import { discreteLoopStable, schurCohnStable } from './stability.ts';
import { discreteClosedLoop } from './loopPolynomials.ts';

export interface DiscreteLoopOptions {
  /** Lowest grid frequency (Hz); default 1e-7·fs/2. The grid always ends exactly at fs/2. */
  readonly fMinHz?: number;
  /** Grid points (default 600). */
  readonly points?: number;
  /** Also compute closed-loop bandwidth and peaking (default true). */
  readonly closedLoop?: boolean;
  /** Also return the closed loop's dB values on the grid, closedDb (default true; the figures need them not). */
  readonly closedDb?: boolean;
  /** The grid logGrid(fMin, fs/2, points) gives, when the caller has it already (the same numbers). */
  readonly grid?: readonly number[];
}

export interface DiscreteLoopAnalysis {
  readonly margins: LoopMargins;
  /** All closed-loop poles strictly inside the unit circle (section-wise test, stability.ts). */
  readonly stable: boolean;
  readonly closedLoop: ClosedLoopFigures | null;
  /** |H| = |L/(1 + L)| in dB on the grid (what closedLoop was found from); null without closedLoop or closedDb. */
  readonly closedDb: readonly number[] | null;
  /** Open-loop samples on the grid (frequency, dB, unwrapped phase). */
  readonly open: SampledResponse;
  /** Loop type: 1 + integrators (poles at z = 1) of F. */
  readonly loopType: number;
  readonly response: ResponseFn;
}

export const DEFAULT_POINTS = 600;

/** Relative size of A(1) below which a pole at z = 1 counts as an integrator (bilinear and quantised
 * integrators give A(1) = 0 exactly; a narrow low-pass section still has A(1)/Σ|a| ≈ (ωT)² ≫ 1e-14). */
const INTEGRATOR_TOL = 1e-14;

/** Poles of F at z = 1 (integrators): per section, or by deflating A(z⁻¹) by (1 − z⁻¹) while A(1) ≈ 0. */
export function integratorCount(filter: DigitalFilter): number {
  if (isSections(filter)) return filter.reduce((n, s) => n + integratorCount({ b: s.b, a: s.a }), 0);
  let p = [...filter.a];
  let count = 0;
  const scale = p.reduce((s, x) => s + Math.abs(x), 0);
  while (p.length > 1 && Math.abs(p.reduce((s, x) => s + x, 0)) <= INTEGRATOR_TOL * scale) {
    // synthetic division by (1 − w): q_i = p_i + q_{i−1}
    const q: number[] = [];
    let acc = 0;
    for (let i = 0; i < p.length - 1; i++) {
      acc += p[i]!;
      q.push(acc);
    }
    p = q;
    count++;
  }
  return count;
}

/**
 * Margins, stability and closed-loop figures of the discrete loop with the given digital filter F(z).
 * Frequencies in Hz; the grid is log-spaced from fMinHz to exactly fs/2. Sections are preferred: for a
 * b/a above second order the stability test is Schur–Cohn on the b/a, unreliable for narrow loops.
 */
export function discreteLoopMargins(spec: LoopSpec, filter: DigitalFilter, options: DiscreteLoopOptions = {}): DiscreteLoopAnalysis {
  const fs = spec.sampleRateHz;
  const nyquistHz = fs / 2;
  const k = loopGain(spec).kRadPerS;
  const loopType = 1 + integratorCount(filter);
  const fn = discreteLoopResponse(filter, k, fs);
  const fMin = Math.min(options.fMinHz ?? nyquistHz * 1e-7, nyquistHz / 10);
  const grid = options.grid ?? logGrid(fMin, nyquistHz, options.points ?? DEFAULT_POINTS);
  const open = sampleResponse(fn, grid, loopType);
  const margins = loopMargins(fn, open);
  // Sections (or a b/a of order ≤ 2) get the section-wise test; a high-order b/a only the b/a test.
  const stable = isSections(filter) ? discreteLoopStable(filter, k, fs) : transferFunctionStable(filter, k, fs);
  const withClosed = options.closedLoop !== false;
  const closedDb = withClosed && options.closedDb !== false ? closedDbOfOpen(open) : null;
  const cl = !withClosed ? null : closedDb ? closedLoopFigures(closedLoop(fn), grid, closedDb, stable) : closedLoopFiguresOfOpen(closedLoop(fn), grid, open, stable);
  return { margins, stable, closedLoop: cl, closedDb, open, loopType, response: fn };
}

/** Stability of the loop with a b/a filter: section-wise when of order ≤ 2, else Schur–Cohn on the b/a. */
function transferFunctionStable(tf: DigitalTf, k: number, fs: number): boolean {
  return tf.a.length <= 3 && tf.b.length <= 3 ? discreteLoopStable([tfAsSection(tf)], k, fs) : schurCohnStable(discreteClosedLoop(tf, k, fs).h.a);
}

/** A b/a of order ≤ 2 as one section. */
function tfAsSection(tf: DigitalTf): Sos {
  return { b: [tf.b[0] ?? 0, tf.b[1] ?? 0, tf.b[2] ?? 0], a: [tf.a[0] ?? 1, tf.a[1] ?? 0, tf.a[2] ?? 0] };
}
