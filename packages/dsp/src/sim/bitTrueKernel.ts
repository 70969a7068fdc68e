/**
 * The bit-true loop, one sample at a time, exactly as packages/dsp/README.md ("Bit-true arithmetic")
 * defines it and bench/loop.c implements it. Hot loop: typed arrays, integers held exactly in float64
 * or int32, no objects or BigInt per sample. Phase accumulators of N ≤ 32 bits are one uint32; wider
 * ones are split into hi (N − 32 bits) and lo (32 bits) words.
 */
import type { BitTruePlan, BitTrueRecord } from '../types/sim.ts';
import { applyOverflow, roundReal } from '../fixed/rounding.ts';

export interface BitTrueState {
  phaseHi: number;
  phaseLo: number;
  /** Per section: x[n−1], x[n−2], y[n−1], y[n−2] (D-bit codes). */
  readonly sections: Float64Array;
}

/** Writable per-sample outputs of one chunk (the record's layout without the input). */
export type BitTrueChunkOut = Omit<BitTrueRecord, 'length' | 'inputCode'>;

/** Rounding modes as small integers for the hot loop. */
const MODE = { truncate: 0, nearest: 1, 'half-even': 2 } as const;

interface Consts {
  readonly mode: number;
  readonly wrap: boolean;
  readonly dMin: number;
  readonly dMax: number;
  readonly dWrapShift: number;
  readonly ncoScale: number;
  readonly ncoInv: number;
  readonly ncoHalf: number;
  readonly cScale: number;
  readonly cInv: number;
  readonly cHalf: number;
  readonly macCheck: boolean;
  readonly macMin: number;
  readonly macMax: number;
  readonly macSpan: number;
  readonly sectionCount: number;
  readonly coef: Float64Array;
  readonly gainCode: number;
  readonly gainShift: number;
  readonly gScale: number;
  readonly gInv: number;
  readonly gHalf: number;
}

export function initialBitTrueState(plan: BitTruePlan): BitTrueState {
  return { phaseHi: 0, phaseLo: 0, sections: new Float64Array(4 * plan.sectionCount) };
}

function consts(plan: BitTruePlan): Consts {
  const d = plan.dataBits;
  const fc = plan.coefficientFractionBits;
  const b = plan.amplitudeBits;
  const gs = plan.control.gainShift;
  // The exact sum of five products is below 2^(Wc + D + 1); a wider MAC word can never overflow.
  const macCheck = plan.macBits < plan.coefficientBits + plan.dataBits + 1;
  return {
    mode: MODE[plan.rounding],
    wrap: plan.overflow === 'wrap',
    dMin: -(2 ** (d - 1)),
    dMax: 2 ** (d - 1) - 1,
    dWrapShift: 32 - d,
    ncoScale: 2 ** (b - 1),
    ncoInv: 2 ** -(b - 1),
    ncoHalf: 2 ** (b - 2),
    cScale: 2 ** fc,
    cInv: 2 ** -fc,
    cHalf: 2 ** (fc - 1),
    macCheck,
    macMin: macCheck ? -(2 ** (plan.macBits - 1)) : 0,
    macMax: macCheck ? 2 ** (plan.macBits - 1) - 1 : 0,
    macSpan: macCheck ? 2 ** plan.macBits : 0,
    sectionCount: plan.sectionCount,
    coef: Float64Array.from(plan.coefficientCodes),
    gainCode: plan.control.gainCode,
    gainShift: gs,
    gScale: 2 ** Math.max(gs, 0),
    gInv: 2 ** -Math.max(gs, 0),
    gHalf: 2 ** (Math.max(gs, 0) - 1),
  };
}

/** floor/round of p·2^−s for an exact integer p (scale = 2^s, inv = 2^−s, half = 2^(s−1)). */
function rsh(p: number, scale: number, inv: number, half: number, mode: number): number {
  const q = Math.floor(p * inv);
  if (mode === 0) return q;
  const r = p - q * scale;
  if (r > half) return q + 1;
  if (r < half) return q;
  if (mode === 1) return p >= 0 ? q + 1 : q;
  return (q & 1) === 0 ? q : q + 1;
}

/** Reduce to a D-bit word: clamp, or keep the low D bits (sign-extended) by a shift pair. */
function toData(v: number, k: Consts): number {
  if (v >= k.dMin && v <= k.dMax) return v;
  if (!k.wrap) return v > k.dMax ? k.dMax : k.dMin;
  return (v << k.dWrapShift) >> k.dWrapShift;
}

/** Detector: u = toData(round(x·c / 2^(B−1))). */
function detect(x: number, c: number, k: Consts): number {
  return toData(rsh(x * c, k.ncoScale, k.ncoInv, k.ncoHalf, k.mode), k);
}

