/**
 * Loop gain constants (DESIGN.md conventions).
 *
 * Open loop L(s) = Kd·Ko·F(s)/s.
 * - Kd = A_in·A_nco/2 per radian near lock for a multiplier detector: A·sin(a)·B·cos(b) =
 *   (AB/2)[sin(a−b) + sin(a+b)], the sum term being the 2·f ripple the loop filter removes
 *   (common practice; G3 Ch. 2).
 * - A_nco is the amplitude of the NCO output's fundamental, the only component that mixes the input
 *   down to DC: 1 for the full-scale sine; 4/π for the full-scale square wave, whose Fourier series is
 *   sgn(cos θ) = (4/π)(cos θ − cos 3θ/3 + cos 5θ/5 − …) (common practice, no source). So a square NCO
 *   has Kd = 2·A_in/π, 2.1 dB above the sine's A_in/2.
 * - Ko = 2π·gainHzPerUnit rad/s per unit of control: the NCO integrates frequency into phase (G3 Ch. 2).
 */

/** The part of a spec the gain depends on (kept minimal so the schema can use it before parsing ends). */
export interface LoopGainInput {
  readonly input: { readonly amplitude: number };
  readonly nco: { readonly gainHzPerUnit: number; readonly waveform: 'sine' | 'square' };
}

export interface LoopGain {
  /** Detector gain Kd, control units per radian of phase error. */
  readonly kd: number;
  /** NCO gain Ko, rad/s per unit of control. */
  readonly koRadPerSPerUnit: number;
  /** K = Kd·Ko in 1/s (rad/s per rad). */
  readonly kRadPerS: number;
  /** A_nco: amplitude of the NCO output's fundamental (1 sine, 4/π square). */
  readonly ncoFundamentalAmplitude: number;
}

/** Amplitude of the fundamental of the full-scale NCO output, by waveform. */
export function ncoFundamentalAmplitude(waveform: 'sine' | 'square'): number {
  return waveform === 'square' ? 4 / Math.PI : 1;
}

/** Kd, Ko and K = Kd·Ko for a spec. */
export function loopGain(spec: LoopGainInput): LoopGain {
  const aNco = ncoFundamentalAmplitude(spec.nco.waveform);
  const kd = (spec.input.amplitude * aNco) / 2;
  const koRadPerSPerUnit = 2 * Math.PI * spec.nco.gainHzPerUnit;
  return { kd, koRadPerSPerUnit, kRadPerS: kd * koRadPerSPerUnit, ncoFundamentalAmplitude: aNco };
}
