/**
 * Closed-loop step responses of the linearised loop for plotting: the phase error θi − θo after a
 * 1 rad phase step and after a 1 Hz frequency step (input phase 2π·t), from E = 1/(1 + L).
 * The discrete loop is run sample by sample when the plot spans at most MAX_SAMPLES loop samples;
 * otherwise the analog prototype's E(s) is discretised by the bilinear transform at a rate giving
 * MAX_SAMPLES samples over the span (source: "analog").
 */
import type { AnalogTf, DigitalTf } from '../types/filter.ts';
import type { StepResponses } from '../types/analysis.ts';
import { bilinearTf } from '../filters/bilinear.ts';
import { runFilter } from './filterRun.ts';

export const MAX_SAMPLES = 20_000;
export const PLOT_POINTS = 400;
/** Phase errors beyond this (rad) end the traces of an unstable loop (flagged `diverged`). */
export const DIVERGED_RAD = 1e6;

/** Step responses over durationS seconds from the error transfer functions E(z) and E(s). */
export function stepResponses(
  discreteE: DigitalTf,
  analogE: AnalogTf,
  sampleRateHz: number,
  durationS: number,
): StepResponses {
  const loopSamples = Math.ceil(durationS * sampleRateHz);
  const useDiscrete = loopSamples <= MAX_SAMPLES;
  const rateHz = useDiscrete ? sampleRateHz : MAX_SAMPLES / durationS;
  const e = useDiscrete ? discreteE : bilinearTf(analogE, rateHz, null);
  const n = useDiscrete ? loopSamples : MAX_SAMPLES;
  const stride = Math.max(1, Math.floor(n / PLOT_POINTS));
  const t = 1 / rateHz;
  // E is linear and the 1 Hz frequency step's phase 2π·t is the running sum of 2π·T-high steps, so
  // its response is the running sum of the phase-step response scaled by 2π·T: one filter run for both.
  const phase = runFilter(e, n, () => 1, 1);
  const phaseStepErrorRad: number[] = [];
  const frequencyStepErrorRad: number[] = [];
  const timeS: number[] = [];
  let acc = 0;
  let diverged = false;
  for (let i = 0; i < n; i++) {
    acc += phase[i]! * 2 * Math.PI * t;
    if (!(Math.abs(acc) < DIVERGED_RAD && Math.abs(phase[i]!) < DIVERGED_RAD)) {
      diverged = true; // an unstable loop: the linear model means nothing past here
      break;
    }
    if (i % stride !== 0) continue;
    timeS.push(i * t);
    phaseStepErrorRad.push(phase[i]!);
    frequencyStepErrorRad.push(acc - phase[i]! * 2 * Math.PI * t);
  }
  return { source: useDiscrete ? 'discrete' : 'analog', timeS, phaseStepErrorRad, frequencyStepErrorRad, diverged };
}
