/**
 * Result types of the loop analysis (src/analysis, analyzeDesign). Frequencies in Hz, phases in degrees,
 * gains in dB, times in seconds, phase errors in radians. A figure that does not exist (a margin that is
 * unbounded, a range that is infinite) is null with a reason in the matching `notes`; results never hold
 * NaN or ±Infinity, so they survive JSON.
 */
export type { BodeData } from '../analysis/bode.ts';
export type { LoopMargins, PhaseCrossing } from '../analysis/margins.ts';
export type { ClosedLoopFigures } from '../analysis/closedLoopFigures.ts';
export type { LoopFilterDesign } from '../design.ts';
export type { DiscreteLoopAnalysis, DiscreteLoopOptions } from '../analysis/discreteLoop.ts';
export type { WordLengthOptions, WordLengthResult, CoefficientWidthPoint, DataWidthPoint } from '../wordlength/wordLengthSearch.ts';
export type { AnalysisResult, AnalyzeOptions, BodePlotData } from '../analysis/analyzeDesign.ts';
export type { AnalysisVerdict } from '../analysis/verdict.ts';
export type { NcoSummary } from '../analysis/ncoSummary.ts';
export type { QuantizationSummary } from '../analysis/quantizedLoop.ts';
export type { NoiseBandwidth } from '../analysis/noiseBandwidth.ts';
export type { RippleFigures } from '../analysis/ripple.ts';
export type { DatapathFigures } from '../analysis/datapath.ts';
export type { DatapathNoise, DatapathNoiseInput, RoundoffPoint, RoundoffPointKind, SectionScaling } from '../analysis/datapathNoise.ts';
export type { RoundoffStatistics } from '../fixed/roundoffStatistics.ts';
export type { FixedPointReach } from '../analysis/fixedPointReach.ts';
export type { DesignPlan, PlanOptions, PlanDesignResult } from '../planDesign.ts';

export interface AcquisitionEstimates {
  /** ≈ 2ζωn/(2π) (G3, B6), capped at the hold-in range for a type-1 loop; lockInRadPerS in rad/s. */
  readonly lockInHz: number | null;
  readonly lockInRadPerS: number | null;
  /** 2ζωn/(2π) itself, before the cap. */
  readonly lockInFormulaHz: number | null;
  /** K·F(0)/(2π); null for a PI loop (infinite). holdInRadPerS = K·F(0). */
  readonly holdInHz: number | null;
  readonly holdInRadPerS: number | null;
  /** ≈ 1.8ωn(ζ+1)/(2π) (B6), capped at the hold-in range for a type-1 loop; pullOutRadPerS in rad/s. */
  readonly pullOutHz: number | null;
  readonly pullOutRadPerS: number | null;
  /** 1.8ωn(ζ+1)/(2π) itself, before the cap. */
  readonly pullOutFormulaHz: number | null;
  /** Pull-in time TP ≈ c·Δf² for an initial offset Δf in Hz; this is c = (2π)²/(2ζωn³) in s/Hz². */
  readonly pullInTimeSPerHz2: number | null;
  /** Always "estimate": textbook formulas, off by up to 2x against simulation (Ku23). */
  readonly label: 'estimate';
  readonly notes: readonly string[];
}

export interface SteadyStateErrors {
  /** After a phase step: 0 (linear loop, final-value theorem). */
  readonly phaseStepRad: number;
  /** Phase error per Hz of frequency step: 2π/(K·F(0)) for type 1, 0 for type 2 (linear; asin for the detector). */
  readonly frequencyStepRadPerHz: number;
  /** Phase error per Hz/s of frequency ramp: 2π/ωn² for type 2; null (unbounded) for type 1. */
  readonly frequencyRampRadPerHzPerS: number | null;
  readonly notes: readonly string[];
}

export interface StepResponses {
  /** "discrete": the loop as implemented at sampleRateHz; "analog": the analog prototype (long spans). */
  readonly source: 'discrete' | 'analog';
  readonly timeS: readonly number[];
  /** Phase error after a 1 rad phase step at t = 0. */
  readonly phaseStepErrorRad: readonly number[];
  /** Phase error after a 1 Hz frequency step at t = 0. */
  readonly frequencyStepErrorRad: readonly number[];
  /** True when the traces were cut short because the (unstable) loop's error grew past 1e6 rad. */
  readonly diverged: boolean;
}
