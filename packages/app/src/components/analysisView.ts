/**
 * What the editor's result panels show, computed from the worker's analysis so the templates
 * only lay it out.
 */
import { marginChecks, type AnalysisResult, type LoopMargins } from '@loopwright/dsp';
import type { BodeMarkers, BodeTrace } from '../charts/bodeOption.ts';
import { fmtEng, fmtFixed, fmtHz, fmtSig } from '../lib/format.ts';

export type Judgement = 'pass' | 'fail' | 'info';

/** The numbers of an analysis without its plot arrays (what a release's manifest stores). */
export type AnalysisNumbers = Omit<AnalysisResult, 'bode' | 'stepResponses'>;

export interface SummaryRow {
  readonly label: string;
  readonly analog: string;
  readonly discrete: string;
  readonly quantised: string;
  readonly target: string;
  readonly judgement: Judgement;
  readonly testId: string;
}

export interface FigureRow {
  readonly label: string;
  readonly value: string;
  readonly note?: string;
}

export function bodeTraces(a: AnalysisResult): BodeTrace[] {
  const b = a.bode;
  const traces: BodeTrace[] = [
    { label: 'Analog prototype', freqHz: b.freqHz, magnitudeDb: b.analogMagnitudeDb, phaseDeg: b.analogPhaseDeg, style: 'analog' },
    { label: 'Discrete loop', freqHz: b.freqHz, magnitudeDb: b.discreteMagnitudeDb, phaseDeg: b.discretePhaseDeg, style: 'discrete' },
  ];
  if (b.quantizedMagnitudeDb && b.quantizedPhaseDeg) {
    traces.push({ label: 'Quantised coefficients', freqHz: b.freqHz, magnitudeDb: b.quantizedMagnitudeDb, phaseDeg: b.quantizedPhaseDeg, style: 'quantised' });
  }
  // The discrete loop first: its crossover and margins are the ones marked (they are what ships).
  return [traces[1]!, traces[0]!, ...traces.slice(2)];
}

/**
 * One release's loop as a trace of an overlay: with quantised coefficients (what firmware implements),
 * or the discrete loop when quantisation failed; labelled with the release and drawn in `color`.
 */
export function overlayTrace(a: AnalysisResult, label: string, color: string, style: BodeTrace['style']): BodeTrace {
  const b = a.bode;
  const quantised = b.quantizedMagnitudeDb !== null && b.quantizedPhaseDeg !== null;
  return {
    label: quantised ? label : `${label} (discrete, not quantised)`,
    freqHz: b.freqHz,
    magnitudeDb: b.quantizedMagnitudeDb ?? b.discreteMagnitudeDb,
    phaseDeg: b.quantizedPhaseDeg ?? b.discretePhaseDeg,
    style,
    color,
  };
}

export function bodeMarkers(a: AnalysisResult, sampleRateHz: number): BodeMarkers {
  const m = a.margins.discrete;
  // An unstable loop has no margin to speak of: the crossings stay marked, the figures do not.
  const stable = a.stability.discreteStable;
  return {
    crossoverHz: m.crossoverHz,
    phaseMarginDeg: stable ? m.phaseMarginDeg : null,
    phaseCrossoverHz: m.phaseCrossoverHz,
    gainMarginDb: stable ? m.gainMarginDb : null,
    nyquistHz: sampleRateHz / 2,
  };
}

/** What a margin cell says for a loop that is unstable: a margin is only defined for a stable loop. */
const NO_MARGIN_UNSTABLE = 'none (unstable)';

function gmText(m: LoopMargins | undefined, stable: boolean | undefined): string {
  if (!m) return '—';
  if (stable === false) return NO_MARGIN_UNSTABLE;
  // No −180° crossing: the margin is unlimited (common practice, no source).
  return m.gainMarginDb === null ? 'unlimited (phase never reaches −180°)' : fmtFixed(m.gainMarginDb, 1, 'dB');
}

function pmText(m: LoopMargins | undefined, stable: boolean | undefined): string {
  if (!m) return '—';
  if (stable === false) return NO_MARGIN_UNSTABLE;
  return m.phaseMarginDeg === null ? 'none (|L| never crosses 0 dB)' : fmtFixed(m.phaseMarginDeg, 1, '°');
}

export function marginRows(a: AnalysisNumbers): SummaryRow[] {
  const { analog, discrete } = a.margins;
  const q = a.quantization.loop?.margins;
  const { minPhaseMarginDeg: minPm, minGainMarginDb: minGm } = a.verdict;
  // The pass/fail rule is dsp's, the same one its verdict uses; this only lays it out per row.
  const { phaseMarginMet: pmOk, gainMarginMet: gmOk } = marginChecks(discrete, q ?? null, minPm, minGm);
  const stableOk = a.verdict.stable;
  const st = { analog: a.stability.analogStable, discrete: a.stability.discreteStable, quantised: a.quantization.loop?.stable };
  // A loop that is unstable fails every margin: no pass mark may stand beside it.
  const judge = (ok: boolean): Judgement => (stableOk && ok ? 'pass' : 'fail');
  const yesNo = (v: boolean | undefined) => (v === undefined ? '—' : v ? 'stable' : 'UNSTABLE');
  return [
    {
      label: 'Stability',
      analog: yesNo(a.stability.analogStable),
      discrete: yesNo(a.stability.discreteStable),
      quantised: yesNo(a.quantization.loop?.stable),
      target: 'stable',
      judgement: stableOk ? 'pass' : 'fail',
      testId: 'row-stability',
    },
    {
      label: 'Crossover',
      analog: fmtHz(analog.crossoverHz),
      discrete: fmtHz(discrete.crossoverHz),
      quantised: fmtHz(q?.crossoverHz),
      target: '',
      judgement: 'info',
      testId: 'row-crossover',
    },
    {
      label: 'Phase margin',
      analog: pmText(analog, st.analog),
      discrete: pmText(discrete, st.discrete),
      quantised: pmText(q, st.quantised),
      target: `≥ ${minPm}°`,
      judgement: judge(pmOk),
      testId: 'row-phase-margin',
    },
    {
      label: 'Gain margin',
      analog: gmText(analog, st.analog),
      discrete: gmText(discrete, st.discrete),
      quantised: gmText(q, st.quantised),
      target: `≥ ${minGm} dB`,
      judgement: judge(gmOk),
      testId: 'row-gain-margin',
    },
    {
      label: 'Closed-loop −3 dB',
      analog: fmtHz(a.closedLoop.analog.bandwidth3dbHz),
      discrete: fmtHz(a.closedLoop.discrete.bandwidth3dbHz),
      quantised: fmtHz(a.quantization.loop?.closedLoop?.bandwidth3dbHz),
      target: '',
      judgement: 'info',
      testId: 'row-bandwidth',
    },
    {
      label: 'Peaking',
      analog: fmtFixed(a.closedLoop.analog.peakingDb, 2, 'dB'),
      discrete: fmtFixed(a.closedLoop.discrete.peakingDb, 2, 'dB'),
      quantised: fmtFixed(a.quantization.loop?.closedLoop?.peakingDb, 2, 'dB'),
      target: '',
      judgement: 'info',
      testId: 'row-peaking',
    },
  ];
}