/** Cascade of direct-form-I sections; returns the filter output code. */
function cascade(u: number, k: Consts, s: Float64Array): number {
  const coef = k.coef;
  let v = u;
  for (let j = 0; j < k.sectionCount; j++) {
    const o = 5 * j;
    const q = 4 * j;
    const x1 = s[q] as number;
    const x2 = s[q + 1] as number;
    const y1 = s[q + 2] as number;
    const y2 = s[q + 3] as number;
    let acc =
      (coef[o] as number) * v + (coef[o + 1] as number) * x1 + (coef[o + 2] as number) * x2 -
      (coef[o + 3] as number) * y1 - (coef[o + 4] as number) * y2;
    if (k.macCheck && (acc < k.macMin || acc > k.macMax)) {
      acc = k.wrap ? acc - Math.floor((acc - k.macMin) / k.macSpan) * k.macSpan : acc > k.macMax ? k.macMax : k.macMin;
    }
    const y = toData(rsh(acc, k.cScale, k.cInv, k.cHalf, k.mode), k);
    s[q + 1] = x1;
    s[q] = v;
    s[q + 3] = y1;
    s[q + 2] = y;
    v = y;
  }
  return v;
}

/** Tuning increment from the filter output: round(y·G·2^−S), or y·G·2^−S exactly when S < 0. */
function increment(y: number, k: Consts): number {
  const p = y * k.gainCode;
  return k.gainShift >= 0 ? rsh(p, k.gScale, k.gInv, k.gHalf, k.mode) : p * 2 ** -k.gainShift;
}

/** Run `count` samples of input codes through the loop, advancing `state`, writing `out[0..count)`. */
export function runBitTrueChunk(plan: BitTruePlan, state: BitTrueState, input: Int32Array, count: number, out: BitTrueChunkOut): void {
  if (plan.ncoAccumulatorBits <= 32) runNarrow(plan, state, input, count, out);
  else runWide(plan, state, input, count, out);
}

function runNarrow(plan: BitTruePlan, state: BitTrueState, input: Int32Array, count: number, out: BitTrueChunkOut): void {
  const k = consts(plan);
  const n = plan.ncoAccumulatorBits;
  const addrShift = n - plan.phaseBits;
  const accMask = n === 32 ? -1 : 2 ** n - 1;
  const tMask = 2 ** plan.phaseBits - 1;
  const quarter = 2 ** (plan.phaseBits - 2);
  const halfTable = 2 ** (plan.phaseBits - 1);
  const square = plan.waveform === 'square';
  const fs = plan.ncoFullScale;
  const table = plan.sineTable;
  const m = plan.tuning.tuningWordLo;
  const s = state.sections;
  let acc = state.phaseLo;
  for (let i = 0; i < count; i++) {
    const addr = ((acc >>> addrShift) + quarter) & tMask;
    const c = square ? (addr < halfTable ? fs : -fs) : (table[addr] as number);
    const u = detect(input[i] as number, c, k);
    const y = cascade(u, k, s);
    out.phaseHi[i] = 0;
    out.phaseLo[i] = acc;
    out.tableAddress[i] = addr;
    out.ncoCode[i] = c;
    out.detectorCode[i] = u;
    out.filterCode[i] = y;
    acc = ((acc + m + (increment(y, k) | 0)) & accMask) >>> 0;
  }
  state.phaseLo = acc;
}

function runWide(plan: BitTruePlan, state: BitTrueState, input: Int32Array, count: number, out: BitTrueChunkOut): void {
  const k = consts(plan);
  const hiBits = plan.ncoAccumulatorBits - 32;
  const p = plan.phaseBits;
  const hiMask = hiBits === 32 ? -1 : 2 ** hiBits - 1;
  const tMask = 2 ** p - 1;
  const quarter = 2 ** (p - 2);
  const halfTable = 2 ** (p - 1);
  const square = plan.waveform === 'square';
  const fs = plan.ncoFullScale;
  const table = plan.sineTable;
  const mHi = plan.tuning.tuningWordHi;
  const mLo = plan.tuning.tuningWordLo;
  const s = state.sections;
  let hi = state.phaseHi;
  let lo = state.phaseLo;
  for (let i = 0; i < count; i++) {
    // Top P bits of the N-bit accumulator: from hi alone, or hi's bits above lo's top bits.
    const raw = p <= hiBits ? hi >>> (hiBits - p) : (hi << (p - hiBits)) | (lo >>> (32 - p + hiBits));
    const addr = (raw + quarter) & tMask;
    const c = square ? (addr < halfTable ? fs : -fs) : (table[addr] as number);
    const u = detect(input[i] as number, c, k);
    const y = cascade(u, k, s);
    out.phaseHi[i] = hi;
    out.phaseLo[i] = lo;
    out.tableAddress[i] = addr;
    out.ncoCode[i] = c;
    out.detectorCode[i] = u;
    out.filterCode[i] = y;
    const d = increment(y, k);
    // d mod 2^N as words: ToUint32 is modular for any integer double, floor(d·2^−32) is exact.
    const sumLo = lo + mLo + (d >>> 0);
    const carry = Math.floor(sumLo * 2.3283064365386963e-10);
    lo = sumLo >>> 0;
    hi = ((hi + mHi + (Math.floor(d * 2.3283064365386963e-10) | 0) + carry) & hiMask) >>> 0;
  }
  state.phaseHi = hi;
  state.phaseLo = lo;
}

/** Quantise input sample values to D-bit codes: round(x·2^(D−1)) in the spec's mode, saturating (an ADC clips). */
export function quantizeInput(plan: BitTruePlan, x: Float64Array, count: number, out: Int32Array): void {
  const scale = 2 ** (plan.dataBits - 1);
  for (let i = 0; i < count; i++) out[i] = applyOverflow(roundReal((x[i] as number) * scale, plan.rounding), plan.dataBits, 'saturate');
}
