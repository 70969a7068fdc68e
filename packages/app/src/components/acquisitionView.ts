/**
 * Rows of the acquisition table (editor panel, release and review pages): each figure as the
 * analysis's estimate and as measured by simulating the nonlinear loop (dsp compareAcquisition),
 * with the bracket the measurement holds and, where the search hit a limit, the limit instead of a
 * figure.
 */
import type { AcquisitionComparison, AcquisitionLimit, AcquisitionMeasurement } from '@loopwright/dsp';
import { fmtFixed, fmtHz } from '../lib/format.ts';

export interface AcquisitionRow {
  readonly key: string;
  readonly figure: string;
  readonly estimate: string;
  readonly formula: string;
  readonly measured: string;
  readonly bracket: string;
  /** The limit the search hit, in words ('' when the bracket is within its tolerance). */
  readonly limit: string;
  readonly definition: string;
  readonly ratio: string;
}

const LIMIT_TEXT: Readonly<Record<AcquisitionLimit, string>> = {
  'control-range': 'still locked at the control word’s range (±gain per unit): no figure',
  'search-range': 'still locked at the search range (1.5·K·F(0)): no figure',
  'sample-budget': 'sample budget spent before the bracket was tight: no figure',
  'bisection-steps': 'step limit reached before the bracket was tight: no figure',
};

function bracketText(m: AcquisitionMeasurement): string {
  const fail = m.failHz === null ? 'none failed' : fmtHz(m.failHz, 5);
  return `${fmtHz(m.passHz, 5)} … ${fail} (target width ${fmtHz(m.toleranceHz, 3)})`;
}

function measuredText(m: AcquisitionMeasurement): string {
  if (m.valueHz !== null) return fmtHz(m.valueHz, 4);
  if (m.limitedBy === 'control-range' || m.limitedBy === 'search-range') return `≥ ${fmtHz(m.passHz, 4)}`;
  return m.limitedBy ? 'not measured' : 'none (fails at the smallest offset)';
}

export function acquisitionRows(c: AcquisitionComparison): AcquisitionRow[] {
  return c.figures.map((f) => ({
    key: f.key,
    figure: f.name,
    estimate: f.estimate.valueHz === null ? '—' : fmtHz(f.estimate.valueHz, 4),
    formula: f.estimate.formula,
    measured: measuredText(f.measured),
    bracket: bracketText(f.measured),
    limit: f.measured.limitedBy ? LIMIT_TEXT[f.measured.limitedBy] : '',
    definition: f.measured.definition,
    ratio: f.estimateOverMeasured === null ? '—' : `${fmtFixed(f.estimateOverMeasured, 2)}×`,
  }));
}

/** How the search ran, in one line. */
export function acquisitionSummary(c: AcquisitionComparison): string {
  const s = c.search;
  const phases = s.initialPhasesDeg.join(', ');
  return `${s.runs} runs, ${s.samplesSimulated.toLocaleString('en')} of ${s.sampleBudget.toLocaleString('en')} loop samples; offsets searched up to ${fmtHz(s.searchLimitHz, 4)} (${s.searchLimitKind === 'control-range' ? 'the control word’s range' : '1.5·K·F(0)'}); initial phases ${phases}°; bracket target ${fmtFixed(100 * s.relativeTolerance, 1)} % or ${fmtHz(s.floorToleranceHz, 2)}`;
}
