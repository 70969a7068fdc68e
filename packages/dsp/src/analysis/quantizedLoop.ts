/**
 * The loop with quantised coefficients: the fixed-point module quantises the sections to the spec's
 * coefficient format, and the discrete loop is analysed again with them (discreteLoopMargins).
 */
import type { LoopSpec } from '../spec/schema.ts';
import type { QuantizedFilter } from '../types/fixed.ts';
import type { LoopFilterDesign } from '../design.ts';
import type { LoopMargins } from './margins.ts';
import type { ClosedLoopFigures } from './closedLoopFigures.ts';
import { discreteLoopMargins } from './discreteLoop.ts';
import { quantizeSections } from '../fixed/quantizeSections.ts';
import { FieldError } from '../fixed/fieldError.ts';
import { type DatapathFigures, datapathFigures } from './datapath.ts';

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
}

/** Quantise and analyse; a format that cannot hold the coefficients is reported, not thrown. */
export function quantizedLoop(spec: LoopSpec, design: LoopFilterDesign, fMinHz: number, points: number) {
  try {
    const filter = quantizeSections(design.sections, spec.fixedPoint);
    const loop = discreteLoopMargins(spec, filter.sections.map((s) => s.quantized), { fMinHz, points });
    return {
      summary: {
        filter,
        error: null,
        loop: { margins: loop.margins, stable: loop.stable && filter.stable, closedLoop: loop.closedLoop },
        datapath: datapathFigures(spec, filter.format.fractionBits),
      },
      open: loop.open,
    };
  } catch (err) {
    if (!(err instanceof FieldError)) throw err;
    return { summary: { filter: null, error: { field: err.field, message: err.message }, loop: null, datapath: null }, open: null };
  }
}

