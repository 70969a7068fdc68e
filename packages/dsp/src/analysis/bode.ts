/**
 * Bode data with a continuous (unwrapped) phase. The phase of the first point is put on the branch
 * nearest −90°·(loop type) — an integrator per type, common practice, no source — and each later point
 * adds the principal angle of L(f_i)/L(f_{i−1}); the grid must be fine enough that the true phase moves
 * less than 180° between points (true for the ≥ 400-point log grids used here).
 */
import type { Complex } from '../filters/complex.ts';
import { type GridResponseFn, type ResponseFn, partsToDb } from './response.ts';
import { anchoredPhaseDeg, DEG, doubles } from './grid.ts';
import { kernelSamplePhase } from './wasm/gridKernel.ts';

export interface BodeData {
  readonly freqHz: readonly number[];
  readonly magnitudeDb: readonly number[];
  /** Unwrapped phase in degrees. */
  readonly phaseDeg: readonly number[];
}

/** Angle of a/b in degrees, principal value; 0 when either is zero. */
export function relativeAngleDeg(a: Complex, b: Complex): number {
  return relativeAngleOfPartsDeg(a.re, a.im, b.re, b.im);
}

/** relativeAngleDeg of a = ar + j·ai and b = br + j·bi given as numbers. */
function relativeAngleOfPartsDeg(ar: number, ai: number, br: number, bi: number): number {
  const re = ar * br + ai * bi;
  const im = ai * br - ar * bi;
  return re === 0 && im === 0 ? 0 : Math.atan2(im, re) * DEG;
}

/** A response's complex samples and unwrapped phase on a grid: what the margin search reads. */
export interface SampledPhase {
  readonly freqHz: readonly number[];
  /** Unwrapped phase in degrees. */
  readonly phaseDeg: readonly number[];
  /** The complex samples: fn(freqHz[i]) = re[i] + j·im[i]. */
  readonly re: readonly number[];
  readonly im: readonly number[];
}

export interface SampledResponse extends BodeData, SampledPhase {}

/** The sample at grid index i as a complex value. */
export function sampleAt(s: SampledPhase, i: number): Complex {
  return { re: s.re[i]!, im: s.im[i]! };
}

/** Sample a response on the grid: values, dB and unwrapped phase (anchored at −90°·loopType). */
export function sampleResponse(fn: GridResponseFn, grid: readonly number[], loopType: number): SampledResponse {
  const s = samplePhase(fn, grid, loopType);
  const { re, im } = s;
  const magnitudeDb = doubles(grid.length);
  for (let i = 0; i < grid.length; i++) magnitudeDb[i] = partsToDb(re[i]!, im[i]!);
  return { freqHz: grid, magnitudeDb, phaseDeg: s.phaseDeg, re, im };
}

/**
 * sampleResponse without the dB values, for a response only searched for its margins (which read the
 * magnitude's side of 0 dB from re² + im², margins.ts): 600 logarithms fewer.
 */
export function samplePhase(fn: GridResponseFn, grid: readonly number[], loopType: number): SampledPhase {
  const onKernel = fn.kernel ? kernelSamplePhase(fn.kernel, grid, loopType) : null;
  if (onKernel) return { freqHz: grid, phaseDeg: onKernel.phaseDeg, re: onKernel.re, im: onKernel.im };
  const n = grid.length;
  const re = doubles(n);
  const im = doubles(n);
  if (fn.fill) fn.fill(grid, re, im);
  else {
    for (let i = 0; i < n; i++) {
      const v = fn(grid[i]!);
      re[i] = v.re;
      im[i] = v.im;
    }
  }
  const phaseDeg = doubles(n);
  let phase = anchoredPhaseDeg(re[0]!, im[0]!, loopType);
  phaseDeg[0] = phase;
  for (let i = 1; i < n; i++) {
    phase += relativeAngleOfPartsDeg(re[i]!, im[i]!, re[i - 1]!, im[i - 1]!);
    phaseDeg[i] = phase;
  }
  return { freqHz: grid, phaseDeg, re, im };
}

/** Phase at f continued from a grid point (refHz, refValue, refPhaseDeg) close to f. */
export function phaseNear(fn: ResponseFn, f: number, refValue: Complex, refPhaseDeg: number): number {
  return refPhaseDeg + relativeAngleDeg(fn(f), refValue);
}
