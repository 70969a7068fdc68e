/**
 * Frequency responses of filters and of the open loop (DESIGN.md conventions):
 *   analog   L(jω) = Kd·Ko·F(jω)/(jω)
 *   discrete L(z)  = Kd·F(z)·Ko·T·z⁻¹/(1 − z⁻¹),  z = exp(j2πf/fs), the NCO being an accumulator with
 *   one sample of delay at the loop rate. Note z⁻¹/(1 − z⁻¹) = 1/(z − 1).
 */
import type { AnalogTf, DigitalTf, Sos } from '../types/filter.ts';
import { type Complex, cdiv, cexpj, cmul } from '../filters/complex.ts';
import { polyvalAscending } from '../filters/polynomial.ts';
import { unitCirclePoint } from '../filters/sections.ts';
import { doubles } from './grid.ts';
import type { GridKernelLoop } from './wasm/gridKernel.ts';

/** A digital filter in either representation. */
export type DigitalFilter = DigitalTf | readonly Sos[];

/** Complex response as a function of frequency in Hz. */
export type ResponseFn = (freqHz: number) => Complex;

/**
 * A response that can also fill a whole grid at once: re[i] + j·im[i] = fn(grid[i]), the same doubles,
 * without an object per point (and, for sections, with the grid's cos/sin made once: unitCircleGrid).
 */
export interface GridResponseFn extends ResponseFn {
  readonly fill?: (grid: readonly number[], re: number[], im: number[]) => void;
  /** The same response for the grid module (wasm/gridKernel.ts), which fills a grid with the same doubles. */
  readonly kernel?: GridKernelLoop;
}

/** Two-slot scratch of a complex product (re, im), reused by every evaluation below (single-threaded, never re-entered). */
const PAIR = new Float64Array(2);

/**
 * The coefficients of analog sections, flat: for each section its numerator then its denominator
 * (highest power first), with their lengths in `lengths` (read once per response, not once per point).
 */
interface AnalogCoefficients {
  readonly values: Float64Array;
  readonly lengths: Int32Array;
}

function analogCoefficients(sections: readonly AnalogTf[]): AnalogCoefficients {
  let size = 0;
  for (const tf of sections) size += tf.num.length + tf.den.length;
  const values = new Float64Array(size);
  const lengths = new Int32Array(2 * sections.length);
  let at = 0;
  for (let s = 0; s < sections.length; s++) {
    const { num, den } = sections[s]!;
    lengths[2 * s] = num.length;
    lengths[2 * s + 1] = den.length;
    for (let i = 0; i < num.length; i++) values[at++] = num[i]!;
    for (let i = 0; i < den.length; i++) values[at++] = den[i]!;
  }
  return { values, lengths };
}

/**
 * product ← product · n/d for the complex product held in product[0] + j·product[1], n = nr + j·ni,
 * d = dr + j·di: the quotient as cdiv and the product as cmul compute them (filters/complex.ts), the same
 * operations in the same order written out on numbers, so the same doubles without an object per step.
 */
function multiplyByQuotient(product: Float64Array, nr: number, ni: number, dr: number, di: number): void {
  const d = dr * dr + di * di;
  const qr = (nr * dr + ni * di) / d;
  const qi = (ni * dr - nr * di) / d;
  const hr = product[0]!;
  const hi = product[1]!;
  product[0] = hr * qr - hi * qi;
  product[1] = hr * qi + hi * qr;
}

/**
 * out ← Π N_i(jω)/D_i(jω) over the sections: each polynomial by Horner's rule in jω, each quotient and
 * product by multiplyByQuotient (the innermost loop of every grid and root search: no object per step).
 */
