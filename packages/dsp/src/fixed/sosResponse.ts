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

/** Unit-circle points of the log grids already made, by point count (they never change; nothing outside this module sees them). */
const GRIDS = new Map<number, readonly UnitCirclePoint[]>();

/**
 * Log-spaced normalised frequencies ω from 1e-6·π to π (fs/2), `points` of them, as their cos/sin
 * of ω and 2ω: the grid is the same for every spec, so its trigonometry (four calls a point, most of
 * this module's time) is done once per process instead of once per quantisation.
 */
function logUnitCircleGrid(points: number): readonly UnitCirclePoint[] {
  const known = GRIDS.get(points);
  if (known) return known;
  const grid: UnitCirclePoint[] = [];
  for (let k = 0; k < points; k++) grid.push(unitCirclePoint(Math.PI * 10 ** (-6 + (6 * k) / (points - 1))));
  if (GRIDS.size < 8) GRIDS.set(points, grid);
  return grid;
}

/**
 * Largest |dB difference| between two cascades where the reference is within `bandDb` of its peak
 * on the grid; null when the test cascade is zero everywhere there. Both cascades are evaluated at
 * each ω from the grid's one set of cos/sin.
 */
export function maxResponseDeviationDb(
  reference: readonly Sos[],
  test: readonly Sos[],
  bandDb: number,
  points = 600,
): number | null {
  const circle = logUnitCircleGrid(points);
  const refDb = new Float64Array(points);
  let peakDb = -Infinity;
  for (let k = 0; k < points; k++) {
    const r = 10 * Math.log10(magnitudeSquaredAt(reference, circle[k] as UnitCirclePoint));
    refDb[k] = r;
    if (Number.isFinite(r) && r > peakDb) peakDb = r;
  }
  let worst = 0;
  let anyFinite = false;
  for (let k = 0; k < points; k++) {
    const r = refDb[k] as number;
    if (!Number.isFinite(r) || r < peakDb - bandDb) continue;
    // The test cascade only where it counts: in the band.
    const t = 10 * Math.log10(magnitudeSquaredAt(test, circle[k] as UnitCirclePoint));
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
