/**
 * Acquisition estimates by their textbook formulas (G3 Ch. 2 and Ch. 5 (memory); B6 key parameters).
 * They are rough: Ku23 shows the lock-in range depends on its definition, and simulation of the
 * nonlinear loop can differ by up to 2x — the sim module's measureAcquisition measures them.
 * - lock-in   ΔωL ≈ 2ζωn
 * - hold-in   ΔωH = K·F(0) (sinusoidal detector saturates at |sin| = 1); infinite for an ideal PI
 * - pull-out  ΔωPO ≈ 1.8·ωn·(ζ + 1)
 * - pull-in time TP ≈ Δω²/(2ζωn³) for an initial offset Δω beyond the lock-in range
 * The lock-in and pull-out formulas are high-gain results; a type-1 loop can neither lock nor stay
 * locked beyond its hold-in range (lock-in ≤ pull-in ≤ hold-in, pull-out ≤ hold-in: G3 Ch. 2/5), so
 * lockInHz and pullOutHz are the formulas capped at K·F(0), and the raw formula values are kept in
 * lockInFormulaHz and pullOutFormulaHz.
 */
import type { AcquisitionEstimates } from '../types/analysis.ts';

/** rad/s to Hz (module functions rather than named closures per call: filters/loopFilter.ts, withRipple). */
function hz(w: number): number {
  return w / (2 * Math.PI);
}

/** w, or the hold-in range K·F(0) when w exceeds it (a note says so). */
function capAtHoldIn(w: number, holdIn: number | null, what: string, formula: string, notes: string[]): number {
  if (holdIn === null || w <= holdIn) return w;
  notes.push(`${what}: ${formula} = ${hz(w).toPrecision(4)} Hz exceeds the hold-in range K·F(0) = ${hz(holdIn).toPrecision(4)} Hz (the formula is a high-gain result); capped at hold-in, which a type-1 loop cannot pass`);
  return holdIn;
}

/** Textbook acquisition estimates from ωn, ζ (null when they do not apply), K and F(0) (null for PI). */
export function acquisitionEstimates(
  second: { readonly wnRadPerS: number; readonly damping: number } | null,
  kRadPerS: number,
  dcGain: number | null,
): AcquisitionEstimates {
  const notes: string[] = [];
  const holdIn = dcGain === null ? null : kRadPerS * dcGain;
  if (holdIn === null) {
    notes.push('hold-in: K·F(0) is infinite for an ideal PI filter; in practice the NCO control range or integrator saturation limits it');
  }
  if (!second) {
    notes.push('lock-in, pull-out and pull-in time: ωn and ζ do not apply to a loop of order above 2');
    return {
      lockInHz: null,
      lockInRadPerS: null,
      lockInFormulaHz: null,
      holdInHz: holdIn === null ? null : hz(holdIn),
      holdInRadPerS: holdIn,
      pullOutHz: null,
      pullOutRadPerS: null,
      pullOutFormulaHz: null,
      pullInTimeSPerHz2: null,
      label: 'estimate',
      notes,
    };
  }
  const { wnRadPerS: wn, damping: z } = second;
  const lockInFormula = 2 * z * wn;
  const pullOutFormula = 1.8 * wn * (z + 1);
  const lockIn = capAtHoldIn(lockInFormula, holdIn, 'lock-in', '2ζωn', notes);
  const pullOut = capAtHoldIn(pullOutFormula, holdIn, 'pull-out', '1.8ωn(ζ+1)', notes);
  return {
    lockInHz: hz(lockIn),
    lockInRadPerS: lockIn,
    lockInFormulaHz: hz(lockInFormula),
    holdInHz: holdIn === null ? null : hz(holdIn),
    holdInRadPerS: holdIn,
    pullOutHz: hz(pullOut),
    pullOutRadPerS: pullOut,
    pullOutFormulaHz: hz(pullOutFormula),
    // TP = Δω²/(2ζωn³) with Δω = 2π·Δf, so TP = c·Δf² with c = (2π)²/(2ζωn³).
    pullInTimeSPerHz2: (4 * Math.PI * Math.PI) / (2 * z * wn ** 3),
    label: 'estimate',
    notes,
  };
}