function analogProductAt(c: AnalogCoefficients, w: number, out: Float64Array): void {
  const { values, lengths } = c;
  out[0] = 1;
  out[1] = 0;
  let at = 0;
  for (let s = 0; s < lengths.length; s += 2) {
    let nr = 0;
    let ni = 0;
    for (const end = at + lengths[s]!; at < end; at++) {
      const t = -ni * w + values[at]!; // (nr + j·ni)·(jω) + c
      ni = nr * w;
      nr = t;
    }
    let dr = 0;
    let di = 0;
    for (const end = at + lengths[s + 1]!; at < end; at++) {
      const t = -di * w + values[at]!;
      di = dr * w;
      dr = t;
    }
    multiplyByQuotient(out, nr, ni, dr, di);
  }
}

/** F(jω) of analog sections (or one transfer function) at freqHz. */
export function analogResponse(sections: readonly AnalogTf[], freqHz: number): Complex {
  analogProductAt(analogCoefficients(sections), 2 * Math.PI * freqHz, PAIR);
  return { re: PAIR[0]!, im: PAIR[1]! };
}

/** b0, b1, b2, a0, a1, a2 of every section, flat (read once per response, not once per point). */
function sectionCoefficients(filter: readonly Sos[]): Float64Array {
  const coef = new Float64Array(6 * filter.length);
  for (let j = 0; j < filter.length; j++) {
    const { b, a } = filter[j]!;
    coef[6 * j] = b[0];
    coef[6 * j + 1] = b[1];
    coef[6 * j + 2] = b[2];
    coef[6 * j + 3] = a[0];
    coef[6 * j + 4] = a[1];
    coef[6 * j + 5] = a[2];
  }
  return coef;
}

/**
 * out ← Π N_i/D_i of the sections at z = e^{jω} given as cos ω, sin ω, cos 2ω, sin 2ω: each section as
 * sectionOnUnitCircle (filters/sections.ts) evaluates it, P(e^{−jω}) = p0 + p1·e^{−jω} + p2·e^{−j2ω},
 * and the quotient and product by multiplyByQuotient (so the same doubles as cdiv and cmul, several
 * times faster than through scratch objects).
 */
function sectionsProductAt(coef: Float64Array, c1: number, s1: number, c2: number, s2: number, out: Float64Array): void {
  out[0] = 1;
  out[1] = 0;
  for (let o = 0; o < coef.length; o += 6) {
    const nr = coef[o]! + coef[o + 1]! * c1 + coef[o + 2]! * c2;
    const ni = -(coef[o + 1]! * s1 + coef[o + 2]! * s2);
    const dr = coef[o + 3]! + coef[o + 4]! * c1 + coef[o + 5]! * c2;
    const di = -(coef[o + 4]! * s1 + coef[o + 5]! * s2);
    multiplyByQuotient(out, nr, ni, dr, di);
  }
}

/** H(e^{jωT}) of a digital filter at freqHz for the sample rate fs. */
export function digitalResponse(filter: DigitalFilter, freqHz: number, sampleRateHz: number): Complex {
  const omega = (2 * Math.PI * freqHz) / sampleRateHz;
  if (!isSections(filter)) {
    const w = cexpj(-omega); // z⁻¹ on the unit circle
    return cdiv(polyvalAscending(filter.b, w), polyvalAscending(filter.a, w));
  }
  const p = unitCirclePoint(omega);
  sectionsProductAt(sectionCoefficients(filter), p.c1, p.s1, p.c2, p.s2, PAIR);
  return { re: PAIR[0]!, im: PAIR[1]! };
}

export function isSections(filter: DigitalFilter): filter is readonly Sos[] {
  return Array.isArray(filter);
}

/**
 * A response that stays finite: exactly on a pole (a quantised pole can land on the unit circle at a
 * grid frequency) the value is taken a relative 1e-9 beside it, where it is huge but finite and its
 * phase is meaningful.
 */
function finite(fn: ResponseFn, at?: GridPointFn, prepare?: (grid: readonly number[]) => void, kernel?: GridKernelLoop): GridResponseFn {
  const safe = finiteValue(fn);
  if (!at) return safe;
  return Object.assign(safe, { fill: gridFill(safe, at, prepare), kernel });
}

