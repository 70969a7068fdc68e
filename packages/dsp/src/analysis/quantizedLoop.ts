/**
 * The loop with quantised coefficients: the sections as the fixed-point module quantised them
 * (planDesign's `quantized`), analysed again as a discrete loop (discreteLoopMargins).
 */
import type { LoopSpec } from '../spec/schema.ts';
import type { QuantizedFilter } from '../types/fixed.ts';
import type { LoopMargins } from './margins.ts';
import type { ClosedLoopFigures } from './closedLoopFigures.ts';
import { discreteLoopMargins } from './discreteLoop.ts';
import { type DatapathFigures, datapathFigures } from './datapath.ts';
import { type DatapathNoise, datapathNoise } from './datapathNoise.ts';
import type { NcoControlScaling } from '../types/nco.ts';

/** The quantiser's outcome: the quantised filter, or the field issue that stopped it. */
export type QuantizationOutcome =
  | { readonly filter: QuantizedFilter; readonly error: null }
  | { readonly filter: null; readonly error: { readonly field: string; readonly message: string } };

export interface QuantizationSummary {
  readonly filter: QuantizedFilter | null;
  readonly error: { readonly field: string; readonly message: string } | null;
  readonly loop: {
    readonly margins: LoopMargins;
    readonly stable: boolean;
    readonly closedLoop: ClosedLoopFigures | null;
  } | null;
  /** Range of the fixed-point filter datapath (null when quantisation failed). */
  readonly datapath: DatapathFigures | null;
  /** Roundoff noise of every rounding point and the peak gain and headroom of every section (null when quantisation or control scaling failed, or the loop does not settle: noiseNote says why). */
  readonly noise: DatapathNoise | null;
  readonly noiseNote: string | null;
}

/** Analyse the quantised loop; a format that could not hold the coefficients is reported as it came. */
export function quantizedLoop(spec: LoopSpec, quantization: QuantizationOutcome, control: NcoControlScaling | null, grid: { readonly fMinHz: number; readonly points: number; readonly freqHz?: readonly number[] }) {
  const { filter } = quantization;
  if (!filter) {
    const summary: QuantizationSummary = { filter: null, error: quantization.error, loop: null, datapath: null, noise: null, noiseNote: 'no quantised filter' };
    return { summary, open: null };
  }
  const sections = filter.sections.map((s) => s.quantized);
  const loop = discreteLoopMargins(spec, sections, { fMinHz: grid.fMinHz, points: grid.points, grid: grid.freqHz, closedDb: false });
  const datapath = datapathFigures(spec, filter.format.fractionBits);
  const stable = loop.stable && filter.stable;
  const noise = !control
    ? { noise: null, note: 'no control scaling (nco.controlError says why)' }
    : !stable
      ? { noise: null, note: 'the quantised loop is unstable, so its roundoff noise is unbounded' }
      : datapathNoise({ spec, sections, coefficientFractionBits: filter.format.fractionBits, control, outputLimitUnits: datapath.outputLimitUnits, freqHz: loop.open.freqHz });
  const summary: QuantizationSummary = {
    filter,
    error: null,
    loop: { margins: loop.margins, stable, closedLoop: loop.closedLoop },
    datapath,
    noise: noise.noise,
    noiseNote: noise.note,
  };
  return { summary, open: loop.open };
}

