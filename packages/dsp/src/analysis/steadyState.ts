/**
 * Steady-state phase errors of the linearised loop (G3 Ch. 2; final-value theorem, Og5 Sec. 5-8 (memory)):
 * - after a phase step: 0 for every loop here (the NCO integrates);
 * - after a frequency step Δω: Δω/(K·F(0)) for a type-1 loop (asin of it with the sinusoidal
 *   detector), 0 for type 2;
 * - during a frequency ramp dΔω/dt: (dΔω/dt)/ωn² for the type-2 PI loop (= R·τ1/K), unbounded for type 1.
 */
import type { SteadyStateErrors } from '../types/analysis.ts';

/** Steady-state phase errors of a loop of the given type; dcGain = F(0) (null: infinite), tau1S for PI. */
export function steadyStateErrors(loopType: number, kRadPerS: number, dcGain: number | null, tau1S: number | null): SteadyStateErrors {
  if (loopType >= 2 || dcGain === null) {
    return {
      phaseStepRad: 0,
      frequencyStepRadPerHz: 0,
      frequencyRampRadPerHzPerS: tau1S === null ? null : (2 * Math.PI * tau1S) / kRadPerS,
      notes: [],
    };
  }
  return {
    phaseStepRad: 0,
    frequencyStepRadPerHz: (2 * Math.PI) / (kRadPerS * dcGain),
    frequencyRampRadPerHzPerS: null,
    notes: ['frequency ramp: a type-1 loop falls behind without bound (the error grows with time)'],
  };
}

/** Steady-state phase error (rad) after a frequency step of stepHz, with the sinusoidal detector (asin). */
export function frequencyStepErrorRad(errors: SteadyStateErrors, stepHz: number): number | null {
  const x = errors.frequencyStepRadPerHz * stepHz;
  return Math.abs(x) <= 1 ? Math.asin(x) : null; // |x| > 1: beyond hold-in, the loop does not stay locked
}
