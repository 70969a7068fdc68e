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
}

/** Analyse the quantised loop; a format that could not hold the coefficients is reported as it came. */
export function quantizedLoop(spec: LoopSpec, quantization: QuantizationOutcome, fMinHz: number, points: number) {
  const { filter } = quantization;
  if (!filter) return { summary: { filter: null, error: quantization.error, loop: null, datapath: null }, open: null };
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
}

