/**
 * Rows of the data-path noise report (the dsp analysis's quantization.noise, packages/dsp README
 * "Data-path noise and scaling"), for the editor's quantisation tab and a release's page.
 */
import type { DatapathNoise } from '@loopwright/dsp';
import { fmtFixed, fmtSig } from '../lib/format.ts';
import type { FigureRow } from './analysisView.ts';

export interface NoisePointRow {
  readonly key: string;
  readonly point: string;
  readonly dropped: string;
  readonly error: string;
  readonly outputGain: string;
  readonly phaseGain: string;
  readonly outputShare: string;
  readonly phaseShare: string;
}

export interface SectionScalingRow {
  readonly key: string;
  readonly section: string;
  readonly l1: string;
  readonly lInf: string;
  readonly peak: string;
  readonly headroom: string;
  readonly shift: string;
  readonly ok: boolean;
}

const db = (v: number) => fmtFixed(v, 1, 'dB');
const share = (part: number, total: number) => (total > 0 ? `${fmtFixed((100 * part) / total, 1)} %` : '—');

/** The totals: SNR, jitter, offset, dynamic range and the output noise itself. */
export function noiseFigures(n: DatapathNoise): FigureRow[] {
  return [
    { label: 'Roundoff SNR at the filter output', value: db(n.outputSnrDb), note: 'full-scale sinusoid over the predicted roundoff power' },
    { label: 'Roundoff noise at the filter output', value: `${fmtSig(n.outputNoiseRms, 3)} units RMS`, note: n.rippleMixVariance > 0 ? `${share(n.rippleMixVariance, n.outputNoiseVariance)} from NCO phase noise on the 2·f term` : undefined },
    { label: 'NCO phase jitter from roundoff', value: `${fmtSig(n.phaseJitterDeg, 3)}° RMS` },
    { label: 'NCO phase offset from rounding means', value: `${fmtSig((n.phaseMeanRad * 180) / Math.PI, 3)}°`, note: n.phaseMeanRad !== 0 ? 'truncation: its −½ LSB mean leaves a static phase error' : undefined },
    { label: 'Data-path dynamic range', value: db(n.dynamicRangeDb), note: 'largest detector peak no section overflows over the roundoff floor' },
  ];
}

/** One row per rounding point: what it drops, its error, and where that error goes. */
export function noisePointRows(n: DatapathNoise): NoisePointRow[] {
  return n.points.map((p, i) => ({
    key: `${p.kind}${p.section ?? ''}${i}`,
    point: p.label,
    dropped: p.droppedBits === null ? 'real → code' : `${p.droppedBits} bits`,
    error: `${fmtSig(p.meanLsb, 3)} / ${fmtSig(p.varianceLsb2, 4)}`,
    outputGain: fmtSig(p.outputNoiseGain, 4),
    phaseGain: fmtSig(p.phaseNoiseGain, 4),
    outputShare: share(p.outputVariance, n.outputNoiseVariance),
    phaseShare: share(p.phaseVarianceRad2, n.phaseNoiseVarianceRad2),
  }));
}

/** One row per section: its peak gains from the detector, headroom in its word and the shift that avoids overflow. */
export function sectionScalingRows(n: DatapathNoise): SectionScalingRow[] {
  return n.sections.map((s) => ({
    key: `S${s.section}`,
    section: `S${s.section + 1}`,
    l1: fmtSig(s.l1Gain, 4),
    lInf: fmtSig(s.lInfGain, 4),
    peak: `${fmtSig(s.peakUnits, 3)} / ${fmtSig(s.limitUnits, 3)}`,
    headroom: `${db(s.headroomDb)} (sine ${db(s.sineHeadroomDb)})`,
    shift: s.shiftBits === 0 ? 'none' : `>> ${s.shiftBits}`,
    ok: !s.mayOverflow,
  }));
}