/** A response's value at one grid point i of frequency freqHz, written into out. */
type GridPointFn = (freqHz: number, i: number, out: { re: number; im: number }) => void;

// The closures below are made by functions that return them, not bound to names: where the code runs
// under tsx (the server, the bench), which keeps names, each named closure has its name defined when it
// is made (Object.defineProperty, about 0.4 µs), and every response made them afresh.

/** fn(f), or its value a relative 1e-9 below f where that is not finite (see finite). */
function finiteValue(fn: ResponseFn): ResponseFn {
  return (f: number): Complex => {
    const h = fn(f);
    if (Number.isFinite(h.re) && Number.isFinite(h.im)) return h;
    const g = fn(f * (1 - 1e-9));
    return Number.isFinite(g.re) && Number.isFinite(g.im) ? g : { re: 1e300, im: 0 };
  };
}

/** fn(f) is at(f) on one scratch; the grid takes the same values and falls back to safe() where they are not finite. */
function gridFill(safe: ResponseFn, at: GridPointFn, prepare?: (grid: readonly number[]) => void): NonNullable<GridResponseFn['fill']> {
  return (grid: readonly number[], re: number[], im: number[]) => {
    prepare?.(grid);
    const v = GRID_VALUE;
    for (let i = 0; i < grid.length; i++) {
      at(grid[i]!, i, v);
      if (Number.isFinite(v.re) && Number.isFinite(v.im)) {
        re[i] = v.re;
        im[i] = v.im;
      } else {
        const g = safe(grid[i]!);
        re[i] = g.re;
        im[i] = g.im;
      }
    }
  };
}

/** Scratch of one grid value in finite's fill (single-threaded, never re-entered). */
const GRID_VALUE = { re: 0, im: 0 };

/** Analog open loop K·F(jω)/(jω) with K = Kd·Ko. */
export function analogLoopResponse(sections: readonly AnalogTf[], kRadPerS: number): GridResponseFn {
  const coefficients = analogCoefficients(sections);
  const at = analogLoopAt(coefficients, kRadPerS);
  return finite(
    (f) => {
      const out = { re: 0, im: 0 };
      at(f, -1, out);
      return out;
    },
    at,
    undefined,
    { kind: 'analog', values: coefficients.values, lengths: coefficients.lengths, kRadPerS },
  );
}

/** K·F(jω)/(jω) at f: cscale(F, K/ω), then divided by j (the operations of cscale on the product, in its order). */
function analogLoopAt(coefficients: AnalogCoefficients, kRadPerS: number): GridPointFn {
  return (f: number, _i: number, out: { re: number; im: number }) => {
    const w = 2 * Math.PI * f;
    analogProductAt(coefficients, w, PAIR);
    const scale = kRadPerS / w;
    const sr = PAIR[0]! * scale;
    const si = PAIR[1]! * scale;
    out.re = si;
    out.im = -sr;
  };
}

/** cos ω, sin ω, cos 2ω, sin 2ω (ω = 2πf/fs) of every grid point, as unitCirclePoint gives them. */
export interface UnitCircleGrid {
  readonly sampleRateHz: number;
  readonly c1: readonly number[];
  readonly s1: readonly number[];
  readonly c2: readonly number[];
  readonly s2: readonly number[];
}

/** The last grids' unit-circle points: the designed and the quantised loop share one grid, so the trig is done once. */
const UNIT_CIRCLE = new WeakMap<readonly number[], UnitCircleGrid>();

