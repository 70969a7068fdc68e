/**
 * analyzeDesign: everything the design editor, the API and a release show for one spec, composed from
 * the pipeline steps (design → responses → margins → closed loop → noise bandwidth → estimates →
 * quantisation). Conventions (DESIGN.md): L(s) = Kd·Ko·F(s)/s, Ko = 2π·gainHzPerUnit, Kd = A_in·A_nco/2;
 * discrete L(z) = Kd·F(z)·Ko·T·z⁻¹/(1 − z⁻¹) at sampleRateHz; bilinear s = 2fs(1 − z⁻¹)/(1 + z⁻¹),
 * prewarped at prewarpHz when given. Acquisition measured by simulation (measureAcquisition) is NOT
 * part of this call: it is far slower; the estimates here are the textbook formulas.
 */
import type { LoopSpec, SpecIssue, SpecWarning } from '../spec/schema.ts';
import { parseLoopSpec } from '../spec/schema.ts';
import type { AcquisitionEstimates, SteadyStateErrors, StepResponses } from '../types/analysis.ts';
import type { QuantizedFilter } from '../types/fixed.ts';
import { type LoopFilterDesign, designLoopFilter } from '../design.ts';
import { type LoopGain, loopGain } from './loopGain.ts';
import { analogLoopResponse, analogResponse, closedFromOpen, closedLoop, digitalResponse, discreteLoopResponse, toDb } from './response.ts';
import { logGrid } from './grid.ts';
import { sampleResponse } from './bode.ts';
import { type LoopMargins, loopMargins } from './margins.ts';
import { type ClosedLoopFigures, closedLoopFigures } from './closedLoopFigures.ts';
import { analogClosedLoop, discreteClosedLoop } from './loopPolynomials.ts';
import { routhHurwitzStable } from './stability.ts';
import { highGainNoiseBandwidthHz, numericNoiseBandwidthHz, secondOrderNoiseBandwidthHz } from './noiseBandwidth.ts';
import { secondOrderParameters, phaseMarginFromDampingDeg } from './secondOrder.ts';
import { acquisitionEstimates } from './estimates.ts';
import { steadyStateErrors } from './steadyState.ts';
import { stepResponses } from './stepResponse.ts';
import { analysisRange } from './frequencyRange.ts';
import { DEFAULT_POINTS, type DiscreteLoopAnalysis, discreteLoopMargins } from './discreteLoop.ts';
import { quantizeSections } from '../fixed/quantizeSections.ts';
import { FieldError } from '../fixed/fieldError.ts';
import { ncoTuning } from '../nco/tuningWord.ts';
import { ncoSpectralEstimates } from '../nco/spectralEstimates.ts';
import { ncoControlScaling } from '../nco/controlScaling.ts';
import type { NcoControlScaling, NcoSpectralEstimates, NcoTuning } from '../types/nco.ts';

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
  /** Discrete loop with quantised coefficients; null when quantisation failed. */
  readonly quantizedMagnitudeDb: readonly number[] | null;
  readonly quantizedPhaseDeg: readonly number[] | null;
}

export interface NoiseBandwidth {
  /** ∫₀^∞ |H(j2πf)|² df of the analog prototype loop (closed form when second order). */
  readonly analogHz: number;
  readonly analogMethod: 'closed-form' | 'numeric';
  /** ∫₀^{fs/2} |H(e^{j2πf/fs})|² df of the discrete loop (numeric). */
  readonly discreteHz: number;
  /** (ωn/2)(ζ + 1/(4ζ)): the high-gain approximation, exact for PI only; null when ωn, ζ do not apply. */
  readonly highGainApproximationHz: number | null;
}

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

export interface QuantizationSummary {
  readonly filter: QuantizedFilter | null;
  readonly error: { readonly field: string; readonly message: string } | null;
  readonly loop: {
    readonly margins: LoopMargins;
    readonly stable: boolean;
    readonly closedLoop: ClosedLoopFigures | null;
  } | null;
}

/** The NCO at the loop rate: tuning word (TRG71), spur/SNR estimates (NS87, Be48), control scaling. */
export interface NcoSummary {
  readonly tuning: NcoTuning;
  readonly spectral: NcoSpectralEstimates;
  /** Control word to tuning increment; null with controlError when the widths cannot represent it. */
  readonly control: NcoControlScaling | null;
  readonly controlError: { readonly field: string; readonly message: string } | null;
}

