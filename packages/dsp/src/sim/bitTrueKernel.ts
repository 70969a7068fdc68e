/**
 * The bit-true loop, one sample at a time, exactly as packages/dsp/README.md ("Bit-true arithmetic")
 * defines it and bench/loop.c implements it. Hot loop: typed arrays, integers held exactly in float64
 * or int32, no objects or BigInt per sample. Phase accumulators of N ≤ 32 bits are one uint32; wider
 * ones are split into hi (N − 32 bits) and lo (32 bits) words.
 */
import type { BitTruePlan, BitTrueRecord } from '../types/sim.ts';
import { CHECKSUM_BASIS } from './checksum.ts';

export interface BitTrueState {
  phaseHi: number;
  phaseLo: number;
  /** Running FNV-1a checksum of the record so far (src/sim/checksum.ts). */
  checksum: number;
  /** Per section: x[n−1], x[n−2], y[n−1], y[n−2] (D-bit codes). */
  readonly sections: Float64Array;
}

/** Writable per-sample outputs of one chunk (the record's layout without the input). */
export type BitTrueChunkOut = Omit<BitTrueRecord, 'length' | 'inputCode'>;

/** Rounding modes as small integers for the hot loop. */
export const MODE = { truncate: 0, nearest: 1, 'half-even': 2 } as const;
const FNV_PRIME = 16777619;
const TWO_POW_M32 = 2 ** -32;

export function initialBitTrueState(plan: BitTruePlan): BitTrueState {
  return { phaseHi: 0, phaseLo: 0, sections: new Float64Array(4 * plan.sectionCount), checksum: CHECKSUM_BASIS };
}

/**
 * Round t = p·2^−s to an integer, p an exact integer below 2^52 so t and t ± 0.5 are exact:
 * mode 1 ties away from zero, mode 2 ties to even (mode 0, floor, is inlined by the caller).
 */
export function roundScaled(t: number, mode: number): number {
  if (mode === 1) return t >= 0 ? Math.floor(t + 0.5) : -Math.floor(0.5 - t);
  const h = t + 0.5;
  const q = Math.floor(h);
  return q === h && (q & 1) !== 0 ? q - 1 : q;
}

/**
 * Run `count` samples of input codes through the loop, advancing `state` (phase, section states and
 * the running record checksum), writing `out[0..count)`. One loop for every width: the phase
 * accumulator is one uint32 word when N ≤ 32 (`wide` false) and hi/lo words otherwise.
 */
