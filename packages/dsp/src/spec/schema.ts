/**
 * The loop design spec (DESIGN.md, "specVersion": 1): one zod schema shared by dsp, api and app.
 *
 * Field names are DESIGN.md's; developers may add fields, never rename them. Objects are strict, so a
 * misspelt optional field (say `ripleFilter`) is an error naming it rather than silently ignored:
 * these numbers drive hardware.
 *
 * `parseLoopSpec` is the public entry: it never throws, returns issues as `{ field, message }` with a
 * dot path (`filter.tau1S`), and adds non-fatal `warnings` that say why a spec is unusual.
 */
import { z } from 'zod';
import { loopGain } from '../analysis/loopGain.ts';
import { lagLeadFromTargets } from '../filters/timeConstants.ts';
import { EXACT_INTEGER_BITS, WIDTH_LIMIT_REASONS, WIDTH_LIMITS, type WidthField } from './limits.ts';
import { PARSE_CONTEXT } from './messages.ts';

/** Finite number > 0 (zod 4's z.number() already rejects NaN and ±Infinity). */
/**
 * Frequencies and gains in Hz: 1 µHz … 1 THz. The bounds keep every derived figure (K, ωn, noise
 * bandwidth) far from floating-point under- and overflow; no real loop lives outside them.
 */
const hz = () => z.number().min(1e-6).max(1e12);
/** Time constants: 1 ps … 1e6 s, for the same reason. */
const seconds = () => z.number().min(1e-12).max(1e6);
/** An integer width within its limit (./limits.ts, the one place the limits are written). */
const width = (field: WidthField) => z.number().int().min(WIDTH_LIMITS[field][0]).max(WIDTH_LIMITS[field][1], WIDTH_LIMIT_REASONS[field]);

/** Single-pole low-pass F = 1/(1+sτ), τ = 1/(2π·cutoffHz); a type-1 loop. */
export const singlePoleFilterSchema = z.strictObject({
  kind: z.literal('single-pole'),
  cutoffHz: hz(),
});

/**
 * Second-order loop filters: either both time constants or both targets (naturalHz, damping),
 * from which the time constants are designed (src/filters/timeConstants.ts).
 */
const secondOrderFields = {
  tau1S: seconds().optional(),
  tau2S: seconds().optional(),
  naturalHz: hz().optional(),
  damping: z.number().min(1e-3).max(100).optional(),
};

/** Passive lag-lead F = (1+sτ2)/(1+s(τ1+τ2)); a type-1 loop. */
export const lagLeadFilterSchema = z.strictObject({ kind: z.literal('lag-lead'), ...secondOrderFields });

/** Active PI F = (1+sτ2)/(sτ1); a type-2 loop. */
export const piFilterSchema = z.strictObject({ kind: z.literal('pi'), ...secondOrderFields });

/** Butterworth low-pass, unit DC gain, order 1–4, −3.01 dB at cutoffHz. */
export const butterworthFilterSchema = z.strictObject({
  kind: z.literal('butterworth'),
  order: width('filter.order'),
  cutoffHz: hz(),
});

export const loopFilterSchema = z.discriminatedUnion('kind', [
  singlePoleFilterSchema,
  lagLeadFilterSchema,
  piFilterSchema,
  butterworthFilterSchema,
]);

/** Optional Butterworth low-pass in series with the loop filter, against the 2·f detector ripple. */
export const rippleFilterSchema = z.strictObject({
  order: width('filter.order'),
  cutoffHz: hz(),
});