export interface AnalysisVerdict {
  readonly stable: boolean;
  readonly marginsMet: boolean;
  readonly minPhaseMarginDeg: number;
  readonly minGainMarginDb: number;
  readonly reasons: readonly string[];
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
  readonly ripple: RippleFigures;
  readonly steadyState: SteadyStateErrors;
  readonly stepResponses: StepResponses;
  readonly quantization: QuantizationSummary;
  readonly nco: NcoSummary;
  readonly verdict: AnalysisVerdict;
  readonly warnings: readonly SpecWarning[];
}

/** Thrown by analyzeDesign for a spec that fails parseLoopSpec; carries every field issue. */
export class LoopSpecError extends Error {
  readonly issues: readonly SpecIssue[];
  readonly field: string;
  constructor(issues: readonly SpecIssue[]) {
    super(issues.map((i) => i.message).join('; '));
    this.name = 'LoopSpecError';
    this.issues = issues;
    this.field = issues[0]?.field ?? '';
  }
}

/** Validate and analyse; never throws: bad input gives the field issues. */
export function tryAnalyzeDesign(
  input: unknown,
  options: AnalyzeOptions = {},
): { readonly ok: true; readonly result: AnalysisResult } | { readonly ok: false; readonly issues: readonly SpecIssue[] } {
  const parsed = parseLoopSpec(input);
  if (!parsed.ok) return { ok: false, issues: parsed.issues };
  return { ok: true, result: analyzeValid(parsed.spec, parsed.warnings, options) };
}

/** Analyse a spec (validated here; throws LoopSpecError naming the fields when it is invalid). */
export function analyzeDesign(spec: LoopSpec, options: AnalyzeOptions = {}): AnalysisResult {
  const parsed = parseLoopSpec(spec);
  if (!parsed.ok) throw new LoopSpecError(parsed.issues);
  return analyzeValid(parsed.spec, parsed.warnings, options);
}

function analyzeValid(spec: LoopSpec, specWarnings: readonly SpecWarning[], options: AnalyzeOptions): AnalysisResult {
  const minPm = options.minPhaseMarginDeg ?? 45;
  const minGm = options.minGainMarginDb ?? 6;
  const points = options.points ?? DEFAULT_POINTS;
  const gain = loopGain(spec);
  const k = gain.kRadPerS;
  const fs = spec.sampleRateHz;
  const design = designLoopFilter(spec);
  const loopType = 1 + design.integrators;
  const range = analysisRange(design.analogSections, k, fs);

  const analogFn = analogLoopResponse(design.analogSections, k);
  const analogGrid = logGrid(range.fMinHz, range.fMaxAnalogHz, points);
  const analogOpen = sampleResponse(analogFn, analogGrid, loopType);
  const analogMargins = loopMargins(analogFn, analogOpen);
  const analogClosed = closedLoopFigures(closedLoop(analogFn), analogGrid, analogOpen.values.map(closedFromOpen));
  const analogPolys = analogClosedLoop(design.analog, k);
  const analogStable = routhHurwitzStable(analogPolys.h.den);

  const discrete = discreteLoopMargins(spec, design.sections, { fMinHz: range.fMinHz, points });
  const plotGrid = discrete.open.freqHz;
  const analogOnPlot = sampleResponse(analogFn, plotGrid, loopType);

  const quantization = quantize(spec, design, range.fMinHz, points);
  const second = secondOrderParameters(spec, k, design.tau);
  const dcGain = analogDcGain(design);
  const bode: BodePlotData = {
    freqHz: plotGrid,
    analogMagnitudeDb: analogOnPlot.magnitudeDb,
    analogPhaseDeg: analogOnPlot.phaseDeg,
    discreteMagnitudeDb: discrete.open.magnitudeDb,
    discretePhaseDeg: discrete.open.phaseDeg,
    analogClosedLoopDb: analogOnPlot.values.map((l) => toDb(closedFromOpen(l))),
    discreteClosedLoopDb: discrete.open.values.map((l) => toDb(closedFromOpen(l))),
    quantizedMagnitudeDb: quantization.open?.magnitudeDb ?? null,
    quantizedPhaseDeg: quantization.open?.phaseDeg ?? null,
  };
  const noiseBandwidth = noiseBandwidths(spec, design, k, range, second);
  const crossoverHz = discrete.margins.crossoverHz ?? analogMargins.crossoverHz ?? k / (2 * Math.PI);
  const dampingForSpan = Math.min(Math.max(second?.damping ?? 0.5, 0.1), 1);
  const durationS = 3 / (crossoverHz * dampingForSpan);
  const nco = ncoSummary(spec);
  const verdict = judge(discrete, quantization.summary, nco, analogStable, minPm, minGm);
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
    estimates: acquisitionEstimates(second, k, dcGain),
    ripple: rippleFigures(spec, design, gain),
    steadyState: steadyStateErrors(loopType, k, dcGain, spec.filter.kind === 'pi' ? (design.tau?.tau1S ?? null) : null),
    stepResponses: stepResponses(discreteClosedLoop(design.digital, k, fs).e, analogPolys.e, fs, durationS),
    quantization: quantization.summary,
    nco,
    verdict,
    warnings: [...specWarnings, ...analysisWarnings(spec, discrete, analogMargins)],
  };
}

