/**
 * Loop gain constants (DESIGN.md conventions).
 *
 * Open loop L(s) = Kd·Ko·F(s)/s.
 * - Kd = A_in·A_nco/2 per radian near lock for a multiplier detector: A·sin(a)·B·cos(b) =
 *   (AB/2)[sin(a−b) + sin(a+b)], the sum term being the 2·f ripple the loop filter removes
 *   (common practice; G3 Ch. 2). A_nco = 1: the NCO output is at full scale.
 * - Ko = 2π·gainHzPerUnit rad/s per unit of control: the NCO integrates frequency into phase (G3 Ch. 2).
 */

/** The part of a spec the gain depends on (kept minimal so the schema can use it before parsing ends). */
export interface LoopGainInput {
  readonly input: { readonly amplitude: number };
  readonly nco: { readonly gainHzPerUnit: number };
}

export interface LoopGain {
  /** Detector gain Kd, control units per radian of phase error. */
  readonly kd: number;
  /** NCO gain Ko, rad/s per unit of control. */
  readonly koRadPerSPerUnit: number;
  /** K = Kd·Ko in 1/s (rad/s per rad). */
  readonly kRadPerS: number;
}

/** Amplitude of the NCO's output that the detector multiplies by (full scale). */
export const NCO_AMPLITUDE = 1;

/** Kd, Ko and K = Kd·Ko for a spec. */
export function loopGain(spec: LoopGainInput): LoopGain {
  const kd = (spec.input.amplitude * NCO_AMPLITUDE) / 2;
  const koRadPerSPerUnit = 2 * Math.PI * spec.nco.gainHzPerUnit;
  return { kd, koRadPerSPerUnit, kRadPerS: kd * koRadPerSPerUnit };
}
