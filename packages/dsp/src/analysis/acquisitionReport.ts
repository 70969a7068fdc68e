/**
 * Each acquisition figure twice, side by side: the textbook estimate of the analysis (G3, B6;
 * src/analysis/estimates.ts) and the measurement by simulation of the nonlinear loop
 * (src/analysis/acquisitionSim.ts), because the formulas can be off by up to 2x (Ku23). The one shape
 * the CLI, the API, the release and the editor show.
 */
import type { AcquisitionEstimates } from '../types/analysis.ts';
import type { AcquisitionComparison, AcquisitionFigureKey, AcquisitionFigureRow, AcquisitionSimResult } from '../types/sim.ts';

/** The figure's name, the formula its estimate uses (and its source key), and the estimate itself. */
const FIGURES: readonly { readonly key: AcquisitionFigureKey; readonly name: string; readonly formula: string; readonly estimate: (e: AcquisitionEstimates) => number | null }[] = [
  { key: 'lockInHz', name: 'lock-in', formula: '2ζωn, capped at K·F(0) for type 1 (G3, B6)', estimate: (e) => e.lockInHz },
  { key: 'pullOutHz', name: 'pull-out', formula: '1.8·ωn·(ζ + 1), capped at K·F(0) for type 1 (B6)', estimate: (e) => e.pullOutHz },
  { key: 'holdInHz', name: 'hold-in', formula: 'K·F(0) (G3); unbounded for an ideal PI loop', estimate: (e) => e.holdInHz },
  { key: 'pullInHz', name: 'pull-in', formula: 'no range formula in the analysis (its pull-in time is Δω²/(2ζωn³), G3)', estimate: () => null },
];

export function compareAcquisition(estimates: AcquisitionEstimates, measured: AcquisitionSimResult): AcquisitionComparison {
  const figures: AcquisitionFigureRow[] = FIGURES.map((f) => {
    const estimateHz = f.estimate(estimates);
    const m = measured[f.key];
    return {
      key: f.key,
      name: f.name,
      estimate: { label: 'estimate', valueHz: estimateHz, formula: f.formula },
      measured: { label: 'simulated', ...m },
      estimateOverMeasured: estimateHz !== null && m.valueHz !== null && m.valueHz > 0 ? estimateHz / m.valueHz : null,
    };
  });
  const { lockInHz: _l, pullOutHz: _o, holdInHz: _h, pullInHz: _p, ...search } = measured;
  return { figures, search, estimateNotes: estimates.notes };
}
