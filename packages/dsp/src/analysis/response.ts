/**
 * Frequency responses of filters and of the open loop (DESIGN.md conventions):
 *   analog   L(jω) = Kd·Ko·F(jω)/(jω)
 *   discrete L(z)  = Kd·F(z)·Ko·T·z⁻¹/(1 − z⁻¹),  z = exp(j2πf/fs), the NCO being an accumulator with
 *   one sample of delay at the loop rate. Note z⁻¹/(1 − z⁻¹) = 1/(z − 1).
 */
import type { AnalogTf, DigitalTf, Sos } from '../types/filter.ts';
import { type Complex, cdiv, cexpj, cmul, cscale } from '../filters/complex.ts';
import { polyvalAscending } from '../filters/polynomial.ts';
import { sectionOnUnitCircle, unitCirclePoint, type SectionValue } from '../filters/sections.ts';

/** A digital filter in either representation. */
export type DigitalFilter = DigitalTf | readonly Sos[];

/** Complex response as a function of frequency in Hz. */
export type ResponseFn = (freqHz: number) => Complex;

/** Scratch of one section's value, reused by every evaluation below (single-threaded, never re-entered). */
const SECTION: SectionValue = { nr: 0, ni: 0, dr: 1, di: 0 };

/** h ← h·N/D for the section value v: the complex product both responses reduce to. */
function multiplyQuotient(h: { re: number; im: number }, v: SectionValue): void {
  const d = v.dr * v.dr + v.di * v.di;
  const qr = (v.nr * v.dr + v.ni * v.di) / d;
  const qi = (v.ni * v.dr - v.nr * v.di) / d;
  const r = h.re * qr - h.im * qi;
  h.im = h.re * qi + h.im * qr;
  h.re = r;
}

/** N(jω) and D(jω) of one analog section, by Horner's rule in jω (coefficients highest power first). */
function analogSectionAt(tf: AnalogTf, w: number, out: SectionValue): void {
  let nr = 0;
  let ni = 0;
  for (const c of tf.num) {
    const t = -ni * w + c; // (nr + j·ni)·(jω) + c
    ni = nr * w;
    nr = t;
  }
  let dr = 0;
  let di = 0;
  for (const c of tf.den) {
    const t = -di * w + c;
    di = dr * w;
    dr = t;
  }
  out.nr = nr;
  out.ni = ni;
  out.dr = dr;
  out.di = di;
}

/**
 * F(jω) of analog sections (or one transfer function) at freqHz. Scalars and one reused scratch: this
 * is the innermost loop of every grid and root search, and object allocation would dominate it.
 */
export function analogResponse(sections: readonly AnalogTf[], freqHz: number): Complex {
  const w = 2 * Math.PI * freqHz;
  const h = { re: 1, im: 0 };
  for (const tf of sections) {
    analogSectionAt(tf, w, SECTION);
    multiplyQuotient(h, SECTION);
  }
  return h;
}

/** H(e^{jωT}) of a digital filter at freqHz for the sample rate fs. */
export function digitalResponse(filter: DigitalFilter, freqHz: number, sampleRateHz: number): Complex {
  const omega = (2 * Math.PI * freqHz) / sampleRateHz;
  if (!isSections(filter)) {
    const w = cexpj(-omega); // z⁻¹ on the unit circle
    return cdiv(polyvalAscending(filter.b, w), polyvalAscending(filter.a, w));
  }
  const p = unitCirclePoint(omega);
  const h = { re: 1, im: 0 };
  for (const s of filter) {
    sectionOnUnitCircle(s, p, SECTION);
    multiplyQuotient(h, SECTION);
  }
  return h;
}

export function isSections(filter: DigitalFilter): filter is readonly Sos[] {
  return Array.isArray(filter);
}

/**
 * A response that stays finite: exactly on a pole (a quantised pole can land on the unit circle at a
 * grid frequency) the value is taken a relative 1e-9 beside it, where it is huge but finite and its
 * phase is meaningful.
 */
function finite(fn: ResponseFn): ResponseFn {
  return (f) => {
    const h = fn(f);
    if (Number.isFinite(h.re) && Number.isFinite(h.im)) return h;
    const g = fn(f * (1 - 1e-9));
    return Number.isFinite(g.re) && Number.isFinite(g.im) ? g : { re: 1e300, im: 0 };
  };
}