const baseLoopSpecSchema = z.strictObject({
  specVersion: z.literal(1),
  name: z
    .string()
    .regex(/^[a-z][a-z0-9_]{0,39}$/, 'must match [a-z][a-z0-9_]{0,39} (it becomes an HDL and C identifier)'),
  clockHz: hz(),
  sampleRateHz: hz(),
  centerHz: hz(),
  input: z.strictObject({
    /** Peak amplitude, 1.0 = full scale. */
    amplitude: z.number().min(1e-6).max(1),
  }),
  detector: z.strictObject({ kind: z.literal('multiplier') }),
  nco: z.strictObject({
    accumulatorBits: width('nco.accumulatorBits'),
    /** Address bits of the sine table (2^phaseBits entries); at most MAX_PHASE_BITS (limits.ts). */
    phaseBits: width('nco.phaseBits'),
    amplitudeBits: width('nco.amplitudeBits'),
    gainHzPerUnit: hz(),
    waveform: z.enum(['sine', 'square']),
  }),
  filter: loopFilterSchema,
  rippleFilter: rippleFilterSchema.nullable().optional(),
  discretization: z.strictObject({
    method: z.literal('bilinear'),
    prewarpHz: hz().nullable().default(null),
  }),
  fixedPoint: z.strictObject({
    coefficientBits: width('fixedPoint.coefficientBits'),
    /** "auto": the most fraction bits that still hold every coefficient. */
    coefficientFractionBits: z.union([width('fixedPoint.coefficientFractionBits'), z.literal('auto')]),
    dataBits: width('fixedPoint.dataBits'),
    /** The loop filter's multiply-accumulate (MAC) word. */
    accumulatorBits: width('fixedPoint.accumulatorBits'),
    /** nearest: half away from zero; half-even: convergent; truncate: toward −∞ (IEEE754 cl. 4.3). */
    rounding: z.enum(['nearest', 'half-even', 'truncate']),
    overflow: z.enum(['saturate', 'wrap']),
  }),
});

type BaseSpec = z.output<typeof baseLoopSpecSchema>;
type Shape = typeof baseLoopSpecSchema.shape;
/** The top-level parts of a spec that are valid on their own (the rest are reported by their schemas). */
type ValidParts = { [K in keyof BaseSpec]?: BaseSpec[K] };
type AddIssue = (path: (string | number)[], message: string) => void;

/** Each top-level part of `value` that passes its own schema; so cross-field checks can run (and name
 * their fields) even while an unrelated field is still wrong. */
function validParts(value: unknown): ValidParts {
  const v = value !== null && typeof value === 'object' ? (value as Record<string, unknown>) : {};
  const out: Record<string, unknown> = {};
  for (const key of Object.keys(baseLoopSpecSchema.shape) as (keyof Shape)[]) {
    const r = baseLoopSpecSchema.shape[key].safeParse(v[key], PARSE_CONTEXT);
    if (r.success) out[key] = r.data;
  }
  return out as ValidParts;
}

/**
 * An AddIssue on ctx, made by a function that returns it rather than bound to a name where it is used:
 * under tsx (the server, the bench), which keeps names, a named closure has its name defined each time it
 * is made (Object.defineProperty, about 0.4 µs a parse).
 */
function issueAdder(ctx: z.RefinementCtx): AddIssue {
  return (path, message) => ctx.addIssue({ code: 'custom', path, message });
}

/** The check of a frequency against the loop rate's Nyquist frequency (made as issueAdder's closure is). */
function nyquistCheck(nyquistHz: number, add: AddIssue): (path: (string | number)[], valueHz: number | undefined | null) => void {
  return (path, valueHz) => {
    if (valueHz != null && valueHz >= nyquistHz) add(path, `${path.join('.')} ${valueHz} must be below sampleRateHz/2 = ${nyquistHz}`);
  };
}

