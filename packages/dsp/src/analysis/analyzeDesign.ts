/**
 * The analysis step of planDesign: everything the design editor, the API and a release show for one
 * spec, from the representations the earlier steps derived (the designed filter, the quantised
 * sections, the NCO summary) through responses → margins → closed loop → noise bandwidth → estimates →
 * verdict. Conventions (DESIGN.md): L(s) = Kd·Ko·F(s)/s, Ko = 2π·gainHzPerUnit, Kd = A_in·A_nco/2;
 * discrete L(z) = Kd·F(z)·Ko·T·z⁻¹/(1 − z⁻¹) at sampleRateHz; bilinear s = 2fs(1 − z⁻¹)/(1 + z⁻¹),
 * prewarped at prewarpHz when given. Acquisition measured by simulation (measureAcquisition) is NOT
 * part of this call: it is far slower; the estimates here are the textbook formulas.
 */
import type { ValidSpec, SpecWarning } from '../spec/schema.ts';
import type { AcquisitionEstimates, SteadyStateErrors, StepResponses } from '../types/analysis.ts';
import type { LoopFilterDesign } from '../design.ts';
import { analogDcGain } from '../filters/sections.ts';
import { type LoopGain, loopGain } from './loopGain.ts';
import { analogLoopResponse, closedDbOfOpen, closedLoop, errorDbOfOpen } from './response.ts';
import { logGrid } from './grid.ts';
import { samplePhase, sampleResponse } from './bode.ts';
import { type LoopMargins, loopMargins } from './margins.ts';
import { type ClosedLoopFigures, closedLoopFiguresOfOpen } from './closedLoopFigures.ts';
import { analogClosedLoop } from './loopPolynomials.ts';
import { routhHurwitzStable } from './stability.ts';
import { type NoiseBandwidth, loopNoiseBandwidth } from './noiseBandwidth.ts';
import { secondOrderParameters, phaseMarginFromDampingDeg } from './secondOrder.ts';
import { acquisitionEstimates } from './estimates.ts';
import { steadyStateErrors } from './steadyState.ts';
import { finishStepResponses, stepResponsesJob } from './stepResponse.ts';
import { alongsideFreeResponse } from './wasm/analysisKernel.ts';
import { analysisRange } from './frequencyRange.ts';
import { DEFAULT_POINTS, discreteLoopMargins } from './discreteLoop.ts';
import { type RippleFigures, rippleFigures } from './ripple.ts';
import type { NcoSummary } from './ncoSummary.ts';
import { type QuantizationOutcome, type QuantizationSummary, quantizedLoop } from './quantizedLoop.ts';
import { type AnalysisVerdict, analysisVerdict, analysisWarnings } from './verdict.ts';
import { referenceRtlWarnings } from '../rtl/referenceTiming.ts';
import { type FixedPointReach, fixedPointReach, reachWarnings } from './fixedPointReach.ts';

export interface AnalyzeOptions {
  /** Phase margin the verdict asks for (default 45°, common practice, no source). */
  readonly minPhaseMarginDeg?: number;
  /** Gain margin the verdict asks for (default 6 dB, common practice, no source). */
  readonly minGainMarginDb?: number;
  /** Points of each log grid (default 600). */
  readonly points?: number;
}

export interface BodePlotData {
  /** Shared log grid, ending exactly at fs/2. */
  readonly freqHz: readonly number[];
  readonly analogMagnitudeDb: readonly number[];
  readonly analogPhaseDeg: readonly number[];
  readonly discreteMagnitudeDb: readonly number[];
  readonly discretePhaseDeg: readonly number[];
  /** Closed loop |H| in dB, analog prototype and discrete loop. */
  readonly analogClosedLoopDb: readonly number[];
  readonly discreteClosedLoopDb: readonly number[];
  /** Error transfer |1/(1 + L)| in dB, analog prototype and discrete loop. */
  readonly analogErrorDb: readonly number[];
  readonly discreteErrorDb: readonly number[];
  /** Discrete loop with quantised coefficients; null when quantisation failed. */
  readonly quantizedMagnitudeDb: readonly number[] | null;
  readonly quantizedPhaseDeg: readonly number[] | null;
}

export interface AnalysisResult {
  readonly specName: string;
  readonly loopGain: LoopGain;
  /** 1 + integrators in F (type 1: single-pole, lag-lead, Butterworth; type 2: PI). */
  readonly loopType: number;
  readonly filter: LoopFilterDesign;
  readonly bode: BodePlotData;
  readonly margins: { readonly analog: LoopMargins; readonly discrete: LoopMargins };
  readonly stability: { readonly analogStable: boolean; readonly discreteStable: boolean };
  readonly closedLoop: { readonly analog: ClosedLoopFigures; readonly discrete: ClosedLoopFigures };
  readonly noiseBandwidth: NoiseBandwidth;
  /** Natural frequency/damping of the second-order loop and the phase margin the Og5 formula gives. */
  readonly secondOrder: { readonly naturalHz: number; readonly damping: number; readonly phaseMarginFormulaDeg: number } | null;
  readonly estimates: AcquisitionEstimates;
  /** How far the fixed-point loop can move its NCO and the offset it can hold (null when quantisation failed). */
  readonly fixedPointReach: FixedPointReach | null;
  readonly ripple: RippleFigures;
  readonly steadyState: SteadyStateErrors;
  readonly stepResponses: StepResponses;
  readonly quantization: QuantizationSummary;
  readonly nco: NcoSummary;
  readonly verdict: AnalysisVerdict;
  readonly warnings: readonly SpecWarning[];
}

