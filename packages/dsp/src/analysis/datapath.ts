/**
 * Range of the fixed-point loop filter's datapath, from the bit-true arithmetic in this README
 * ("Bit-true arithmetic"): every section output is a D-bit code with D − 1 fraction bits (full scale
 * ±1 unit), and the section MAC sum, with Fc + D − 1 fraction bits, is reduced to Wa bits before the
 * shift by Fc. A Wa-bit word holds ±2^(Wa−1) LSBs of 2^−(Fc+D−1), i.e. ±2^(Wa−Fc−D) units: when
 * Wa < Fc + D every section output — the NCO control among them — is clamped (or wrapped) below full
 * scale, and the NCO can move at most that fraction of gainHzPerUnit from its centre.
 */
import type { LoopSpec } from '../spec/schema.ts';

/** The figures the widths imply (the widths themselves are the spec's and the quantiser's, not repeated here). */
export interface DatapathFigures {
  /** Largest |filter output| in control units the datapath can produce (≤ 1, the D-bit full scale). */
  readonly outputLimitUnits: number;
  /** The NCO's reach from centerHz: outputLimitUnits·gainHzPerUnit, Hz. */
  readonly controlRangeHz: number;
  /** True when the MAC word is too narrow for a full-scale section output (Wa < Fc + D). */
  readonly macLimitsOutput: boolean;
  readonly notes: readonly string[];
}

export function datapathFigures(spec: LoopSpec, coefficientFractionBits: number): DatapathFigures {
  const { dataBits: d, accumulatorBits: wa, overflow } = spec.fixedPoint;
  const fc = coefficientFractionBits;
  const fullScale = 1 - 2 ** -(d - 1);
  const macLimit = 2 ** (wa - fc - d);
  const macLimitsOutput = macLimit < fullScale;
  const outputLimitUnits = Math.min(fullScale, macLimit);
  const controlRangeHz = outputLimitUnits * spec.nco.gainHzPerUnit;
  const notes = macLimitsOutput
    ? [
        `fixedPoint.accumulatorBits ${wa} < Fc + D = ${fc + d}: the section MAC (Fc + D − 1 = ${fc + d - 1} fraction bits) ${overflow === 'wrap' ? 'wraps' : 'clamps'} every section output at 2^(${wa}−${fc}−${d}) = ${macLimit} of full scale, so the NCO can move only ±${controlRangeHz.toPrecision(4)} Hz from centerHz; widen fixedPoint.accumulatorBits to at least ${fc + d}`,
      ]
    : [];
  return { outputLimitUnits, controlRangeHz, macLimitsOutput, notes };
}
