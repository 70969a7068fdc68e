/**
 * Coefficient quantisation of a cascade of second-order sections (OS3 Sec. 6.8, memory).
 *
 * Sections, not a high-order b/a: the roots of a high-order polynomial move far under small
 * coefficient errors, while each section's two poles move only with its own a1, a2 (SciPy's filter
 * docs say the same). All sections share one Q format (fixedPoint.coefficientBits /
 * coefficientFractionBits), which is what the bit-true MAC shifts by.
 */
import type { Sos } from '../types/filter.ts';
import type {
  CoefficientFormat,
  CoefficientName,
  QuantizationTrap,
  QuantizedCoefficient,
  QuantizedFilter,
  QuantizedSection,
} from '../types/fixed.ts';
import { FieldError } from './fieldError.ts';
import { requireWidth } from '../spec/limits.ts';
import { autoFractionBits, qFormat, quantizeValue } from './qformat.ts';
import { hasIntegratorPole, sectionPoleRadius, sectionStabilityFromCodes } from './sectionPoles.ts';
import { maxResponseDeviationDb } from './sosResponse.ts';

const NAMES: readonly CoefficientName[] = ['b0', 'b1', 'b2', 'a1', 'a2'];
/** Deviation is counted where the unquantised response is within this many dB of its peak. */
export const DEVIATION_BAND_DB = 40;
/**
 * Most fraction bits "auto" may choose. Narrow-band coefficients are tiny, so the best format often has
 * more fraction bits than the word has bits (say 18 bits, 30 fraction bits); 62 keeps 2^F a normal
 * double and every shift by F within the bit-true loop's 64-bit reference (bench/loop.c).
 */
const AUTO_MAX_FRACTION_BITS = 62;

function coefficientValues(s: Sos): number[] {
  return [s.b[0], s.b[1], s.b[2], s.a[1], s.a[2]];
}

function validate(sections: readonly Sos[], fx: CoefficientFormat): void {
  if (sections.length === 0) throw new FieldError('sections', 'sections: at least one second-order section is needed');
  sections.forEach((s, i) => {
    if (s.a[0] !== 1) throw new FieldError(`sections.${i}.a`, `sections.${i}.a[0] must be 1, got ${s.a[0]}`);
    coefficientValues(s).forEach((v, k) => {
      if (!Number.isFinite(v)) throw new FieldError(`sections.${i}.${NAMES[k]}`, `sections.${i}.${NAMES[k]} must be finite, got ${v}`);
    });
  });
  requireWidth('fixedPoint.coefficientBits', fx.coefficientBits);
  if (fx.coefficientFractionBits !== 'auto') requireWidth('fixedPoint.coefficientFractionBits', fx.coefficientFractionBits);
}

/** The fraction bits to use: the given number, or the "auto" choice over every coefficient. */
export function resolveFractionBits(sections: readonly Sos[], fx: CoefficientFormat): number {
  if (fx.coefficientFractionBits !== 'auto') return fx.coefficientFractionBits;
  const all = sections.flatMap(coefficientValues);
  const f = autoFractionBits(all, fx.coefficientBits, fx.rounding, AUTO_MAX_FRACTION_BITS);
  if (f === null) {
    const maxAbs = Math.max(...all.map(Math.abs));
    throw new FieldError(
      'fixedPoint.coefficientBits',
      `fixedPoint.coefficientBits ${fx.coefficientBits} cannot hold the largest coefficient ${maxAbs.toPrecision(6)} even with 0 fraction bits`,
    );
  }
  return f;
}

/**
 * Quantise every section's b0, b1, b2, a1, a2 to integer codes and report what it did to the filter:
 * pole radius per section, response deviation in dB, stability decided on the integer codes, and the
 * traps (zero numerator, pole on or outside the unit circle, coefficient overflow) in plain words.
 */