/** What the analysis starts from: the steps of planDesign before it. */
export interface AnalysisParts {
  readonly filter: LoopFilterDesign;
  readonly quantization: QuantizationOutcome;
  readonly nco: NcoSummary;
}

/** Analyse a valid spec from the parts planDesign derived (nothing is designed or quantised again). */
export function analyzeParts(spec: ValidSpec, specWarnings: readonly SpecWarning[], parts: AnalysisParts, options: AnalyzeOptions = {}): AnalysisResult {
  const minPm = options.minPhaseMarginDeg ?? 45;
  const minGm = options.minGainMarginDb ?? 6;
  const points = options.points ?? DEFAULT_POINTS;
  const gain = loopGain(spec);
  const k = gain.kRadPerS;
  const fs = spec.sampleRateHz;
  const design = parts.filter;
  const loopType = 1 + design.integrators;
  const range = analysisRange(design.analogSections, k, fs);

  const analogFn = analogLoopResponse(design.analogSections, k);
  const analogGrid = logGrid(range.fMinHz, range.fMaxAnalogHz, points);
  const analogOpen = samplePhase(analogFn, analogGrid, loopType);
  const analogMargins = loopMargins(analogFn, analogOpen);
  const analogPolys = analogClosedLoop(design.analog, k);
  const analogStable = routhHurwitzStable(analogPolys.h.den);
  const analogClosed = closedLoopFiguresOfOpen(closedLoop(analogFn), analogGrid, analogOpen, analogStable);

  const discrete = discreteLoopMargins(spec, design.sections, { fMinHz: range.fMinHz, points });
  const plotGrid = discrete.open.freqHz;
  const analogOnPlot = sampleResponse(analogFn, plotGrid, loopType);

  const second = secondOrderParameters(spec, k, design.tau);
  const crossoverHz = discrete.margins.crossoverHz ?? analogMargins.crossoverHz ?? k / (2 * Math.PI);
  const dampingForSpan = Math.min(Math.max(second?.damping ?? 0.5, 0.1), 1);
  const durationS = 3 / (crossoverHz * dampingForSpan);
  const steps = stepResponsesJob(design.sections, analogPolys.e, k, fs, durationS);
  // The quantised loop on the same grid (the same fMin, points and fs/2), made once; its noise analysis's
  // free response runs with the step responses beside it (alongsideFreeResponse: two independent loops).
  const quantization = alongsideFreeResponse(steps.kernel, () => quantizedLoop(spec, parts.quantization, parts.nco.control, { fMinHz: range.fMinHz, points, freqHz: plotGrid }));
  const dcGain = analogDcGain(design.analogSections);
  const bode: BodePlotData = {
    freqHz: plotGrid,
    analogMagnitudeDb: analogOnPlot.magnitudeDb,
    analogPhaseDeg: analogOnPlot.phaseDeg,
    discreteMagnitudeDb: discrete.open.magnitudeDb,
    discretePhaseDeg: discrete.open.phaseDeg,
    analogClosedLoopDb: closedDbOfOpen(analogOnPlot),
    discreteClosedLoopDb: discrete.closedDb!,
    analogErrorDb: errorDbOfOpen(analogOnPlot),
    discreteErrorDb: errorDbOfOpen(discrete.open),
    quantizedMagnitudeDb: quantization.open?.magnitudeDb ?? null,
    quantizedPhaseDeg: quantization.open?.phaseDeg ?? null,
  };
  const noiseBandwidth = loopNoiseBandwidth(spec, design, k, range, second, { analog: analogStable, discrete: discrete.stable });
  const nco = parts.nco;
  const verdict = analysisVerdict(discrete, quantization.summary, nco, analogStable, minPm, minGm);
  const estimates = acquisitionEstimates(second, k, dcGain);
  const reach = fixedPointReach({ spec, sections: design.sections, kd: gain.kd, datapath: quantization.summary.datapath, tunedCenterHz: nco.tuning.actualHz, estimates });
  return {
    specName: spec.name,
    loopGain: gain,
    loopType,
    filter: design,
    bode,
    margins: { analog: analogMargins, discrete: discrete.margins },
    stability: { analogStable, discreteStable: discrete.stable },
    closedLoop: { analog: analogClosed, discrete: discrete.closedLoop! },
    noiseBandwidth,
    secondOrder: second
      ? { naturalHz: second.naturalHz, damping: second.damping, phaseMarginFormulaDeg: phaseMarginFromDampingDeg(second.damping) }
      : null,
    estimates,
    fixedPointReach: reach,
    ripple: rippleFigures(spec, design, gain),
    steadyState: steadyStateErrors(loopType, k, dcGain, spec.filter.kind === 'pi' ? (design.tau?.tau1S ?? null) : null),
    stepResponses: finishStepResponses(steps),
    quantization: quantization.summary,
    nco,
    verdict,
    warnings: [...specWarnings, ...analysisWarnings(spec, discrete, analogMargins), ...referenceRtlWarnings(spec, design.sections.length), ...reachWarnings(reach, estimates)],
  };
}

