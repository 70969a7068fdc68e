/** Simulation types (src/sim, src/vectors, src/analysis/acquisitionSim.ts). */
import type { NcoControlScaling, NcoTuning } from './nco.ts';
import type { OverflowMode, RoundingMode } from './fixed.ts';

export type { Scenario, ScenarioKind, ScenarioIssue, ParseScenarioResult } from '../spec/scenario.ts';

/** The integer constants of the bit-true loop (README, "Bit-true arithmetic"). */
export interface BitTruePlan {
  readonly sampleRateHz: number;
  readonly centerHz: number;
  /** D: input, detector, section outputs and filter output are D-bit codes with D − 1 fraction bits. */
  readonly dataBits: number;
  /** Wc: the coefficient word (fixedPoint.coefficientBits), also the word of the control gain code G. */
  readonly coefficientBits: number;
  /** Fc: fraction bits of every coefficient code (resolved when the spec said "auto"). */
  readonly coefficientFractionBits: number;
  /** Wa: the loop filter's multiply-accumulate (MAC) word, fixedPoint.accumulatorBits. */
  readonly accumulatorBits: number;
  readonly rounding: RoundingMode;
  readonly overflow: OverflowMode;
  /** N: the NCO's phase accumulator, nco.accumulatorBits. */
  readonly ncoAccumulatorBits: number;
  /** P: sine-table address bits. */
  readonly phaseBits: number;
  /** B: sine-table code bits. */
  readonly amplitudeBits: number;
  readonly waveform: 'sine' | 'square';
  readonly gainHzPerUnit: number;
  readonly sectionCount: number;
  /** b0, b1, b2, a1, a2 of each section in order. */
  readonly coefficientCodes: readonly number[];
  readonly tuning: NcoTuning;
  readonly control: NcoControlScaling;
  readonly sineTable: Int32Array;
  /** 2^(B−1) − 1. */
  readonly ncoFullScale: number;
}

/** Per-sample bit-true record (the golden vectors), typed arrays of equal length. */
export interface BitTrueRecord {
  readonly length: number;
  readonly inputCode: Int32Array;
  /** Phase accumulator at the sample (before it advances): hi·2^32 + lo. */
  readonly phaseHi: Uint32Array;
  readonly phaseLo: Uint32Array;
  /** Sine-table address of the NCO output (after the quarter-wave offset for cos). */
  readonly tableAddress: Int32Array;
  readonly ncoCode: Int32Array;
  readonly detectorCode: Int32Array;
  readonly filterCode: Int32Array;
}

/** Min/max per bucket over consecutive samples; bucket k starts at bucketStartS[k]. */
export interface DecimatedTrace {
  readonly bucketStartS: Float64Array;
  readonly min: Float64Array;
  readonly max: Float64Array;
}

export interface SimTraces {
  /** θe = θi − θo in rad, wrapped to (−π, π]. */
  readonly phaseErrorRad: DecimatedTrace;
  /** Loop-filter output in control units (the demodulated signal; × gainHzPerUnit = Hz). */
  readonly filterOutput: DecimatedTrace;
  readonly ncoFrequencyHz: DecimatedTrace;
  /** Quadrature lock indicator ≈ cos θe (1 locked in phase, ≈ 0 not locked). */
  readonly lockIndicator: DecimatedTrace;
}

export interface SimMetrics {
  /** Time after which the smoothed phase error stays within lockToleranceRad of its final value; null if never. */
  readonly lockTimeS: number | null;
  readonly locked: boolean;
  readonly lockToleranceRad: number;
  /** Mean phase error over the last 10 % of the run, degrees in (−180, 180]. */
  readonly steadyStatePhaseErrorDeg: number;
  /** RMS of the phase error about that mean over the same span, degrees. */
  readonly steadyStatePhaseJitterDeg: number;
  /** Whole cycles slipped over the run (net change of the unwrapped phase error / 2π, rounded). */
  readonly cycleSlips: number;
  /** Mean NCO frequency minus input frequency over the last 10 %, Hz. */
  readonly finalFrequencyErrorHz: number;
  /** RMS of filterOutput·gainHzPerUnit − the scenario's frequency offset over the second half, Hz. */
  readonly demodErrorRmsHz: number;
  /** demodErrorRmsHz / deviationHz for FM (null otherwise). */
  readonly demodErrorRelative: number | null;
}

