/**
 * Seeded random loop specs for the reference-RTL tests. Every case is valid by construction and the
 * list covers, in its first cases, what the RTL must get right: 8- to 32-bit data and coefficient
 * words, 32/48/64-bit NCO accumulators, each rounding and overflow mode, the square NCO, PI,
 * lag-lead, single-pole and order-4 Butterworth loop filters with and without an order-4 ripple
 * filter, and MAC words both narrower and wider than Wc + D + 1. Invented data (no source).
 */
import { mainsSyncSpec, mulberry32, ultrasonicLagLeadSpec, ultrasonicSinglePoleSpec, ifFmDemodSpec, type LoopSpec } from '@loopwright/dsp';

const ROUNDING = ['truncate', 'nearest', 'half-even'] as const;
const OVERFLOW = ['saturate', 'wrap'] as const;
const NCO_BITS = [32, 48, 64] as const;
/** (data, coefficient) widths: the bit-true model needs D + Wc ≤ 52. */
const WIDTHS: readonly (readonly [number, number])[] = [
  [8, 8], [32, 20], [12, 32], [16, 18], [24, 24], [8, 16], [20, 32], [32, 12], [10, 14], [18, 22],
];
type FilterCase = Pick<LoopSpec, 'filter' | 'rippleFilter' | 'sampleRateHz' | 'clockHz' | 'centerHz' | 'input' | 'discretization'> & { readonly gainHzPerUnit: number };

const FILTERS: readonly FilterCase[] = [
  { ...pick(mainsSyncSpec), filter: { kind: 'pi', naturalHz: 5, damping: 0.707 }, rippleFilter: { order: 2, cutoffHz: 40 }, gainHzPerUnit: 20 },
  { ...pick(ultrasonicLagLeadSpec), filter: ultrasonicLagLeadSpec.filter, rippleFilter: { order: 4, cutoffHz: 8000 }, gainHzPerUnit: 2000 },
  { ...pick(ifFmDemodSpec), filter: { kind: 'butterworth', order: 4, cutoffHz: 800e3 }, rippleFilter: { order: 4, cutoffHz: 2e6 }, gainHzPerUnit: 800e3 },
  { ...pick(ultrasonicSinglePoleSpec), filter: ultrasonicSinglePoleSpec.filter, rippleFilter: null, gainHzPerUnit: 2000 },
  { ...pick(mainsSyncSpec), filter: { kind: 'lag-lead', naturalHz: 5, damping: 0.8 }, rippleFilter: null, gainHzPerUnit: 20 },
  { ...pick(ifFmDemodSpec), filter: { kind: 'butterworth', order: 3, cutoffHz: 500e3 }, rippleFilter: null, gainHzPerUnit: 800e3 },
];

function pick(s: LoopSpec) {
  return { sampleRateHz: s.sampleRateHz, clockHz: s.clockHz, centerHz: s.centerHz, input: s.input, discretization: s.discretization };
}

/** `count` specs, the same for the same seed. */
export function randomRtlSpecs(count: number, seed = 20261202): { id: string; spec: LoopSpec }[] {
  const rand = mulberry32(seed);
  const int = (lo: number, hi: number) => lo + Math.floor(rand() * (hi - lo + 1));
  return Array.from({ length: count }, (_, i) => {
    const [dataBits, coefficientBits] = WIDTHS[i % WIDTHS.length]!;
    const f = FILTERS[i % FILTERS.length]!;
    const { gainHzPerUnit, ...rates } = f;
    const ncoBits = NCO_BITS[i % NCO_BITS.length]!;
    const amplitudeBits = Math.min(int(6, 20), 53 - dataBits);
    const exact = coefficientBits + dataBits + 1;
    // Alternate a MAC word narrower than the exact sum (reduced as the model does) and a wide one.
    const accumulatorBits = i % 2 === 0 ? Math.max(dataBits, coefficientBits) + int(2, 8) : Math.min(64, exact + int(0, 12));
    const spec: LoopSpec = {
      specVersion: 1,
      name: `rand_${i}`,
      ...rates,
      detector: { kind: 'multiplier' },
      nco: { accumulatorBits: ncoBits, phaseBits: int(4, 11), amplitudeBits, gainHzPerUnit, waveform: i % 5 === 3 ? 'square' : 'sine' },
      fixedPoint: {
        coefficientBits,
        coefficientFractionBits: 'auto',
        dataBits,
        accumulatorBits: Math.min(64, Math.max(accumulatorBits, dataBits, coefficientBits)),
        rounding: ROUNDING[i % 3]!,
        overflow: OVERFLOW[Math.floor(i / 3) % 2]!,
      },
    };
    return { id: `random ${i}: ${f.filter.kind}${f.rippleFilter ? `+ripple${f.rippleFilter.order}` : ''}, D=${dataBits}, Wc=${coefficientBits}, Wa=${spec.fixedPoint.accumulatorBits}, N=${ncoBits}, ${spec.fixedPoint.rounding}/${spec.fixedPoint.overflow}, ${spec.nco.waveform}`, spec };
  });
}