function quantize(spec: LoopSpec, design: LoopFilterDesign, fMinHz: number, points: number) {
  try {
    const filter = quantizeSections(design.sections, spec.fixedPoint);
    const loop = discreteLoopMargins(spec, filter.sections.map((s) => s.quantized), { fMinHz, points });
    return {
      summary: { filter, error: null, loop: { margins: loop.margins, stable: loop.stable && filter.stable, closedLoop: loop.closedLoop } },
      open: loop.open,
    };
  } catch (err) {
    if (!(err instanceof FieldError)) throw err;
    return { summary: { filter: null, error: { field: err.field, message: err.message }, loop: null }, open: null };
  }
}

/** The fixed-point module's NCO figures for the spec (the NCO runs at sampleRateHz, DESIGN.md). */
function ncoSummary(spec: LoopSpec): NcoSummary {
  const { nco, fixedPoint: fp } = spec;
  const tuning = ncoTuning(spec.centerHz, spec.sampleRateHz, nco.accumulatorBits);
  const spectral = ncoSpectralEstimates(nco.accumulatorBits, nco.phaseBits, nco.amplitudeBits);
  try {
    const control = ncoControlScaling({
      gainHzPerUnit: nco.gainHzPerUnit,
      sampleRateHz: spec.sampleRateHz,
      accumulatorBits: nco.accumulatorBits,
      dataBits: fp.dataBits,
      coefficientBits: fp.coefficientBits,
      rounding: fp.rounding,
    });
    return { tuning, spectral, control, controlError: null };
  } catch (err) {
    if (!(err instanceof FieldError)) throw err;
    return { tuning, spectral, control: null, controlError: { field: err.field, message: err.message } };
  }
}

/** F(0) as a product over sections; null when a section has a pole at s = 0 (PI). */
function analogDcGain(design: LoopFilterDesign): number | null {
  let g = 1;
  for (const s of design.analogSections) {
    const d = s.den[s.den.length - 1]!;
    if (d === 0) return null;
    g *= s.num[s.num.length - 1]! / d;
  }
  return g;
}

function noiseBandwidths(
  spec: LoopSpec,
  design: LoopFilterDesign,
  k: number,
  range: { fMinHz: number; fMaxAnalogHz: number; nyquistHz: number },
  second: { wnRadPerS: number; damping: number } | null,
): NoiseBandwidth {
  const { h } = analogClosedLoop(design.analog, k);
  const den = h.den;
  const lead = den[0]!;
  let analogHz: number;
  let analogMethod: NoiseBandwidth['analogMethod'];
  if (den.length === 3 && h.num.length <= 2) {
    const num = h.num.length === 2 ? h.num : [0, h.num[0]!];
    analogHz = secondOrderNoiseBandwidthHz(num[0]! / lead, num[1]! / lead, den[1]! / lead, den[2]! / lead);
    analogMethod = 'closed-form';
  } else {
    const hFn = closedLoop(analogLoopResponse(design.analogSections, k));
    analogHz = numericNoiseBandwidthHz(hFn, range.fMinHz, range.fMaxAnalogHz, { tail: true });
    analogMethod = 'numeric';
  }
  const hd = closedLoop(discreteLoopResponse(design.sections, k, spec.sampleRateHz));
  const discreteHz = numericNoiseBandwidthHz(hd, range.fMinHz, range.nyquistHz);
  return {
    analogHz,
    analogMethod,
    discreteHz,
    highGainApproximationHz: second ? highGainNoiseBandwidthHz(second.wnRadPerS, second.damping) : null,
  };
}

