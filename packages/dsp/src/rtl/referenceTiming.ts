/**
 * Timing of the reference RTL every release ships (templates/rtl-loop.vhd.hbs, rtl-loop.v.hbs): a
 * sequential architecture that time-shares one multiplier per second-order section. Per loop update,
 * counted in clock edges from the one that samples sample_strobe:
 *   1 edge   detector: u = reduce_D(round_(B−1)(x·c)) into its register;
 *   6 edges  per section, in cascade: five multiply-accumulates (b0·v, b1·x1, b2·x2, −a1·y1, −a2·y2)
 *            and one edge to round, reduce and update the state;
 *   1 edge   NCO: phase += M + round_S(y·G); valid rises with this edge;
 *   1 edge   the sine table's output register reads the new phase, ready for the next strobe.
 * So a strobe may come every 6·S + 3 clocks at the fastest and valid follows the strobe by 6·S + 1.
 * The figures are a property of our own templates (no outside source); the RTL tests prove them by
 * strobing every cyclesPerSample clocks (bit-exact) and every cyclesPerSample − 1 (a mismatch).
 */
import type { SpecWarning } from '../spec/schema.ts';
import type { ReferenceRtlTiming } from '../types/rtl.ts';

const CLOCKS_PER_SECTION = 6;

export function referenceRtlTiming(sectionCount: number): ReferenceRtlTiming {
  if (!Number.isInteger(sectionCount) || sectionCount < 1) throw new RangeError(`sectionCount must be a whole number ≥ 1, got ${sectionCount}`);
  return {
    sectionCount,
    cyclesPerSample: CLOCKS_PER_SECTION * sectionCount + 3,
    latencyCycles: CLOCKS_PER_SECTION * sectionCount + 1,
    multipliers: sectionCount + 2,
  };
}

/** Whole fabric clocks between two loop updates, floor(clockHz / sampleRateHz). */
export function clocksPerUpdate(clockHz: number, sampleRateHz: number): number {
  return Math.floor(clockHz / sampleRateHz);
}

/** A warning naming clockHz when the fabric clock leaves fewer clocks per update than the reference RTL needs. */
export function referenceRtlWarnings(spec: { readonly clockHz: number; readonly sampleRateHz: number }, sectionCount: number): SpecWarning[] {
  const timing = referenceRtlTiming(sectionCount);
  const available = clocksPerUpdate(spec.clockHz, spec.sampleRateHz);
  if (available >= timing.cyclesPerSample) return [];
  return [
    {
      field: 'clockHz',
      message: `clockHz/sampleRateHz leaves ${available} clock${available === 1 ? '' : 's'} per loop update, but the release's reference RTL needs ${timing.cyclesPerSample} (6 per second-order section × ${sectionCount} + 3): it cannot run at this rate as shipped. Raise clockHz to at least ${timing.cyclesPerSample * spec.sampleRateHz} Hz, lower sampleRateHz, or implement a parallel/pipelined loop (the reference RTL still proves bit-exactness in simulation)`,
    },
  ];
}
