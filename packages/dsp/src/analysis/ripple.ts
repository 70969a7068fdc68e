/**
 * The multiplier detector's sum-frequency term: A·sin(a)·B·cos(b) = (AB/2)[sin(a−b) + sin(a+b)], so the
 * detector output carries a ripple of amplitude Kd at 2·centerHz (common practice; REFERENCES.md).
 * Reported: the loop filter's attenuation of it (analog and discrete — the discrete response is
 * periodic in fs, so an aliased ripple is evaluated where it lands), its amplitude at the filter output,
 * and the NCO phase ripple it leaves through the closed loop.
 */
import type { LoopSpec } from '../spec/schema.ts';
import type { LoopFilterDesign } from '../design.ts';
import type { LoopGain } from './loopGain.ts';
import { analogLoopResponse, analogResponse, closedLoop, digitalResponse, discreteLoopResponse, toDb } from './response.ts';

export interface RippleFigures {
  /** 2·centerHz, the multiplier detector's sum-frequency term. */
  readonly rippleHz: number;
  /** Where the ripple lands in the discrete loop after sampling (|2fc − k·fs|). */
  readonly aliasedRippleHz: number;
  /** −20·log10|F| at the ripple: attenuation by the loop filter (with ripple filter), dB. */
  readonly analogAttenuationDb: number;
  readonly discreteAttenuationDb: number;
  /** Ripple amplitude at the filter output, control units: Kd·|F| (detector ripple amplitude Kd). */
  readonly analogFilterOutputAmplitude: number;
  readonly discreteFilterOutputAmplitude: number;
  /** Resulting NCO phase ripple ≈ |H| at the ripple frequency (degrees peak), closed loop. */
  readonly analogPhaseRippleDeg: number;
  readonly discretePhaseRippleDeg: number;
}

/** The 2·centerHz ripple figures of a designed loop filter. */
/** |c| (a module function rather than a named closure per call: loopFilter.ts, withRipple). */
function mag(c: { re: number; im: number }): number {
  return Math.hypot(c.re, c.im);
}

export function rippleFigures(spec: LoopSpec, design: LoopFilterDesign, gain: LoopGain): RippleFigures {
  const fs = spec.sampleRateHz;
  const rippleHz = 2 * spec.centerHz;
  const aliasedRippleHz = Math.abs(rippleHz - fs * Math.round(rippleHz / fs));
  const fa = analogResponse(design.analogSections, rippleHz);
  const fd = digitalResponse(design.sections, rippleHz, fs);
  const ha = closedLoop(analogLoopResponse(design.analogSections, gain.kRadPerS))(rippleHz);
  const hd = closedLoop(discreteLoopResponse(design.sections, gain.kRadPerS, fs))(rippleHz);
  return {
    rippleHz,
    aliasedRippleHz,
    analogAttenuationDb: -toDb(fa),
    discreteAttenuationDb: -toDb(fd),
    analogFilterOutputAmplitude: gain.kd * mag(fa),
    discreteFilterOutputAmplitude: gain.kd * mag(fd),
    analogPhaseRippleDeg: (mag(ha) * 180) / Math.PI,
    discretePhaseRippleDeg: (mag(hd) * 180) / Math.PI,
  };
}

