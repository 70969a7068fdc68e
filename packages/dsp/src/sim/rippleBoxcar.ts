/**
 * Length of a boxcar over one period of the detector's 2·centerHz ripple, which removes that ripple
 * from a settle or lock test (a multiplier detector's sum-frequency term; common practice, no source).
 * A boxcar longer than the run never fills and averages the same samples as one of the run's length,
 * so it is cut there: a centerHz of 1e-4 Hz would otherwise ask for ~1e11 entries.
 */
export function rippleBoxcarSamples(sampleRateHz: number, centerHz: number, runSamples: number): number {
  return Math.max(1, Math.min(runSamples, Math.round(sampleRateHz / (2 * centerHz))));
}