/** Cross-field constraints; each issue names the field a designer should change. */
function checkCrossFields(value: unknown, ctx: z.RefinementCtx): void {
  const add = issueAdder(ctx);
  // No issue yet: the object parsed whole and `value` is its output, so every part is valid as it
  // stands; only a spec with issues needs each part tried on its own.
  const p = ctx.issues.length === 0 ? (value as ValidParts) : validParts(value);
  checkRates(p, add);
  if (p.nco && p.nco.phaseBits > p.nco.accumulatorBits) {
    add(['nco', 'phaseBits'], `nco.phaseBits ${p.nco.phaseBits} cannot exceed nco.accumulatorBits ${p.nco.accumulatorBits}`);
  }
  const fp = p.fixedPoint;
  if (fp && fp.coefficientFractionBits !== 'auto' && fp.coefficientFractionBits > fp.coefficientBits) {
    add(['fixedPoint', 'coefficientFractionBits'], `fixedPoint.coefficientFractionBits ${fp.coefficientFractionBits} cannot exceed fixedPoint.coefficientBits ${fp.coefficientBits}`);
  }
  if (fp && fp.accumulatorBits < Math.max(fp.dataBits, fp.coefficientBits)) {
    add(['fixedPoint', 'accumulatorBits'], `fixedPoint.accumulatorBits ${fp.accumulatorBits} must be at least max(dataBits, coefficientBits) = ${Math.max(fp.dataBits, fp.coefficientBits)}`);
  }
  checkExactArithmetic(p, add);
  if (p.filter && (p.filter.kind === 'lag-lead' || p.filter.kind === 'pi')) checkSecondOrder(p, p.filter, add);
}

/**
 * The bit-true loop holds its products in float64 integers (limits.ts, EXACT_INTEGER_BITS): the MAC
 * sum of five products needs dataBits + coefficientBits + 1 bits, the detector product dataBits +
 * amplitudeBits. A spec past either could be analysed but never simulated bit-true or released.
 */
function checkExactArithmetic(p: ValidParts, add: AddIssue): void {
  const fp = p.fixedPoint;
  if (fp && fp.dataBits + fp.coefficientBits + 1 > EXACT_INTEGER_BITS) {
    add(['fixedPoint', 'dataBits'], `fixedPoint.dataBits + coefficientBits must be at most ${EXACT_INTEGER_BITS - 1} for the bit-true MAC, got ${fp.dataBits} + ${fp.coefficientBits}`);
  }
  if (fp && p.nco && fp.dataBits + p.nco.amplitudeBits > EXACT_INTEGER_BITS) {
    add(['nco', 'amplitudeBits'], `fixedPoint.dataBits + nco.amplitudeBits must be at most ${EXACT_INTEGER_BITS} for the detector product, got ${fp.dataBits} + ${p.nco.amplitudeBits}`);
  }
}

/** Loop rate against the clock, and every frequency against the loop rate's Nyquist frequency. */
function checkRates(p: ValidParts, add: AddIssue): void {
  if (p.sampleRateHz !== undefined && p.clockHz !== undefined && p.sampleRateHz > p.clockHz) {
    add(['sampleRateHz'], `sampleRateHz ${p.sampleRateHz} exceeds clockHz ${p.clockHz}: the loop cannot update faster than the fabric clock`);
  }
  if (p.sampleRateHz === undefined) return;
  const nyquistHz = p.sampleRateHz / 2;
  if (p.centerHz !== undefined && p.centerHz >= nyquistHz) {
    add(['centerHz'], `centerHz ${p.centerHz} must be below the Nyquist frequency of the loop rate (sampleRateHz/2 = ${nyquistHz})`);
  }
  const belowNyquist = nyquistCheck(nyquistHz, add);
  const f = p.filter;
  if (f && (f.kind === 'single-pole' || f.kind === 'butterworth')) belowNyquist(['filter', 'cutoffHz'], f.cutoffHz);
  if (f && (f.kind === 'lag-lead' || f.kind === 'pi')) belowNyquist(['filter', 'naturalHz'], f.naturalHz);
  if (p.rippleFilter) belowNyquist(['rippleFilter', 'cutoffHz'], p.rippleFilter.cutoffHz);
  if (p.discretization) belowNyquist(['discretization', 'prewarpHz'], p.discretization.prewarpHz);
}

type SecondOrderFilter = Extract<BaseSpec['filter'], { kind: 'lag-lead' | 'pi' }>;

