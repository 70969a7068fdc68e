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
  const phaseStepErrorRad = runFilter(e, n, () => 1, stride);
  const frequencyStepErrorRad = runFilter(e, n, (i) => 2 * Math.PI * i * t, stride);
  const timeS = phaseStepErrorRad.map((_, k) => k * stride * t);
  return { source: useDiscrete ? 'discrete' : 'analog', timeS, phaseStepErrorRad, frequencyStepErrorRad };
}
