import { LOCK_DEFINITION, type SimMetrics, type SimResult } from '@loopwright/dsp';
import { fmtEng, fmtFixed, fmtHz } from '../lib/format.ts';

export interface MetricRow {
  readonly label: string;
  readonly float: string;
  readonly bitTrue: string;
  readonly testId: string;
}

const METRICS: readonly { label: string; testId: string; text: (m: SimMetrics) => string }[] = [
  { label: 'Locked', testId: 'metric-locked', text: (m) => (m.locked ? 'yes' : 'NO') },
  { label: 'Lock time', testId: 'metric-lock-time', text: (m) => (m.lockTimeS === null ? 'not locked in this run' : fmtEng(m.lockTimeS, 's', 4)) },
  { label: 'Steady-state phase error', testId: 'metric-phase-error', text: (m) => fmtFixed(m.steadyStatePhaseErrorDeg, 3, '°') },
  { label: 'Phase jitter (RMS)', testId: 'metric-jitter', text: (m) => fmtFixed(m.steadyStatePhaseJitterDeg, 3, '°') },
  { label: 'Cycle slips', testId: 'metric-slips', text: (m) => String(m.cycleSlips) },
  { label: 'Final frequency error', testId: 'metric-freq-error', text: (m) => fmtHz(m.finalFrequencyErrorHz, 4) },
  { label: 'Demodulation error (RMS)', testId: 'metric-demod', text: (m) => fmtHz(m.demodErrorRmsHz, 4) + (m.demodErrorRelative === null ? '' : ` (${fmtFixed(100 * m.demodErrorRelative, 2)} % of deviation)`) },
];

/** Where a sweep lost and regained lock (dsp README "Sweep"): the input offset and the time. */
function at(hz: number | null, s: number | null, none: string): string {
  return hz === null || s === null ? none : `${fmtHz(hz, 4)} at ${fmtEng(s, 's', 4)}`;
}

const SWEEP_METRICS: readonly { label: string; testId: string; text: (m: SimMetrics) => string }[] = [
  { label: 'Lock lost going out', testId: 'metric-sweep-lost', text: (m) => (m.sweep ? at(m.sweep.lockLostHz, m.sweep.lockLostS, 'held to the turn') : '—') },
  {
    label: 'Lock regained coming back',
    testId: 'metric-sweep-regained',
    text: (m) => (m.sweep ? (m.sweep.lockLostHz === null ? 'never lost' : at(m.sweep.lockRegainedHz, m.sweep.lockRegainedS, 'not regained by the end')) : '—'),
  },
  { label: 'Cycle slips out / back', testId: 'metric-sweep-slips', text: (m) => (m.sweep ? `${m.sweep.slipsOut} / ${m.sweep.slipsBack}` : '—') },
];

export function metricRows(result: SimResult): MetricRow[] {
  const f = result.float?.metrics;
  const b = result.bitTrue?.metrics;
  const list = (f ?? b)?.sweep ? [...METRICS, ...SWEEP_METRICS] : METRICS;
  return list.map((m) => ({ label: m.label, testId: m.testId, float: f ? m.text(f) : '—', bitTrue: b ? m.text(b) : '—' }));
}

/** What Locked and Lock time mean, with the tolerance this run used (the one definition, from dsp). */
export function lockDefinitionText(result: SimResult): string {
  const tolRad = (result.float ?? result.bitTrue)?.metrics.lockToleranceRad;
  const tol = tolRad === undefined ? '' : ` Lock tolerance in this run: ±${fmtFixed(tolRad, 2, 'rad')} (±${((tolRad * 180) / Math.PI).toFixed(1)}°).`;
  return LOCK_DEFINITION + tol;
}

export function runSummary(result: SimResult, elapsedMs: number | null): string {
  const time = elapsedMs === null ? '' : ` in ${(elapsedMs / 1000).toFixed(2)} s`;
  const checksum = result.bitTrue ? ` · bit-true checksum 0x${(result.bitTrue.checksum >>> 0).toString(16).padStart(8, '0')}` : '';
  return `${result.sampleCount.toLocaleString('en')} samples at ${fmtHz(result.sampleRateHz)}${time}${checksum}`;
}