function checkSecondOrder(p: ValidParts, f: SecondOrderFilter, add: AddIssue): void {
  const hasTau = f.tau1S !== undefined || f.tau2S !== undefined;
  const hasTargets = f.naturalHz !== undefined || f.damping !== undefined;
  if (hasTau && hasTargets) {
    add(['filter'], `filter of kind ${f.kind}: give either tau1S and tau2S or naturalHz and damping, not both`);
    return;
  }
  if (!hasTau && !hasTargets) {
    add(['filter', 'tau1S'], `filter of kind ${f.kind} needs tau1S and tau2S (seconds), or naturalHz and damping`);
    return;
  }
  const missing = hasTau
    ? (['tau1S', 'tau2S'] as const).filter((k) => f[k] === undefined)
    : (['naturalHz', 'damping'] as const).filter((k) => f[k] === undefined);
  for (const k of missing) add(['filter', k], `filter of kind ${f.kind} needs ${k} together with ${hasTau ? 'tau1S/tau2S' : 'naturalHz/damping'}`);
  if (missing.length > 0 || f.naturalHz === undefined || f.damping === undefined) return;
  if (p.sampleRateHz !== undefined && f.naturalHz >= p.sampleRateHz / 2) return; // reported by checkRates
  if (f.kind === 'lag-lead' && p.input && p.nco) {
    const r = lagLeadFromTargets(loopGain({ input: p.input, nco: p.nco }).kRadPerS, f.naturalHz, f.damping);
    if (!r.ok) add(['filter', r.field], r.message);
  }
}

/** The raw zod schema of a loop design spec (DESIGN.md), with cross-field checks. */
// `when: () => true` runs the cross-field checks even when some field failed its own schema, so a
// form shows every problem at once; checkCrossFields only looks at parts that are valid on their own.
export const loopSpecSchema = baseLoopSpecSchema.superRefine(checkCrossFields, { when: () => true });

/** A loop design spec of the schema's shape (defaults applied); not necessarily checked. */
export type LoopSpec = z.output<typeof loopSpecSchema>;

declare const validSpecBrand: unique symbol;
/**
 * A spec that passed parseLoopSpec, the only function that makes one: whatever takes a ValidSpec
 * (planDesign and the steps below it) relies on every limit and cross-field rule of the schema and
 * never checks the spec again. The brand exists only for the type checker.
 */
export type ValidSpec = LoopSpec & { readonly [validSpecBrand]: true };
/** What a client may send (optional fields with defaults may be left out). */
export type LoopSpecInput = z.input<typeof loopSpecSchema>;
export type LoopFilterSpec = LoopSpec['filter'];
export type FilterKind = LoopFilterSpec['kind'];
export type RippleFilterSpec = z.output<typeof rippleFilterSchema>;
export type FixedPointSpec = LoopSpec['fixedPoint'];
export type NcoSpec = LoopSpec['nco'];

export interface SpecIssue {
  /** Dot path of the offending field, e.g. "filter.tau1S"; "" for the document itself. */
  readonly field: string;
  readonly message: string;
}

export interface SpecWarning {
  readonly field: string;
  readonly message: string;
}

export type ParseLoopSpecResult =
  | { readonly ok: true; readonly spec: ValidSpec; readonly warnings: readonly SpecWarning[] }
  | { readonly ok: false; readonly issues: readonly SpecIssue[] };

/**
 * Validate any input as a loop spec. Never throws; every issue names its field path.
 */
export function parseLoopSpec(input: unknown): ParseLoopSpecResult {
  let result: ReturnType<typeof loopSpecSchema.safeParse>;
  try {
    result = loopSpecSchema.safeParse(input, PARSE_CONTEXT);
  } catch (err) {
    // safeParse does not throw on bad data; this guards exotic inputs such as throwing getters.
    return { ok: false, issues: [{ field: '', message: `spec could not be read: ${String(err)}` }] };
  }
  if (!result.success) {
    return { ok: false, issues: result.error.issues.map(toSpecIssue) };
  }
  return { ok: true, spec: result.data as ValidSpec, warnings: specWarnings(result.data) };
}