export function loopFigures(a: AnalysisNumbers): FigureRow[] {
  const rows: FigureRow[] = [
    { label: 'Loop type', value: String(a.loopType) },
    { label: 'Loop gain K = Kd·Ko', value: fmtEng(a.loopGain.kRadPerS, 's⁻¹', 5), note: `Kd ${fmtSig(a.loopGain.kd, 4)} /rad` },
    {
      label: 'Noise bandwidth',
      value: `${fmtHz(a.noiseBandwidth.discreteHz)} discrete`,
      note: `${fmtHz(a.noiseBandwidth.analogHz)} analog (${a.noiseBandwidth.analogMethod})`,
    },
  ];
  if (a.secondOrder) {
    rows.push({ label: 'Natural frequency', value: fmtHz(a.secondOrder.naturalHz) });
    rows.push({ label: 'Damping ζ', value: fmtSig(a.secondOrder.damping, 4), note: `PM by formula ${fmtFixed(a.secondOrder.phaseMarginFormulaDeg, 1, '°')}` });
  }
  rows.push({
    label: `Ripple at ${fmtHz(a.ripple.rippleHz)}`,
    value: `${fmtFixed(a.ripple.discreteAttenuationDb, 1, 'dB')} attenuation`,
    note: `${fmtFixed(a.ripple.discretePhaseRippleDeg, 3, '°')} phase ripple; aliases to ${fmtHz(a.ripple.aliasedRippleHz)}`,
  });
  return rows;
}

export function rangeFigures(a: AnalysisNumbers): FigureRow[] {
  const e = a.estimates;
  const ss = a.steadyState;
  return [
    { label: 'Lock-in range', value: fmtHz(e.lockInHz), note: 'estimate' },
    { label: 'Hold-in range', value: e.holdInHz === null ? 'unbounded (ideal PI)' : fmtHz(e.holdInHz), note: 'estimate, K·F(0) of the float loop' },
    ...reachFigures(a),
    { label: 'Pull-out range', value: fmtHz(e.pullOutHz), note: 'estimate' },
    {
      label: 'Pull-in time per Hz²',
      value: e.pullInTimeSPerHz2 === null ? '—' : fmtEng(e.pullInTimeSPerHz2, 's/Hz²', 3),
      note: 'estimate',
    },
    { label: 'Error after frequency step', value: `${fmtSig(ss.frequencyStepRadPerHz, 4)} rad/Hz` },
    {
      label: 'Error during frequency ramp',
      value: ss.frequencyRampRadPerHzPerS === null ? 'unbounded' : `${fmtSig(ss.frequencyRampRadPerHzPerS, 4)} rad per Hz/s`,
    },
  ];
}

/**
 * What the fixed-point loop can reach (dsp analysis/fixedPointReach.ts): the hold-in it can actually
 * keep and the NCO frequencies that leaves. A release cut before this figure existed has none.
 */
function reachFigures(a: AnalysisNumbers): FigureRow[] {
  const r = (a as { fixedPointReach?: AnalysisNumbers['fixedPointReach'] }).fixedPointReach ?? null;
  if (!r) return [];
  const why =
    r.limitedBy === 'loop-gain'
      ? 'K·F(0), inside the NCO control range'
      : `NCO control range (${r.rangeField})${r.limitingSection === null ? '' : `, less the ripple headroom of section ${r.limitingSection + 1}`}`;
  return [
    { label: 'Hold-in, fixed point', value: `±${fmtHz(r.holdInHz)}`, note: `set by the ${why}` },
    { label: 'NCO reach, fixed point', value: `${fmtHz(r.lowestHz)} … ${fmtHz(r.highestHz)}`, note: 'the frequencies a locked bit-true loop can hold its NCO at' },
  ];
}

export interface Verdict {
  readonly label: string;
  readonly tone: 'pass' | 'fail';
  readonly reasons: readonly string[];
}

export function verdictOf(a: AnalysisNumbers): Verdict {
  const v = a.verdict;
  if (!v.stable) return { label: 'Unstable', tone: 'fail', reasons: v.reasons };
  if (!v.marginsMet) return { label: 'Stable — margins not met', tone: 'fail', reasons: v.reasons };
  return { label: 'Stable — margins met', tone: 'pass', reasons: [] };
}