export function unitCircleGrid(grid: readonly number[], sampleRateHz: number): UnitCircleGrid {
  const known = UNIT_CIRCLE.get(grid);
  if (known && known.sampleRateHz === sampleRateHz && known.c1.length === grid.length) return known;
  const n = grid.length;
  const u = { sampleRateHz, c1: doubles(n), s1: doubles(n), c2: doubles(n), s2: doubles(n) };
  for (let i = 0; i < n; i++) {
    const p = unitCirclePoint((2 * Math.PI * grid[i]!) / sampleRateHz);
    u.c1[i] = p.c1;
    u.s1[i] = p.s1;
    u.c2[i] = p.c2;
    u.s2[i] = p.s2;
  }
  UNIT_CIRCLE.set(grid, u);
  return u;
}

/** K·T·F(z)/(z − 1) of sections at the unit-circle point (c1, s1, c2, s2), into out (see discreteLoopResponse). */
function discreteSectionsAt(coef: Float64Array, kt: number, c1: number, s1: number, c2: number, s2: number, out: { re: number; im: number }): void {
  // nco = kt/(z − 1): cdiv({kt, 0}, {c1 − 1, s1}) written out.
  const br = c1 - 1;
  const bi = s1;
  const d = br * br + bi * bi;
  const ncoRe = (kt * br + 0 * bi) / d;
  const ncoIm = (0 * br - kt * bi) / d;
  sectionsProductAt(coef, c1, s1, c2, s2, PAIR);
  const hr = PAIR[0]!;
  const hi = PAIR[1]!;
  out.re = ncoRe * hr - ncoIm * hi;
  out.im = ncoRe * hi + ncoIm * hr;
}

/**
 * Discrete open loop K·T·F(z)/(z − 1), K = Kd·Ko, T = 1/fs. For sections the NCO's z = e^{jω} is the
 * cos ω, sin ω the sections are evaluated with (the same ω), and the quotient and product are written
 * out: the same operations, in the same order, as cdiv and cmul on objects (so the same doubles), in
 * the innermost loop of the margins, the quantised loop and the noise bandwidth. On a grid the points
 * come from unitCircleGrid (the same cos/sin).
 */
export function discreteLoopResponse(filter: DigitalFilter, kRadPerS: number, sampleRateHz: number): GridResponseFn {
  const kt = kRadPerS / sampleRateHz;
  if (!isSections(filter)) {
    return finite((f) => {
      const z = cexpj((2 * Math.PI * f) / sampleRateHz);
      const nco = cdiv({ re: kt, im: 0 }, { re: z.re - 1, im: z.im });
      return cmul(nco, digitalResponse(filter, f, sampleRateHz));
    });
  }
  const coef = sectionCoefficients(filter);
  let points: UnitCircleGrid | null = null;
  return finite(
    (f) => {
      const out = { re: 0, im: 0 };
      const p = unitCirclePoint((2 * Math.PI * f) / sampleRateHz);
      discreteSectionsAt(coef, kt, p.c1, p.s1, p.c2, p.s2, out);
      return out;
    },
    (_f, i, out) => {
      const u = points!;
      discreteSectionsAt(coef, kt, u.c1[i]!, u.s1[i]!, u.c2[i]!, u.s2[i]!, out);
    },
    (grid) => {
      points = unitCircleGrid(grid, sampleRateHz);
    },
    { kind: 'sections', coef, kt, sampleRateHz },
  );
}

/** H = L/(1 + L) from an open-loop value. */
export function closedFromOpen(l: Complex): Complex {
  return cdiv(l, { re: 1 + l.re, im: l.im });
}

/** Error transfer E = θe/θin = 1/(1 + L) = 1 − H from an open-loop value (G3 Ch. 2). */
export function errorFromOpen(l: Complex): Complex {
  return cdiv({ re: 1, im: 0 }, { re: 1 + l.re, im: l.im });
}

/** Closed-loop phase transfer H = L/(1 + L) from an open-loop response. */
export function closedLoop(open: ResponseFn): ResponseFn {
  return (f) => closedFromOpen(open(f));
}

/** Floor and ceiling of toDb: an exact zero or a pole never yields ±Infinity (or NaN) in a result. */
export const DB_FLOOR = -3000;
export const DB_CEILING = 3000;

