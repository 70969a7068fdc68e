/**
 * The verdict of an analysis (stable, margins met) and the warnings the analysis adds to the spec's.
 * Default requirements PM ≥ 45°, GM ≥ 6 dB are common practice, no source; callers may change them.
 */
import type { LoopSpec, SpecWarning } from '../spec/schema.ts';
import type { LoopMargins } from './margins.ts';
import type { DiscreteLoopAnalysis } from './discreteLoop.ts';
import type { QuantizationSummary } from './quantizedLoop.ts';
import type { NcoSummary } from './ncoSummary.ts';

export interface AnalysisVerdict {
  readonly stable: boolean;
  readonly marginsMet: boolean;
  /** False when the fixed-point datapath cannot reach full scale (the MAC word is too narrow). */
  readonly datapathOk: boolean;
  readonly minPhaseMarginDeg: number;
  readonly minGainMarginDb: number;
  readonly reasons: readonly string[];
}

/** The phase-margin requirement: a margin exists and is at least minPm (common practice, no source). */
function phaseMarginMet(m: LoopMargins, minPm: number): boolean {
  return m.phaseMarginDeg !== null && m.phaseMarginDeg >= minPm;
}

/** The gain-margin requirement: at least minGm, or no gain margin at all (the phase never reaches −180°). */
function gainMarginMet(m: LoopMargins, minGm: number): boolean {
  return m.gainMarginDb === null || m.gainMarginDb >= minGm;
}

/**
 * Each margin requirement over the loops that ship: the discrete loop, and the quantised one when it
 * exists. The verdict's marginsMet is both; the app shows each (the rule is written only here).
 */
export function marginChecks(discrete: LoopMargins, quantized: LoopMargins | null, minPm: number, minGm: number): { readonly phaseMarginMet: boolean; readonly gainMarginMet: boolean } {
  const loops = quantized ? [discrete, quantized] : [discrete];
  return { phaseMarginMet: loops.every((m) => phaseMarginMet(m, minPm)), gainMarginMet: loops.every((m) => gainMarginMet(m, minGm)) };
}

/** Why a loop's margins miss the verdict's (pushed to reasons); a module function, not a named closure per call (filters/loopFilter.ts, withRipple). */
function checkMargins(label: string, m: LoopMargins, minPm: number, minGm: number, reasons: string[]): void {
  if (m.phaseMarginDeg === null) {
    // No gain crossover: there is no frequency at which a phase margin is defined (margins.ts says why).
    const why = m.notes[0] ?? '|L| does not cross 0 dB';
    reasons.push(`the ${label} loop has no phase margin: ${why}; at least ${minPm}° is required`);
  } else if (!phaseMarginMet(m, minPm)) {
    reasons.push(`${label} phase margin ${m.phaseMarginDeg.toFixed(1)}° is below ${minPm}°`);
  }
  if (!gainMarginMet(m, minGm)) reasons.push(`${label} gain margin ${m.gainMarginDb?.toFixed(1)} dB is below ${minGm} dB`);
}

/** Stable / margins met, with every failure in words; the quantised loop counts as much as the designed one. */
export function analysisVerdict(
  discrete: DiscreteLoopAnalysis,
  q: QuantizationSummary,
  nco: NcoSummary,
  analogStable: boolean,
  minPm: number,
  minGm: number,
): AnalysisVerdict {
  const stabilityReasons: string[] = [];
  if (!analogStable) stabilityReasons.push('the analog prototype loop is unstable');
  if (!discrete.stable) stabilityReasons.push('the discrete loop is unstable (a closed-loop pole on or outside the unit circle)');
  if (q.error) stabilityReasons.push(`quantisation failed: ${q.error.message}`);
  else if (q.loop && !q.loop.stable) stabilityReasons.push('the loop with quantised coefficients is unstable');
  const marginReasons: string[] = [];
  checkMargins('discrete', discrete.margins, minPm, minGm, marginReasons);
  if (q.loop) checkMargins('quantised', q.loop.margins, minPm, minGm, marginReasons);
  const ncoReasons = nco.controlError ? [`NCO control scaling failed: ${nco.controlError.message}`] : [];
  const datapathReasons = q.datapath?.notes ?? [];
  const stable = stabilityReasons.length === 0;
  const marginsMet = marginReasons.length === 0;
  const reasons = [...stabilityReasons, ...marginReasons, ...ncoReasons, ...datapathReasons];
  return { stable, marginsMet, datapathOk: datapathReasons.length === 0, minPhaseMarginDeg: minPm, minGainMarginDb: minGm, reasons };
}

/** Non-fatal observations about the discrete loop against its analog prototype. */
export function analysisWarnings(spec: LoopSpec, discrete: DiscreteLoopAnalysis, analog: LoopMargins): SpecWarning[] {
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