export function runBitTrueChunk(plan: BitTruePlan, state: BitTrueState, input: Int32Array, count: number, out: BitTrueChunkOut): void {
  const mode: number = MODE[plan.rounding];
  const wrap = plan.overflow === 'wrap';
  const dMin = -(2 ** (plan.dataBits - 1));
  const dMax = 2 ** (plan.dataBits - 1) - 1;
  const dShift = 32 - plan.dataBits;
  const ncoInv = 2 ** -(plan.amplitudeBits - 1);
  const cInv = 2 ** -plan.coefficientFractionBits;
  const gainCode = plan.control.gainCode;
  const gainShift = plan.control.gainShift;
  const gInv = 2 ** -gainShift;
  // The exact sum of five products is below 2^(Wc + D + 1); a wider MAC word can never overflow.
  const macCheck = plan.accumulatorBits < plan.coefficientBits + plan.dataBits + 1;
  const macMin = -(2 ** (plan.accumulatorBits - 1));
  const macMax = 2 ** (plan.accumulatorBits - 1) - 1;
  const macSpan = 2 ** plan.accumulatorBits;
  const sections = plan.sectionCount;
  const coef = Float64Array.from(plan.coefficientCodes);
  const s = state.sections;
  const n = plan.ncoAccumulatorBits;
  const p = plan.phaseBits;
  const wide = n > 32;
  const hiBits = wide ? n - 32 : 0;
  const addrShift = wide ? 0 : n - p;
  const loMask = n >= 32 ? -1 : 2 ** n - 1;
  const hiMask = hiBits === 32 ? -1 : 2 ** hiBits - 1;
  const tMask = 2 ** p - 1;
  const quarter = 2 ** (p - 2);
  const halfTable = 2 ** (p - 1);
  const square = plan.waveform === 'square';
  const fullScale = plan.ncoFullScale;
  const table = plan.sineTable;
  const mHi = plan.tuning.tuningWordHi;
  const mLo = plan.tuning.tuningWordLo;
  const { phaseHi, phaseLo, tableAddress, ncoCode, detectorCode, filterCode } = out;
  let hi = state.phaseHi;
  let lo = state.phaseLo | 0;
  let h = state.checksum | 0;
  for (let i = 0; i < count; i++) {
    // Table address: the top P bits of the accumulator, plus a quarter turn so the sine table gives cos.
    let raw: number;
    if (!wide) raw = lo >>> addrShift;
    else raw = p <= hiBits ? hi >>> (hiBits - p) : (hi << (p - hiBits)) | (lo >>> (32 - p + hiBits));
    const addr = (raw + quarter) & tMask;
    const c = square ? (addr < halfTable ? fullScale : -fullScale) : (table[addr] as number);
    const x = input[i] as number;
    // Detector: u = round(x·c / 2^(B−1)), reduced to D bits.
    const tu = x * c * ncoInv;
    let u = mode === 0 ? Math.floor(tu) : roundScaled(tu, mode);
    if (u > dMax || u < dMin) u = wrap ? (u << dShift) >> dShift : u > dMax ? dMax : dMin;
    // Loop filter: direct-form-I sections, MAC exact in float64, reduced to Wa bits, rounded by Fc.
    let v = u;
    for (let j = 0; j < sections; j++) {
      const o = 5 * j;
      const q = 4 * j;
      const x1 = s[q] as number;
      const y1 = s[q + 2] as number;
      let a =
        (coef[o] as number) * v + (coef[o + 1] as number) * x1 + (coef[o + 2] as number) * (s[q + 1] as number) -
        (coef[o + 3] as number) * y1 - (coef[o + 4] as number) * (s[q + 3] as number);
      if (macCheck && (a < macMin || a > macMax)) {
        a = wrap ? a - Math.floor((a - macMin) / macSpan) * macSpan : a > macMax ? macMax : macMin;
      }
      const ty = a * cInv;
      let y = mode === 0 ? Math.floor(ty) : roundScaled(ty, mode);
      if (y > dMax || y < dMin) y = wrap ? (y << dShift) >> dShift : y > dMax ? dMax : dMin;
      s[q + 1] = x1;
      s[q] = v;
      s[q + 3] = y1;
      s[q + 2] = y;
      v = y;
    }
    phaseHi[i] = hi;
    phaseLo[i] = lo;
    tableAddress[i] = addr;
    ncoCode[i] = c;
    detectorCode[i] = u;
    filterCode[i] = v;
    h = Math.imul(h ^ x, FNV_PRIME);
    h = Math.imul(h ^ hi, FNV_PRIME);
    h = Math.imul(h ^ lo, FNV_PRIME);
    h = Math.imul(h ^ addr, FNV_PRIME);
    h = Math.imul(h ^ c, FNV_PRIME);
    h = Math.imul(h ^ u, FNV_PRIME);
    h = Math.imul(h ^ v, FNV_PRIME);
    // Tuning increment Δ = round(y·G·2^−S) (S > 0) or y·G·2^−S exactly (S ≤ 0); phase += M + Δ mod 2^N.
    const tg = v * gainCode * gInv;
    const d = gainShift <= 0 ? tg : mode === 0 ? Math.floor(tg) : roundScaled(tg, mode);
    if (!wide) {
      lo = (lo + mLo + (d | 0)) & loMask;
    } else {
      // d mod 2^N as words: ToUint32 is modular for any integer double, floor(d·2^−32) is exact.
      const sumLo = (lo >>> 0) + mLo + (d >>> 0);
      const carry = Math.floor(sumLo * TWO_POW_M32);
      lo = sumLo | 0;
      hi = ((hi + mHi + (Math.floor(d * TWO_POW_M32) | 0) + carry) & hiMask) >>> 0;
    }
  }
  state.phaseHi = hi;
  state.phaseLo = lo >>> 0;
  state.checksum = h >>> 0;
}

/**
 * Quantise input sample values to D-bit codes: round(x·2^(D−1)) in the spec's mode, saturating (an ADC
 * clips) — roundReal and applyOverflow (src/fixed/rounding.ts) written out for the per-sample loop:
 * v − floor(v) is exact, so ties are found exactly.
 */
export function quantizeInput(plan: BitTruePlan, x: Float64Array, count: number, out: Int32Array): void {
  const scale = 2 ** (plan.dataBits - 1);
  const max = scale - 1;
  const min = -scale;
  const mode: number = MODE[plan.rounding];
  for (let i = 0; i < count; i++) {
    const v = (x[i] as number) * scale;
    let q = Math.floor(v);
    if (mode !== 0) {
      const r = v - q;
      if (r > 0.5 || (r === 0.5 && (mode === 1 ? v >= 0 : q % 2 !== 0))) q += 1;
    }
    out[i] = q > max ? max : q < min ? min : q;
  }
}