/** Analog open loop K·F(jω)/(jω) with K = Kd·Ko. */
export function analogLoopResponse(sections: readonly AnalogTf[], kRadPerS: number): ResponseFn {
  return finite((f) => {
    const w = 2 * Math.PI * f;
    const h = cscale(analogResponse(sections, f), kRadPerS / w);
    return { re: h.im, im: -h.re }; // divide by j
  });
}

/** Scratch of the product over sections in discreteLoopResponse (single-threaded, never re-entered). */
const PRODUCT = { re: 1, im: 0 };

/**
 * Discrete open loop K·T·F(z)/(z − 1), K = Kd·Ko, T = 1/fs. For sections the NCO's z = e^{jω} is the
 * cos ω, sin ω the sections are evaluated with (the same ω), and the quotient and product are written
 * out: the same operations, in the same order, as cdiv and cmul on objects (so the same doubles), in
 * the innermost loop of the margins, the quantised loop and the noise bandwidth.
 */
export function discreteLoopResponse(filter: DigitalFilter, kRadPerS: number, sampleRateHz: number): ResponseFn {
  const kt = kRadPerS / sampleRateHz;
  if (!isSections(filter)) {
    return finite((f) => {
      const z = cexpj((2 * Math.PI * f) / sampleRateHz);
      const nco = cdiv({ re: kt, im: 0 }, { re: z.re - 1, im: z.im });
      return cmul(nco, digitalResponse(filter, f, sampleRateHz));
    });
  }
  return finite((f) => {
    const p = unitCirclePoint((2 * Math.PI * f) / sampleRateHz);
    // nco = kt/(z − 1): cdiv({kt, 0}, {c1 − 1, s1}) written out.
    const br = p.c1 - 1;
    const bi = p.s1;
    const d = br * br + bi * bi;
    const ncoRe = (kt * br + 0 * bi) / d;
    const ncoIm = (0 * br - kt * bi) / d;
    const h = PRODUCT;
    h.re = 1;
    h.im = 0;
    for (const s of filter) {
      sectionOnUnitCircle(s, p, SECTION);
      multiplyQuotient(h, SECTION);
    }
    return { re: ncoRe * h.re - ncoIm * h.im, im: ncoRe * h.im + ncoIm * h.re };
  });
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

/** toDb of re + j·im given as two numbers (no object in the loops below). */
function partsToDb(re: number, im: number): number {
  // 10·log10(re² + im²) where the square neither overflows nor underflows: Math.hypot was a seventh of
  // analyzeDesign's time. Elsewhere (|h| beyond about 1e±150, clamped anyway) the magnitude itself.
  const p = re * re + im * im;
  if (p > 1e-290 && p < 1e290) return Math.min(Math.max(10 * Math.log10(p), DB_FLOOR), DB_CEILING);
  const m = Math.hypot(re, im);
  if (!(m > 0)) return DB_FLOOR; // zero, or NaN from 0/0
  return Math.min(Math.max(20 * Math.log10(m), DB_FLOOR), DB_CEILING);
}

/**
 * toDb(N/(1 + l)) for every open-loop sample l, with N = l (closed loop) or N = 1 (error transfer); the
 * quotient written out as cdiv computes it (the same operations in the same order, so the same doubles)
 * without two objects per sample: this runs on the 600-point grids of the analysis.
 */
function quotientDbOfOpen(open: readonly Complex[], numeratorIsOpen: boolean): number[] {
  const out = new Array<number>(open.length);
  for (let i = 0; i < open.length; i++) {
    const l = open[i]!;
    const nr = numeratorIsOpen ? l.re : 1;
    const ni = numeratorIsOpen ? l.im : 0;
    const br = 1 + l.re;
    const bi = l.im;
    const d = br * br + bi * bi;
    out[i] = partsToDb((nr * br + ni * bi) / d, (ni * br - nr * bi) / d);
  }
  return out;
}

/** toDb(closedFromOpen(l)) for every open-loop sample. */
export function closedDbOfOpen(open: readonly Complex[]): number[] {
  return quotientDbOfOpen(open, true);
}

/** toDb(errorFromOpen(l)) for every open-loop sample. */
export function errorDbOfOpen(open: readonly Complex[]): number[] {
  return quotientDbOfOpen(open, false);
}
