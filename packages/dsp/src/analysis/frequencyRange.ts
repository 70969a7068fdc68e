/**
 * Frequency range of the analysis grids from the loop's characteristic frequencies (K/2π, filter
 * corners, ωn): three decades below the lowest to three above the highest for the analog loop; the
 * discrete loop ends exactly at fs/2 (closed interval, DESIGN.md).
 */
import type { AnalogTf } from '../types/filter.ts';

export const DECADES_MARGIN = 3;

/** Corner frequencies (Hz) of analog sections of order ≤ 2: |roots| of numerator and denominator. */
export function cornerFrequenciesHz(sections: readonly AnalogTf[]): number[] {
  const out: number[] = [];
  for (const s of sections) {
    for (const p of [s.num, s.den]) {
      const q = p.slice(p.findIndex((x) => x !== 0));
      if (q.length === 2 && q[1] !== 0) out.push(Math.abs(q[1]! / q[0]!) / (2 * Math.PI));
      if (q.length === 3 && q[2] !== 0) out.push(Math.sqrt(Math.abs(q[2]! / q[0]!)) / (2 * Math.PI));
    }
  }
  return out;
}

/** Grid limits (Hz) for the analog and the discrete loop. */
export function analysisRange(
  sections: readonly AnalogTf[],
  kRadPerS: number,
  sampleRateHz: number,
): { fMinHz: number; fMaxAnalogHz: number; nyquistHz: number } {
  const chars = [kRadPerS / (2 * Math.PI), ...cornerFrequenciesHz(sections)].filter((f) => f > 0 && Number.isFinite(f));
  const nyquistHz = sampleRateHz / 2;
  const lo = Math.min(...chars);
  const hi = Math.max(...chars);
  const scale = 10 ** DECADES_MARGIN;
  const fMinHz = Math.min(lo / scale, nyquistHz / scale);
  return { fMinHz, fMaxAnalogHz: Math.max(hi * scale, nyquistHz), nyquistHz };
}