export interface SimFullTraces {
  readonly phaseErrorRad: Float64Array;
  readonly filterOutput: Float64Array;
  readonly ncoFrequencyHz: Float64Array;
  readonly offsetHz: Float64Array;
}

export interface SimRun {
  readonly traces: SimTraces;
  readonly metrics: SimMetrics;
  /** Every sample, when options.fullTraces was set (runs up to MAX_FULL_TRACE_SAMPLES). */
  readonly full?: SimFullTraces;
}

export interface BitTrueRun extends SimRun {
  /** FNV-1a over the 32-bit words of each sample's record (README, "Golden vectors"). */
  readonly checksum: number;
  readonly record?: BitTrueRecord;
}

export interface SimResult {
  readonly sampleCount: number;
  readonly sampleRateHz: number;
  readonly durationS: number;
  readonly float?: SimRun;
  readonly bitTrue?: BitTrueRun;
  readonly plan?: BitTruePlan;
}

/** Something with an `aborted` flag, like AbortSignal; checked once per chunk. */
export interface AbortFlag {
  readonly aborted: boolean;
}

export interface SimOptions {
  /** Which loops to run (default both). */
  readonly mode?: 'both' | 'float' | 'bit-true';
  /** Buckets of the decimated traces (default 1000). */
  readonly buckets?: number;
  /** Called after each chunk with the fraction done in (0, 1]. */
  readonly onProgress?: (fraction: number) => void;
  readonly signal?: AbortFlag;
  readonly fullTraces?: boolean;
  /** Keep the per-sample bit-true record (golden vectors). */
  readonly keepRecord?: boolean;
  /** Lock tolerance in rad (default 0.1). */
  readonly lockToleranceRad?: number;
  /**
   * Which implementation runs the bit-true loop: the WebAssembly kernel (default where WebAssembly
   * can be compiled) or the TypeScript one. Both give the same record bit for bit.
   */
  readonly bitTrueKernel?: BitTrueKernelChoice;
}

export type BitTrueKernelChoice = 'wasm' | 'typescript';
export type { GoldenVectors } from '../vectors/goldenVectors.ts';
export type { VectorCsvColumn } from '../vectors/vectorsCsv.ts';

/** One acquisition figure measured by simulation of the nonlinear float loop. */
export interface AcquisitionMeasurement {
  /** The measured frequency offset in Hz (bisection midpoint), or null when even the smallest offset failed. */
  readonly valueHz: number | null;
  /** True when the loop still passed at the search limit: the true figure is at least valueHz. */
  readonly atSearchLimit: boolean;
  /** Bisection bracket [passHz, failHz] (failHz null at the limit). */
  readonly passHz: number;
  readonly failHz: number | null;
  /** How the figure was measured, in words. */
  readonly definition: string;
}

export interface AcquisitionSimResult {
  /** Distinguishes these from the formula estimates of the analysis (label "estimate"). */
  readonly label: 'simulated';
  readonly lockInHz: AcquisitionMeasurement;
  readonly pullOutHz: AcquisitionMeasurement;
  readonly holdInHz: AcquisitionMeasurement;
  readonly pullInHz: AcquisitionMeasurement;
  /** Offsets searched in [0, searchLimitHz]. */
  readonly searchLimitHz: number;
  readonly initialPhasesDeg: readonly number[];
  readonly runs: number;
  readonly samplesSimulated: number;
  /** True when the sample budget ran out and later searches were cut short. */
  readonly budgetExhausted: boolean;
  readonly notes: readonly string[];
}

export interface AcquisitionOptions {
  /** Total samples the search may simulate (default 2 000 000: a few hundred ms). */
  readonly maxSamples?: number;
  /** Bisection steps per figure (default 7: 1/128 of the search limit). */
  readonly bisectionSteps?: number;
  readonly initialPhasesDeg?: readonly number[];
  readonly onProgress?: (fraction: number) => void;
  readonly signal?: AbortFlag;
}
export type { VectorComparison, VectorMismatch } from '../vectors/compareVectors.ts';
export type { JsonSimResult, JsonSimRun, JsonTrace } from '../sim/simResultJson.ts';
export type { SignalFormat, BitTrueParts } from '../sim/bitTruePlan.ts';
export type { SimLoop, SimSpec } from '../sim/simulate.ts';
