/**
 * Gain crossover, phase margin and gain margin of an open loop sampled on a log grid, each crossing
 * refined by Brent's method in log-frequency (roots.ts). Definitions (Og5 Sec. 7-6 (memory)):
 * - phase margin PM = 180° + ∠L(fc) at each gain crossover |L(fc)| = 1 (unwrapped phase); the
 *   reported PM is the smallest over all crossovers, crossoverHz the frequency where it occurs;
 * - gain margin GM = −20·log10|L(fp)| at each phase crossover ∠L(fp) = −180° (mod 360°); the reported
 *   GM is the one nearest 0 dB (negative for a loop that is unstable at this gain).
 * The search interval is closed: a crossing exactly at the last grid point (fs/2 for the discrete loop,
 * where z⁻¹/(1 − z⁻¹) alone contributes exactly −180°) counts. A phase crossover where |L| is zero
 * (a transmission zero at Nyquist) has no finite gain margin and is ignored.
 */
import { brentRoot } from './roots.ts';
import { type ResponseFn, toDb } from './response.ts';
import { type SampledPhase, phaseNear, sampleAt } from './bode.ts';

export interface PhaseCrossing {
  readonly freqHz: number;
  readonly gainMarginDb: number;
}

export interface LoopMargins {
  /** Gain crossover with the smallest phase margin (Hz), null if |L| never crosses 1. */
  readonly crossoverHz: number | null;
  readonly phaseMarginDeg: number | null;
  /** Phase crossover with the gain margin nearest 0 dB (Hz), null if none. */
  readonly phaseCrossoverHz: number | null;
  readonly gainMarginDb: number | null;
  readonly gainCrossingsHz: readonly number[];
  readonly phaseCrossings: readonly PhaseCrossing[];
  /** Why a figure is null. */
  readonly notes: readonly string[];
}

/** Tolerance for the phase touching −180° exactly at the end of the interval (degrees). */
const END_TOUCH_DEG = 1e-7;
/** |L| below this (≈ −240 dB) is a transmission zero, not a finite gain margin. */
const ZERO_MAGNITUDE_DB = -240;

/** Margins of the open loop `fn` from its samples `s` (which fix the search interval, closed at both ends). */
export function loopMargins(fn: ResponseFn, s: SampledPhase): LoopMargins {
  const notes: string[] = [];
  const gains = gainCrossings(fn, s);
  const phases = phaseCrossings(fn, s);
  let best: { f: number; pm: number } | null = null;
  for (const g of gains) if (!best || g.pm < best.pm) best = g;
  let bestGm: PhaseCrossing | null = null;
  for (const p of phases) if (!bestGm || Math.abs(p.gainMarginDb) < Math.abs(bestGm.gainMarginDb)) bestGm = p;
  const f0 = s.freqHz[0]!;
  const f1 = s.freqHz[s.freqHz.length - 1]!;
  if (!best) notes.push(`|L| does not cross 0 dB between ${f0.toPrecision(4)} Hz and ${f1.toPrecision(4)} Hz`);
  if (!bestGm) notes.push(`the phase does not reach −180° with finite gain up to ${f1.toPrecision(6)} Hz: gain margin unbounded`);
  return {
    crossoverHz: best ? best.f : null,
    phaseMarginDeg: best ? best.pm : null,
    phaseCrossoverHz: bestGm ? bestGm.freqHz : null,
    gainMarginDb: bestGm ? bestGm.gainMarginDb : null,
    gainCrossingsHz: gains.map((g) => g.f),
    phaseCrossings: phases,
    notes,
  };
}

/**
 * The side of 0 dB of sample i (1 above, −1 below, 0 on it), as the sign of toDb of the sample: toDb is
 * 10·log10(re² + im²) clamped to ±3000 dB (or 20·log10 of the magnitude where the square would over- or
 * underflow), and 10·log10(p) is above, at or below 0 exactly as p is above, at or below 1 (checked for
 * every double within 3e6 units in the last place of 1 and 2e6 random ones from 1e-280 to 1e280; away
 * from 1 the logarithm is far larger than its error). So the crossings are found without a logarithm
 * per grid point. A NaN square reads as below, as toDb's floor does.
 */
function levelSign(re: readonly number[], im: readonly number[], i: number): number {
  const p = re[i]! * re[i]! + im[i]! * im[i]!;
  return p > 1 ? 1 : p === 1 ? 0 : -1;
}

function gainCrossings(fn: ResponseFn, s: SampledPhase): { f: number; pm: number }[] {
  const out: { f: number; pm: number }[] = [];
  const { re, im } = s;
  let b = levelSign(re, im, 0);
  for (let i = 0; i + 1 < re.length; i++) {
    const a = b;
    b = levelSign(re, im, i + 1);
    const crosses = (a > 0 && b <= 0) || (a < 0 && b >= 0) || (i === 0 && a === 0);
    if (!crosses) continue;
    const x = brentRoot((lx) => toDb(fn(Math.exp(lx))), Math.log(s.freqHz[i]!), Math.log(s.freqHz[i + 1]!), 1e-13);
    const f = Math.exp(x);
    const phase = phaseNear(fn, f, sampleAt(s, i), s.phaseDeg[i]!);
    out.push({ f, pm: 180 + phase });
  }
  return out;
}

function phaseCrossings(fn: ResponseFn, s: SampledPhase): PhaseCrossing[] {
  const out: PhaseCrossing[] = [];
  const p = s.phaseDeg;
  const last = p.length - 1;
  for (let i = 0; i < last; i++) {
    const pa = p[i]!;
    let pb = p[i + 1]!;
    const lo = Math.min(pa, pb);
    const hi = Math.max(pa, pb);
    for (let n = Math.ceil((lo - END_TOUCH_DEG + 180) / 360); n <= Math.floor((hi + END_TOUCH_DEG + 180) / 360); n++) {
      const level = -180 + 360 * n;
      if (i + 1 === last && Math.abs(pb - level) < END_TOUCH_DEG) pb = level;
      const da = pa - level;
      const db = pb - level;
      if (!((da > 0 && db <= 0) || (da < 0 && db >= 0) || (i === 0 && da === 0))) continue;
      const f = db === 0 ? s.freqHz[i + 1]! : phaseCrossingHz(fn, s, i, level);
      const db0 = toDb(fn(f));
      if (db0 <= ZERO_MAGNITUDE_DB) continue;
      out.push({ freqHz: f, gainMarginDb: -db0 });
    }
  }
  return out;
}

/**
 * The frequency between grid points i and i + 1 where the phase, continued from point i, reaches
 * `level`. Its own function so the search's closure captures these values here, once per crossing:
 * captured by a closure inside phaseCrossings' loops, they were a context allocated per grid point.
 */
function phaseCrossingHz(fn: ResponseFn, s: SampledPhase, i: number, level: number): number {
  const ref = sampleAt(s, i);
  const refPhaseDeg = s.phaseDeg[i]!;
  const x = brentRoot((lx) => phaseNear(fn, Math.exp(lx), ref, refPhaseDeg) - level, Math.log(s.freqHz[i]!), Math.log(s.freqHz[i + 1]!), 1e-13);
  return Math.exp(x);
}
