/**
 * The editor's draft: every field as the text the user typed, keyed by spec path. Keeping text
 * (not numbers) lets "1e6" or a half-typed "0." sit in a field while the shared zod schema says
 * what is wrong with it; draftToSpec turns the text into the spec object the schema checks.
 */
import type { LoopSpec, LoopSpecInput } from '@loopwright/dsp';

export type SpecDraft = Record<string, string>;

const NUMERIC = new Set([
  'clockHz', 'sampleRateHz', 'centerHz', 'input.amplitude',
  'nco.accumulatorBits', 'nco.phaseBits', 'nco.amplitudeBits', 'nco.gainHzPerUnit',
  'filter.cutoffHz', 'filter.order', 'filter.tau1S', 'filter.tau2S', 'filter.naturalHz', 'filter.damping',
  'rippleFilter.order', 'rippleFilter.cutoffHz', 'discretization.prewarpHz',
  'fixedPoint.coefficientBits', 'fixedPoint.dataBits', 'fixedPoint.accumulatorBits',
]);

/** Text → number when it reads as one; otherwise the text itself, so the schema names the field. */
export function parseNumberText(text: string | undefined): number | string | undefined {
  const trimmed = (text ?? '').trim();
  if (trimmed === '') return undefined;
  const value = Number(trimmed);
  return Number.isFinite(value) ? value : trimmed;
}

function str(value: unknown): string {
  return value === undefined || value === null ? '' : String(value);
}

export function specToDraft(spec: LoopSpec | LoopSpecInput): SpecDraft {
  const f = spec.filter as Record<string, unknown>;
  const ripple = spec.rippleFilter ?? null;
  const prewarpHz = spec.discretization.prewarpHz ?? null;
  return {
    name: spec.name,
    clockHz: str(spec.clockHz),
    sampleRateHz: str(spec.sampleRateHz),
    centerHz: str(spec.centerHz),
    'input.amplitude': str(spec.input.amplitude),
    'nco.accumulatorBits': str(spec.nco.accumulatorBits),
    'nco.phaseBits': str(spec.nco.phaseBits),
    'nco.amplitudeBits': str(spec.nco.amplitudeBits),
    'nco.gainHzPerUnit': str(spec.nco.gainHzPerUnit),
    'nco.waveform': spec.nco.waveform,
    'filter.kind': spec.filter.kind,
    'filter.mode': f['naturalHz'] !== undefined || f['damping'] !== undefined ? 'targets' : 'time-constants',
    'filter.cutoffHz': str(f['cutoffHz']),
    'filter.order': str(f['order']),
    'filter.tau1S': str(f['tau1S']),
    'filter.tau2S': str(f['tau2S']),
    'filter.naturalHz': str(f['naturalHz']),
    'filter.damping': str(f['damping']),
    'rippleFilter.enabled': ripple ? 'true' : 'false',
    'rippleFilter.order': str(ripple?.order ?? 2),
    'rippleFilter.cutoffHz': str(ripple?.cutoffHz),
    'discretization.prewarp': prewarpHz === null ? 'false' : 'true',
    'discretization.prewarpHz': str(prewarpHz),
    'fixedPoint.coefficientBits': str(spec.fixedPoint.coefficientBits),
    'fixedPoint.coefficientFractionBits': str(spec.fixedPoint.coefficientFractionBits),
    'fixedPoint.dataBits': str(spec.fixedPoint.dataBits),
    'fixedPoint.accumulatorBits': str(spec.fixedPoint.accumulatorBits),
    'fixedPoint.rounding': spec.fixedPoint.rounding,
    'fixedPoint.overflow': spec.fixedPoint.overflow,
  };
}

function filterFromDraft(d: Readonly<SpecDraft>): Record<string, unknown> {
  const n = (path: string) => parseNumberText(d[path]);
  const kind = d['filter.kind'] ?? '';
  if (kind === 'single-pole') return { kind, cutoffHz: n('filter.cutoffHz') };
  if (kind === 'butterworth') return { kind, order: n('filter.order'), cutoffHz: n('filter.cutoffHz') };
  if (d['filter.mode'] === 'targets') return { kind, naturalHz: n('filter.naturalHz'), damping: n('filter.damping') };
  return { kind, tau1S: n('filter.tau1S'), tau2S: n('filter.tau2S') };
}

function fractionBits(text: string | undefined): number | string | undefined {
  return (text ?? '').trim().toLowerCase() === 'auto' ? 'auto' : parseNumberText(text);
}

/** The spec object the draft describes (not yet validated: parseLoopSpec does that). */
export function draftToSpec(d: Readonly<SpecDraft>): Record<string, unknown> {
  const n = (path: string) => (NUMERIC.has(path) ? parseNumberText(d[path]) : d[path]);
  return {
    specVersion: 1,
    name: (d['name'] ?? '').trim(),
    clockHz: n('clockHz'),
    sampleRateHz: n('sampleRateHz'),
    centerHz: n('centerHz'),
    input: { amplitude: n('input.amplitude') },
    detector: { kind: 'multiplier' },
    nco: {
      accumulatorBits: n('nco.accumulatorBits'),
      phaseBits: n('nco.phaseBits'),
      amplitudeBits: n('nco.amplitudeBits'),
      gainHzPerUnit: n('nco.gainHzPerUnit'),
      waveform: d['nco.waveform'],
    },
    filter: filterFromDraft(d),
    rippleFilter:
      d['rippleFilter.enabled'] === 'true'
        ? { order: n('rippleFilter.order'), cutoffHz: n('rippleFilter.cutoffHz') }
        : null,
    discretization: {
      method: 'bilinear',
      prewarpHz: d['discretization.prewarp'] === 'true' ? n('discretization.prewarpHz') : null,
    },
    fixedPoint: {
      coefficientBits: n('fixedPoint.coefficientBits'),
      coefficientFractionBits: fractionBits(d['fixedPoint.coefficientFractionBits']),
      dataBits: n('fixedPoint.dataBits'),
      accumulatorBits: n('fixedPoint.accumulatorBits'),
      rounding: d['fixedPoint.rounding'],
      overflow: d['fixedPoint.overflow'],
    },
  };
}
