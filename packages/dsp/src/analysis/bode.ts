/**
 * Bode data with a continuous (unwrapped) phase. The phase of the first point is put on the branch
 * nearest −90°·(loop type) — an integrator per type, common practice, no source — and each later point
 * adds the principal angle of L(f_i)/L(f_{i−1}); the grid must be fine enough that the true phase moves
 * less than 180° between points (true for the ≥ 400-point log grids used here).
 */
import type { Complex } from '../filters/complex.ts';
import { type ResponseFn, toDb } from './response.ts';

export interface BodeData {
  readonly freqHz: readonly number[];
  readonly magnitudeDb: readonly number[];
  /** Unwrapped phase in degrees. */
  readonly phaseDeg: readonly number[];
}

const DEG = 180 / Math.PI;

/** Angle of a/b in degrees, principal value; 0 when either is zero. */
export function relativeAngleDeg(a: Complex, b: Complex): number {
  const re = a.re * b.re + a.im * b.im;
  const im = a.im * b.re - a.re * b.im;
  return re === 0 && im === 0 ? 0 : Math.atan2(im, re) * DEG;
}

export interface SampledResponse extends BodeData {
  readonly values: readonly Complex[];
}

/** Sample a response on the grid: values, dB and unwrapped phase (anchored at −90°·loopType). */
export function sampleResponse(fn: ResponseFn, grid: readonly number[], loopType: number): SampledResponse {
  const values = grid.map(fn);
  const magnitudeDb = values.map(toDb);
  const phaseDeg = new Array<number>(values.length);
  const first = values[0]!;
  let phase = Math.atan2(first.im, first.re) * DEG;
  const anchor = -90 * loopType;
  phase += 360 * Math.round((anchor - phase) / 360);
  phaseDeg[0] = phase;
  for (let i = 1; i < values.length; i++) {
    phase += relativeAngleDeg(values[i]!, values[i - 1]!);
    phaseDeg[i] = phase;
  }
  return { freqHz: grid, magnitudeDb, phaseDeg, values };
}

/** Phase at f continued from a grid point (refHz, refValue, refPhaseDeg) close to f. */
export function phaseNear(fn: ResponseFn, f: number, refValue: Complex, refPhaseDeg: number): number {
  return refPhaseDeg + relativeAngleDeg(fn(f), refValue);
}
