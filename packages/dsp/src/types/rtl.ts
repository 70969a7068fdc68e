/** Reference RTL types (src/rtl): the timing of the architecture every release ships. */

export interface ReferenceRtlTiming {
  readonly sectionCount: number;
  /** Fewest clocks between two sample strobes. */
  readonly cyclesPerSample: number;
  /** Clocks from the edge that samples sample_strobe to the edge after which valid is high. */
  readonly latencyCycles: number;
  /** Multipliers of the architecture: the detector, one per section, the NCO control scaling. */
  readonly multipliers: number;
}
