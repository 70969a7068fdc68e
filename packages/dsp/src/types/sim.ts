/** Simulation types (src/sim, src/vectors, src/analysis/acquisitionSim.ts). */
import type { NcoControlScaling, NcoTuning } from './nco.ts';
import type { OverflowMode, RoundingMode } from './fixed.ts';
import type { SpecWarning } from '../spec/schema.ts';

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
  /** Input frequency centerHz + the scenario's offset (sweep scenarios only, beside ncoFrequencyHz). */
  readonly inputFrequencyHz?: DecimatedTrace;
}

/**
 * Where a sweep lost and regained lock (src/sim/sweepMetrics.ts). A cycle slips when the ripple-free
 * phase error crosses an odd multiple of π (the multiplier detector's unstable equilibria, G3 Ch. 2);
 * lock is lost where the error last left the stable half-cycle |θe − 2πk| < π/2 before the way out's
 * first slip, and regained where it first re-entered it after the run's last slip.
 */
export interface SweepMetrics {
  /** Time the input turns back toward fromHz. */
  readonly turnS: number;
  /** Input offset where lock was lost going out; null when no cycle slipped before the turn. */
  readonly lockLostHz: number | null;
  readonly lockLostS: number | null;
  /**
   * Input offset where lock was regained after the run's last slip (normally on the way back); null when
   * lock was never lost or the run does not end locked.
   */
  readonly lockRegainedHz: number | null;
  readonly lockRegainedS: number | null;
  /** Cycles slipped before and after the turn. */
  readonly slipsOut: number;
  readonly slipsBack: number;
  /** No cycle slipped over the whole run. */
  readonly heldThroughout: boolean;
}

export interface SimMetrics {
  /**
   * When the ripple-free phase error, less the tracking error the designed loop has under the
   * scenario's FM, enters ±lockToleranceRad of its final value for good (src/sim/lockMetric.ts,
   * LOCK_DEFINITION); the same for any run long enough to show it. null when not locked.
   */
  readonly lockTimeS: number | null;
  /** The band held from lockTimeS to the end, for at least the last tenth of the run and six loop time constants. */
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
  /** Sweep scenarios only: where lock was lost going out and regained coming back. */
  readonly sweep?: SweepMetrics;
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
  /** What the scenario asks beyond the planned loop's reach (simulatePlan: analysis/fixedPointReach.ts), naming the scenario field. */
  readonly warnings?: readonly SpecWarning[];
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
   * Which implementation runs the simulation: the WebAssembly module (default where WebAssembly can
   * be compiled; its bit-true kernel, and the float loop and trace accumulators where they fit, see
   * sim/wasm/wasmTraced.ts) or TypeScript throughout. Both give the same record, traces and metrics
   * bit for bit.
   */
  readonly bitTrueKernel?: BitTrueKernelChoice;
}

export type BitTrueKernelChoice = 'wasm' | 'typescript';
export type { GoldenVectors } from '../vectors/goldenVectors.ts';
export type { VectorCsvColumn } from '../vectors/vectorsCsv.ts';

/**
 * Why a measured acquisition figure has no value: the loop still passed at the search limit (the
 * bit-true control word's range ±gainHzPerUnit, or the search range 1.5·K·F(0)), the sample budget was
 * spent, or the bisection's step limit came before the bracket was tight.
 */
export type AcquisitionLimit = 'control-range' | 'search-range' | 'sample-budget' | 'bisection-steps';

/** One acquisition figure measured by simulation of the nonlinear float loop. */
export interface AcquisitionMeasurement {
  /**
   * The measured frequency offset in Hz (the bracket's midpoint), or null when the search hit a limit
   * (limitedBy) or even the smallest offset failed: a limit is never reported as a figure.
   */
  readonly valueHz: number | null;
  /** The bracket [passHz, failHz]: the largest offset seen to pass, the smallest seen to fail (null: none failed). */
  readonly passHz: number;
  readonly failHz: number | null;
  /** The width the bracket aimed for: max(relativeTolerance·passHz, floorToleranceHz). */
  readonly toleranceHz: number;
  /** The limit the search hit, or null when the bracket is within its tolerance. */
  readonly limitedBy: AcquisitionLimit | null;
  /** True when the loop still passed at the search limit: the true figure is at least passHz. */
  readonly atSearchLimit: boolean;
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
  /** Offsets searched in [0, searchLimitHz]; searchLimitKind says what bounds it. */
  readonly searchLimitHz: number;
  readonly searchLimitKind: 'control-range' | 'search-range';
  readonly relativeTolerance: number;
  readonly floorToleranceHz: number;
  readonly initialPhasesDeg: readonly number[];
  readonly runs: number;
  readonly samplesSimulated: number;
  readonly sampleBudget: number;
  /** True when the sample budget ran out and later searches were cut short. */
  readonly budgetExhausted: boolean;
  readonly notes: readonly string[];
}

export type AcquisitionFigureKey = 'lockInHz' | 'pullOutHz' | 'holdInHz' | 'pullInHz';

/** One acquisition figure as estimate and as measurement (src/analysis/acquisitionReport.ts). */
export interface AcquisitionFigureRow {
  readonly key: AcquisitionFigureKey;
  /** lock-in, pull-out, hold-in, pull-in. */
  readonly name: string;
  readonly estimate: { readonly label: 'estimate'; readonly valueHz: number | null; readonly formula: string };
  readonly measured: AcquisitionMeasurement & { readonly label: 'simulated' };
  /** estimate / measured where both exist (Ku23: up to 2x either way). */
  readonly estimateOverMeasured: number | null;
}

/** Every figure side by side, how the search ran, and the estimates' notes. */
export interface AcquisitionComparison {
  readonly figures: readonly AcquisitionFigureRow[];
  readonly search: Omit<AcquisitionSimResult, AcquisitionFigureKey>;
  readonly estimateNotes: readonly string[];
}

export interface AcquisitionOptions {
  /** Total samples the search may simulate (default DEFAULT_ACQUISITION_SAMPLES, 4·10^6: about 0.5 s). */
  readonly maxSamples?: number;
  /** Most bisection steps per figure (default 20); the bracket usually reaches its tolerance sooner. */
  readonly bisectionSteps?: number;
  /** Bracket target relative to the figure (default 0.01) and its floor in Hz (default 0.5). */
  readonly relativeTolerance?: number;
  readonly floorToleranceHz?: number;
  readonly initialPhasesDeg?: readonly number[];
  readonly onProgress?: (fraction: number) => void;
  readonly signal?: AbortFlag;
}
export type { VectorComparison, VectorMismatch } from '../vectors/compareVectors.ts';
export type { JsonSimResult, JsonSimRun, JsonTrace } from '../sim/simResultJson.ts';
export type { SignalFormat, BitTrueParts } from '../sim/bitTruePlan.ts';
export type { SimLoop, SimSpec } from '../sim/simulate.ts';
