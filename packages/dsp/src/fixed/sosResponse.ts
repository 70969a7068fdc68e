/** Magnitude response of a cascade of second-order sections on the unit circle (OS3 Ch. 5, memory). */
import type { Sos } from '../types/filter.ts';
import { sectionOnUnitCircle, unitCirclePoint, type SectionValue } from '../filters/sections.ts';

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

/** Log-spaced normalised frequencies ω from 1e-6·π to π (fs/2), `points` of them. */
function logOmegaGrid(points: number): Float64Array {
  const grid = new Float64Array(points);
  for (let k = 0; k < points; k++) grid[k] = Math.PI * 10 ** (-6 + (6 * k) / (points - 1));
  return grid;
}

/**
 * Largest |dB difference| between two cascades where the reference is within `bandDb` of its peak
 * on the grid; null when the test cascade is zero everywhere there.
 */
export function maxResponseDeviationDb(
  reference: readonly Sos[],
  test: readonly Sos[],
  bandDb: number,
  points = 600,
): number | null {
  const grid = logOmegaGrid(points);
  const refDb = Array.from(grid, (w) => 10 * Math.log10(sosMagnitudeSquared(reference, w)));
  const peakDb = refDb.reduce((m, v) => (Number.isFinite(v) && v > m ? v : m), -Infinity);
  let worst = 0;
  let anyFinite = false;
  grid.forEach((w, k) => {
    const r = refDb[k] ?? -Infinity;
    if (!Number.isFinite(r) || r < peakDb - bandDb) return;
    const t = 10 * Math.log10(sosMagnitudeSquared(test, w));
    if (!Number.isFinite(t)) {
      if (t === -Infinity) return;
      worst = Infinity;
      return;
    }
    anyFinite = true;
    worst = Math.max(worst, Math.abs(t - r));
  });
  return anyFinite ? worst : null;
}