function rippleFigures(spec: LoopSpec, design: LoopFilterDesign, gain: LoopGain): RippleFigures {
  const fs = spec.sampleRateHz;
  const rippleHz = 2 * spec.centerHz;
  const aliasedRippleHz = Math.abs(rippleHz - fs * Math.round(rippleHz / fs));
  const fa = analogResponse(design.analogSections, rippleHz);
  const fd = digitalResponse(design.sections, rippleHz, fs);
  const ha = closedLoop(analogLoopResponse(design.analogSections, gain.kRadPerS))(rippleHz);
  const hd = closedLoop(discreteLoopResponse(design.sections, gain.kRadPerS, fs))(rippleHz);
  const mag = (c: { re: number; im: number }) => Math.hypot(c.re, c.im);
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

function judge(
  discrete: DiscreteLoopAnalysis,
  q: QuantizationSummary,
  nco: NcoSummary,
  analogStable: boolean,
  minPm: number,
  minGm: number,
): AnalysisVerdict {
  const reasons: string[] = [];
  if (!analogStable) reasons.push('the analog prototype loop is unstable');
  if (!discrete.stable) reasons.push('the discrete loop is unstable (a closed-loop pole on or outside the unit circle)');
  if (q.error) reasons.push(`quantisation failed: ${q.error.message}`);
  if (nco.controlError) reasons.push(`NCO control scaling failed: ${nco.controlError.message}`);
  else if (q.loop && !q.loop.stable) reasons.push('the loop with quantised coefficients is unstable');
  const check = (label: string, m: LoopMargins) => {
    if (m.phaseMarginDeg === null || m.phaseMarginDeg < minPm) {
      reasons.push(`${label} phase margin ${m.phaseMarginDeg === null ? 'undefined' : m.phaseMarginDeg.toFixed(1) + '°'} is below ${minPm}°`);
    }
    if (m.gainMarginDb !== null && m.gainMarginDb < minGm) reasons.push(`${label} gain margin ${m.gainMarginDb.toFixed(1)} dB is below ${minGm} dB`);
  };
  check('discrete', discrete.margins);
  if (q.loop) check('quantised', q.loop.margins);
  const stable = analogStable && discrete.stable && q.error === null && (q.loop?.stable ?? false);
  const marginsMet = !reasons.some((r) => r.includes('margin'));
  return { stable, marginsMet, minPhaseMarginDeg: minPm, minGainMarginDb: minGm, reasons };
}

function analysisWarnings(spec: LoopSpec, discrete: DiscreteLoopAnalysis, analog: LoopMargins): SpecWarning[] {
  const w: SpecWarning[] = [];
  const fc = discrete.margins.crossoverHz ?? analog.crossoverHz;
  if (fc !== null && fc > spec.sampleRateHz / 20) {
    w.push({
      field: 'sampleRateHz',
      message: `the loop crossover (${fc.toPrecision(4)} Hz) is above sampleRateHz/20: the discrete loop departs from its analog prototype (bilinear warping and the NCO's sample of delay); trust the discrete margins`,
    });
  }
  if (analog.phaseMarginDeg !== null && discrete.margins.phaseMarginDeg !== null && analog.phaseMarginDeg - discrete.margins.phaseMarginDeg > 10) {
    w.push({
      field: 'sampleRateHz',
      message: `the discrete loop loses ${(analog.phaseMarginDeg - discrete.margins.phaseMarginDeg).toFixed(1)}° of phase margin against the analog prototype`,
    });
  }
  return w;
}
