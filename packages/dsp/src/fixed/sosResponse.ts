/** Magnitude response of a cascade of second-order sections on the unit circle (OS3 Ch. 5, memory). */
import type { Sos } from '../types/filter.ts';
import { sectionOnUnitCircle, unitCirclePoint, type SectionValue, type UnitCirclePoint } from '../filters/sections.ts';

const SECTION: SectionValue = { nr: 0, ni: 0, dr: 1, di: 0 };

/** |H(e^jω)|² of the cascade at normalised angular frequency ω (rad/sample): the product of |N|²/|D|². */
export function sosMagnitudeSquared(sections: readonly Sos[], omega: number): number {
  return magnitudeSquaredAt(sections, unitCirclePoint(omega));
}

function magnitudeSquaredAt(sections: readonly Sos[], p: UnitCirclePoint): number {
  let mag2 = 1;
  for (const s of sections) {
    sectionOnUnitCircle(s, p, SECTION);
    mag2 *= (SECTION.nr * SECTION.nr + SECTION.ni * SECTION.ni) / (SECTION.dr * SECTION.dr + SECTION.di * SECTION.di);
  }
  return mag2;
}

/** Grids already made, by point count (they never change; nothing outside this module sees them). */
const GRIDS = new Map<number, Float64Array>();

/** Log-spaced normalised frequencies ω from 1e-6·π to π (fs/2), `points` of them. */
function logOmegaGrid(points: number): Float64Array {
  const known = GRIDS.get(points);
  if (known) return known;
  const grid = new Float64Array(points);
  for (let k = 0; k < points; k++) grid[k] = Math.PI * 10 ** (-6 + (6 * k) / (points - 1));
  if (GRIDS.size < 8) GRIDS.set(points, grid);
  return grid;
}

/**
 * Largest |dB difference| between two cascades where the reference is within `bandDb` of its peak
 * on the grid; null when the test cascade is zero everywhere there. Both cascades are evaluated at
 * each ω from one set of cos/sin (the trigonometry is most of the cost).
 */
export function maxResponseDeviationDb(
  reference: readonly Sos[],
  test: readonly Sos[],
  bandDb: number,
  points = 600,
): number | null {
  const grid = logOmegaGrid(points);
  const refDb = new Float64Array(points);
  const testDb = new Float64Array(points);
  let peakDb = -Infinity;
  for (let k = 0; k < points; k++) {
    const p = unitCirclePoint(grid[k] as number);
    const r = 10 * Math.log10(magnitudeSquaredAt(reference, p));
    refDb[k] = r;
    testDb[k] = 10 * Math.log10(magnitudeSquaredAt(test, p));
    if (Number.isFinite(r) && r > peakDb) peakDb = r;
  }
  let worst = 0;
  let anyFinite = false;
  for (let k = 0; k < points; k++) {
    const r = refDb[k] as number;
    if (!Number.isFinite(r) || r < peakDb - bandDb) continue;
    const t = testDb[k] as number;
    if (!Number.isFinite(t)) {
      if (t === -Infinity) continue;
      worst = Infinity;
      continue;
    }
    anyFinite = true;
    worst = Math.max(worst, Math.abs(t - r));
  }
  return anyFinite ? worst : null;
}