export function quantizeSections(sections: readonly Sos[], fx: CoefficientFormat): QuantizedFilter {
  validate(sections, fx);
  const fractionBits = resolveFractionBits(sections, fx);
  const format = qFormat(fx.coefficientBits, fractionBits);
  const traps: QuantizationTrap[] = [];
  const out = sections.map((s, index) => quantizeOne(s, index, fx, fractionBits, traps));
  const quantized = out.map((q) => q.quantized);
  return {
    format,
    fractionBitsAuto: fx.coefficientFractionBits === 'auto',
    rounding: fx.rounding,
    overflow: fx.overflow,
    sections: out,
    maxDeviationDb: maxResponseDeviationDb(sections, quantized, DEVIATION_BAND_DB),
    deviationBandDb: DEVIATION_BAND_DB,
    stable: out.every((q) => q.stability === 'stable' || q.stability === 'integrator'),
    traps,
  };
}

function quantizeOne(
  s: Sos,
  index: number,
  fx: CoefficientFormat,
  fractionBits: number,
  traps: QuantizationTrap[],
): QuantizedSection {
  const values = coefficientValues(s);
  const coefficients: QuantizedCoefficient[] = values.map((value, k) => {
    const q = quantizeValue(value, fx.coefficientBits, fractionBits, fx.rounding, fx.overflow);
    return { name: NAMES[k] as CoefficientName, value, ...q };
  });
  const codes = Object.fromEntries(coefficients.map((c) => [c.name, c.code])) as Record<CoefficientName, number>;
  const qv = coefficients.map((c) => c.quantizedValue) as [number, number, number, number, number];
  const quantized: Sos = { b: [qv[0], qv[1], qv[2]], a: [1, qv[3], qv[4]] };
  const numeratorZero = codes.b0 === 0 && codes.b1 === 0 && codes.b2 === 0;
  const stability = sectionStabilityFromCodes(codes.a1, codes.a2, fractionBits, hasIntegratorPole(s.a[1], s.a[2]));
  const section: QuantizedSection = {
    index,
    codes,
    coefficients,
    quantized,
    reference: s,
    poleRadius: sectionPoleRadius(qv[3], qv[4]),
    referencePoleRadius: sectionPoleRadius(s.a[1], s.a[2]),
    stability,
    numeratorZero,
  };
  collectTraps(section, fx, fractionBits, traps);
  return section;
}

function collectTraps(q: QuantizedSection, fx: CoefficientFormat, fractionBits: number, traps: QuantizationTrap[]): void {
  const where = `section ${q.index + 1}`;
  for (const c of q.coefficients) {
    if (!c.overflowed) continue;
    const fmt = qFormat(fx.coefficientBits, fractionBits);
    traps.push({
      kind: 'coefficient-overflow',
      section: q.index,
      coefficient: c.name,
      message: `${where}: ${c.name} = ${c.value.toPrecision(8)} does not fit a ${fx.coefficientBits}-bit word with ${fractionBits} fraction bits (range ${fmt.minValue} to ${fmt.maxValue}); ${fx.overflow === 'saturate' ? 'saturated' : 'wrapped'} to ${c.quantizedValue.toPrecision(8)}`,
    });
  }
  if (q.numeratorZero) {
    const smallest = Math.min(...q.reference.b.filter((v) => v !== 0).map(Math.abs));
    const needed = Number.isFinite(smallest) ? Math.ceil(-Math.log2(smallest)) + 1 : fractionBits;
    traps.push({
      kind: 'numerator-zero',
      section: q.index,
      message: `${where}: every numerator coefficient quantises to 0 with ${fractionBits} fraction bits, so the section passes nothing (smallest |b| = ${smallest.toPrecision(4)} needs about ${needed} fraction bits)`,
    });
  }
  // The radii are written out only for a trap (number formatting is slow, slowest on its first use).
  if (q.stability === 'on-circle') {
    traps.push({ kind: 'pole-on-circle', section: q.index, message: `${where}: quantisation puts a pole on the unit circle, ${radiusText(q)}; the section no longer decays` });
  } else if (q.stability === 'outside') {
    traps.push({ kind: 'pole-outside-circle', section: q.index, message: `${where}: quantisation pushes a pole outside the unit circle, ${radiusText(q)}; the section is unstable` });
  }
}

function radiusText(q: QuantizedSection): string {
  return `quantised pole radius ${q.poleRadius.toPrecision(10)} (unquantised ${q.referencePoleRadius.toPrecision(10)})`;
}