/** 20·log10|h| in dB, within [DB_FLOOR, DB_CEILING]. */
export function toDb(h: Complex): number {
  return partsToDb(h.re, h.im);
}

/** Whether toDb takes a square p = re² + im² as 10·log10(p) (false for NaN, and near under- or overflow). */
export function squareInRange(p: number): boolean {
  return p > 1e-290 && p < 1e290;
}

/** toDb of a value whose square p = re² + im² is in range (squareInRange). */
export function squareToDb(p: number): number {
  return Math.min(Math.max(10 * Math.log10(p), DB_FLOOR), DB_CEILING);
}

/** toDb of re + j·im given as two numbers (no object in the loops below). */
export function partsToDb(re: number, im: number): number {
  // 10·log10(re² + im²) where the square neither overflows nor underflows: Math.hypot was a seventh of
  // analyzeDesign's time. Elsewhere (|h| beyond about 1e±150, clamped anyway) the magnitude itself.
  const p = re * re + im * im;
  if (squareInRange(p)) return squareToDb(p);
  const m = Math.hypot(re, im);
  if (!(m > 0)) return DB_FLOOR; // zero, or NaN from 0/0
  return Math.min(Math.max(20 * Math.log10(m), DB_FLOOR), DB_CEILING);
}

/** Open-loop samples as two arrays: l_i = re[i] + j·im[i]. */
export interface OpenSamples {
  readonly re: readonly number[];
  readonly im: readonly number[];
}

/**
 * toDb(N/(1 + l)) for every open-loop sample l, with N = l (closed loop) or N = 1 (error transfer); the
 * quotient written out as cdiv computes it (the same operations in the same order, so the same doubles)
 * without two objects per sample: this runs on the 600-point grids of the analysis.
 */
function quotientDbOfOpen(open: OpenSamples, numeratorIsOpen: boolean): number[] {
  const { re, im } = open;
  const out = doubles(re.length);
  for (let i = 0; i < re.length; i++) {
    quotientOfOpen(re[i]!, im[i]!, numeratorIsOpen);
    out[i] = partsToDb(PAIR[0]!, PAIR[1]!);
  }
  return out;
}

/** PAIR ← N/(1 + l) for l = lr + j·li, N = l or 1, as cdiv computes it. */
function quotientOfOpen(lr: number, li: number, numeratorIsOpen: boolean): void {
  const nr = numeratorIsOpen ? lr : 1;
  const ni = numeratorIsOpen ? li : 0;
  const br = 1 + lr;
  const bi = li;
  const d = br * br + bi * bi;
  PAIR[0] = (nr * br + ni * bi) / d;
  PAIR[1] = (ni * br - nr * bi) / d;
}

/**
 * The squares re² + im² of closedFromOpen(l) for every open-loop sample, the ones toDb takes the
 * logarithm of (closedDbOfOpen's values are squareToDb of them); null when one is out of range
 * (squareInRange), where toDb works from the magnitude instead. For closed-loop figures read off
 * the squares without a logarithm per point (closedLoopFigures.ts).
 */
export function closedSquaresOfOpen(open: OpenSamples): number[] | null {
  const { re, im } = open;
  const out = doubles(re.length);
  for (let i = 0; i < re.length; i++) {
    quotientOfOpen(re[i]!, im[i]!, true);
    const p = PAIR[0]! * PAIR[0]! + PAIR[1]! * PAIR[1]!;
    if (!squareInRange(p)) return null;
    out[i] = p;
  }
  return out;
}

/** toDb(closedFromOpen(l)) for every open-loop sample. */
export function closedDbOfOpen(open: OpenSamples): number[] {
  return quotientDbOfOpen(open, true);
}

/** toDb(errorFromOpen(l)) for every open-loop sample. */
export function errorDbOfOpen(open: OpenSamples): number[] {
  return quotientDbOfOpen(open, false);
}
