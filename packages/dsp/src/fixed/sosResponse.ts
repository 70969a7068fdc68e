/** Magnitude response of a cascade of second-order sections on the unit circle (OS3 Ch. 5, memory). */
import type { Sos } from '../types/filter.ts';
import { sectionOnUnitCircle, unitCirclePoint, type SectionValue, type UnitCirclePoint } from '../filters/sections.ts';

const SECTION: SectionValue = { nr: 0, ni: 0, dr: 1, di: 0 };

/** |H(e^jω)|² of the cascade at normalised angular frequency ω (rad/sample): the product of |N|²/|D|². */
export function sosMagnitudeSquared(sections: readonly Sos[], omega: number): number {
  const p = unitCirclePoint(omega);
  let mag2 = 1;
  for (const s of sections) {
    sectionOnUnitCircle(s, p, SECTION);
    mag2 *= (SECTION.nr * SECTION.nr + SECTION.ni * SECTION.ni) / (SECTION.dr * SECTION.dr + SECTION.di * SECTION.di);
  }
  return mag2;
}

/** cos ω, sin ω, cos 2ω, sin 2ω of each point of a log grid, four numbers a point (unitCirclePoint's values). */
type CircleGrid = Float64Array;

/** Unit-circle points of the log grids already made, by point count (they never change; nothing outside this module sees them). */
const GRIDS = new Map<number, CircleGrid>();

/**
 * Log-spaced normalised frequencies ω from 1e-6·π to π (fs/2), `points` of them, as their cos/sin
 * of ω and 2ω: the grid is the same for every spec, so its trigonometry (four calls a point, most of
 * this module's time) is done once per process instead of once per quantisation.
 */
function logUnitCircleGrid(points: number): CircleGrid {
  const known = GRIDS.get(points);
  if (known) return known;
  const grid = new Float64Array(4 * points);
  for (let k = 0; k < points; k++) {
    const p: UnitCirclePoint = unitCirclePoint(Math.PI * 10 ** (-6 + (6 * k) / (points - 1)));
    grid.set([p.c1, p.s1, p.c2, p.s2], 4 * k);
  }
  if (GRIDS.size < 8) GRIDS.set(points, grid);
  return grid;
}

/** b0, b1, b2, a0, a1, a2 of every section, flat (read once per cascade, not once per point). */
function flatCoefficients(sections: readonly Sos[]): Float64Array {
  const coef = new Float64Array(6 * sections.length);
  sections.forEach(({ b, a }, j) => coef.set([b[0], b[1], b[2], a[0], a[1], a[2]], 6 * j));
  return coef;
}

/** sosMagnitudeSquared at grid point k: sectionOnUnitCircle's sums and the same quotients and product, on numbers. */
function magnitudeSquaredAt(coef: Float64Array, grid: CircleGrid, k: number): number {
  const c1 = grid[4 * k]!;
  const s1 = grid[4 * k + 1]!;
  const c2 = grid[4 * k + 2]!;
  const s2 = grid[4 * k + 3]!;
  let mag2 = 1;
  for (let o = 0; o < coef.length; o += 6) {
    const nr = coef[o]! + coef[o + 1]! * c1 + coef[o + 2]! * c2;
    const ni = -(coef[o + 1]! * s1 + coef[o + 2]! * s2);
    const dr = coef[o + 3]! + coef[o + 4]! * c1 + coef[o + 5]! * c2;
    const di = -(coef[o + 4]! * s1 + coef[o + 5]! * s2);
    mag2 *= (nr * nr + ni * ni) / (dr * dr + di * di);
  }
  return mag2;
}

const decibels = (mag2: number) => 10 * Math.log10(mag2);
/** 10·log10 of a square is finite exactly when the square is positive and finite. */
const finite = (mag2: number) => mag2 > 0 && mag2 < Infinity;

/**
 * Relative margin by which a squared magnitude (or a ratio of two) must clear a bound to be decided
 * without its logarithm: 1e-6 is 4.3e-6 dB, while the dB values below differ from the exact ones by a
 * few units in the last place of numbers under 3,300 dB (about 1e-12 dB), so a value decided by its
 * square is on the same side of the bound as its dB value. Only the points within the margin take
 * their logarithm.
 */
const MARGIN = 1e-6;

/** Scratch of the squared magnitudes and their ratios (single-threaded, never re-entered; written before read). */
let scratch = new Float64Array(0);

/**
 * Largest |dB difference| between two cascades where the reference is within `bandDb` of its peak
 * on the grid; null when the test cascade is zero everywhere there. Both cascades are evaluated at
 * each ω from the grid's one set of cos/sin. The figure is that of comparing 10·log10 of the two
 * squared magnitudes at every point, found with a logarithm only where a bound cannot be decided on
 * the squares themselves (MARGIN): the peak, the band's edge and the largest ratio of the two; the
 * 1,200 logarithms of a 600-point grid were most of a quantisation's time.
 */
export function maxResponseDeviationDb(
  reference: readonly Sos[],
  test: readonly Sos[],
  bandDb: number,
  points = 600,
): number | null {
  const grid = logUnitCircleGrid(points);
  const refCoef = flatCoefficients(reference);
  const testCoef = flatCoefficients(test);
  if (scratch.length < 2 * points) scratch = new Float64Array(2 * points);
  const ref = scratch;
  let refMax = 0;
  for (let k = 0; k < points; k++) {
    const r = magnitudeSquaredAt(refCoef, grid, k);
    ref[k] = r;
    if (finite(r) && r > refMax) refMax = r;
  }
  if (refMax === 0) return null; // no finite reference point: no band
  let peakDb = -Infinity;
  for (let k = 0; k < points; k++) if (finite(ref[k]!) && ref[k]! >= refMax * (1 - MARGIN)) peakDb = Math.max(peakDb, decibels(ref[k]!));
  const floorDb = peakDb - bandDb;
  const floor = 10 ** (floorDb / 10);
  // A floor too near under- or overflow to compare squares with: every point takes its logarithm.
  const floorUsable = floor > 1e-290 && floor < 1e290;
  const ratio = scratch; // ratio[points + k]: the larger of test/ref and ref/test in the band, −1 elsewhere
  let ratioMax = 0;
  let anyFinite = false;
  let infinite = false;
  for (let k = 0; k < points; k++) {
    const r = ref[k]!;
    ratio[points + k] = -1;
    if (!finite(r)) continue;
    const inBand = floorUsable && r > floor * (1 + MARGIN) ? true : floorUsable && r < floor * (1 - MARGIN) ? false : !(decibels(r) < floorDb);
    if (!inBand) continue;
    const t = magnitudeSquaredAt(testCoef, grid, k);
    if (t === 0) continue; // −∞ dB: the test cascade has a zero here
    if (!(t < Infinity)) {
      infinite = true;
      continue;
    }
    anyFinite = true;
    const q = t >= r ? t / r : r / t;
    ratio[points + k] = q;
    if (q > ratioMax) ratioMax = q;
  }
  if (!anyFinite) return null;
  if (infinite) return Infinity;
  // A ratio that overflowed cannot be ranked by its square: every point in the band is compared.
  const threshold = ratioMax < Infinity ? ratioMax * (1 - MARGIN) : 0;
  let worst = 0;
  for (let k = 0; k < points; k++) {
    if (!(ratio[points + k]! >= threshold) || ratio[points + k]! < 0) continue;
    const t = magnitudeSquaredAt(testCoef, grid, k);
    worst = Math.max(worst, Math.abs(decibels(t) - decibels(ref[k]!)));
  }
  return worst;
}