/** Thrown by requireValidSpec for a spec that fails parseLoopSpec; carries every field issue. */
export class LoopSpecError extends Error {
  readonly issues: readonly SpecIssue[];
  readonly field: string;
  constructor(issues: readonly SpecIssue[]) {
    super(issues.map((i) => i.message).join('; '));
    this.name = 'LoopSpecError';
    this.issues = issues;
    this.field = issues[0]?.field ?? '';
  }
}

/** parseLoopSpec for a spec the caller holds to be valid (an example, a test's variant): throws LoopSpecError naming the fields. */
export function requireValidSpec(input: unknown): ValidSpec {
  const parsed = parseLoopSpec(input);
  if (!parsed.ok) throw new LoopSpecError(parsed.issues);
  return parsed.spec;
}

function toSpecIssue(issue: z.core.$ZodIssue): SpecIssue {
  const field = issue.path.map(String).join('.');
  if (issue.code === 'unrecognized_keys') {
    const keys = issue.keys.map((k) => (field ? `${field}.${k}` : k));
    return { field: keys[0] ?? field, message: `unknown field(s): ${keys.join(', ')}` };
  }
  return { field, message: field ? `${field}: ${issue.message}` : issue.message };
}

/** Non-fatal observations about a valid spec, each saying why it matters. */
export function specWarnings(spec: LoopSpec): SpecWarning[] {
  const warnings: SpecWarning[] = [];
  const ratio = spec.clockHz / spec.sampleRateHz;
  if (ratio !== Math.round(ratio)) {
    const divider = Math.max(1, Math.round(ratio));
    warnings.push({
      field: 'sampleRateHz',
      message: `clockHz/sampleRateHz = ${spec.clockHz}/${spec.sampleRateHz} = ${ratio} is not an integer: the loop strobe cannot come from a plain clock divider, so update instants jitter by up to one clock period (use a fractional strobe generator, or the nearest divider ${divider}, which gives sampleRateHz = ${spec.clockHz / divider})`,
    });
  }
  const rippleHz = 2 * spec.centerHz;
  const fs = spec.sampleRateHz;
  if (rippleHz >= fs / 2) {
    const aliasHz = Math.abs(rippleHz - fs * Math.round(rippleHz / fs));
    warnings.push({
      field: 'centerHz',
      message: `the 2·centerHz detector ripple (${rippleHz} Hz) is above sampleRateHz/2 and aliases to ${Number(aliasHz.toPrecision(6))} Hz in the loop; the loop filter sees it there`,
    });
  }
  const tablePeak = 1 - 2 ** (1 - spec.nco.amplitudeBits);
  if (tablePeak < 0.99) {
    warnings.push({
      field: 'nco.amplitudeBits',
      message: `the bit-true NCO peaks at (2^(B−1) − 1)/2^(B−1) = ${tablePeak} of full scale with nco.amplitudeBits = ${spec.nco.amplitudeBits}, so its detector gain, and the loop gain, are ${(20 * Math.log10(tablePeak)).toFixed(2)} dB below the analysis, which takes A_nco = 1 (DESIGN.md); use 8 or more bits to keep the difference under 1 %`,
    });
  }
  if (spec.nco.waveform === 'square') {
    warnings.push({
      field: 'nco.waveform',
      message: 'square-wave NCO: only its fundamental, of amplitude 4/π, mixes the input to DC, so the detector gain is Kd = 2·A_in/π (2.1 dB above a sine NCO) and the analysis uses that; its odd harmonics add detector products at (k ± 1)·centerHz that the loop filter must also reject',
    });
  }
  const fp = spec.fixedPoint;
  if (fp.accumulatorBits < fp.dataBits + fp.coefficientBits) {
    warnings.push({
      field: 'fixedPoint.accumulatorBits',
      message: `fixedPoint.accumulatorBits ${fp.accumulatorBits} is below dataBits + coefficientBits = ${fp.dataBits + fp.coefficientBits}: full products do not fit, so each product is rounded or may overflow`,
    });
  }
  return warnings;
}
