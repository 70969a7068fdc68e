/** The spec's loop filter (designLoopFilter) quantised to its fixedPoint coefficient format. */
import type { LoopSpec } from '../spec/schema.ts';
import type { QuantizedFilter } from '../types/fixed.ts';
import { designLoopFilter } from '../design.ts';
import { quantizeSections } from './quantizeSections.ts';

export function quantizeFilter(spec: LoopSpec): QuantizedFilter {
  return quantizeSections(designLoopFilter(spec).sections, spec.fixedPoint);
}
