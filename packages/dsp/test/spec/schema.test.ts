/**
 * Validation of the loop spec (DESIGN.md fields): every bad field gives an issue naming it, never a
 * throw, never NaN. Table-driven: each row changes one field of a valid example.
 */
import { describe, expect, it } from 'vitest';
import { parseLoopSpec, loopSpecSchema } from '../../src/spec/schema.ts';
import { exampleSpecs, mainsSyncSpec, ultrasonicSinglePoleSpec } from '../../src/spec/examples.ts';

type Json = Record<string, unknown>;

function withChange(base: object, path: string, value: unknown): Json {
  const copy = structuredClone(base) as Json;
  const keys = path.split('.');
  let node: Json = copy;
  for (const k of keys.slice(0, -1)) node = node[k] as Json;
  const last = keys[keys.length - 1]!;
  if (value === undefined) delete node[last];
  else node[last] = value;
  return copy;
}

function fieldsOf(input: unknown): string[] {
  const r = parseLoopSpec(input);
  if (r.ok) return [];
  for (const i of r.issues) expect(i.message.length).toBeGreaterThan(0);
  return r.issues.map((i) => i.field);
}

describe('parseLoopSpec accepts the demo examples', () => {
  it.each(exampleSpecs.map((e) => [e.id, e.spec] as const))('accepts %s', (_id, spec) => {
    const r = parseLoopSpec(spec);
    expect(r.ok).toBe(true);
  });

  it('fills prewarpHz with null when it is left out', () => {
    const r = parseLoopSpec(withChange(mainsSyncSpec, 'discretization.prewarpHz', undefined));
    expect(r.ok && r.spec.discretization.prewarpHz).toBe(null);
  });

  it('exports the raw zod schema', () => {
    expect(loopSpecSchema.safeParse(mainsSyncSpec).success).toBe(true);
  });
});

// [description, base spec, field path changed, new value, field the issue must name]
const badCases: [string, object, string, unknown, string][] = [
  ['sample rate above the clock', mainsSyncSpec, 'sampleRateHz', 2e8, 'sampleRateHz'],
  ['NCO accumulator wider than 64 bits', mainsSyncSpec, 'nco.accumulatorBits', 65, 'nco.accumulatorBits'],
  ['centerHz above Nyquist of the loop rate', mainsSyncSpec, 'centerHz', 6000, 'centerHz'],
  ['centerHz exactly at Nyquist', mainsSyncSpec, 'centerHz', 5000, 'centerHz'],
  ['zero coefficient width', mainsSyncSpec, 'fixedPoint.coefficientBits', 0, 'fixedPoint.coefficientBits'],
  ['negative data width', mainsSyncSpec, 'fixedPoint.dataBits', -4, 'fixedPoint.dataBits'],
  ['fractional data width', mainsSyncSpec, 'fixedPoint.dataBits', 15.5, 'fixedPoint.dataBits'],
  ['NaN clock', mainsSyncSpec, 'clockHz', Number.NaN, 'clockHz'],
  ['infinite sample rate', mainsSyncSpec, 'sampleRateHz', Number.POSITIVE_INFINITY, 'sampleRateHz'],
  ['string where a number belongs', mainsSyncSpec, 'centerHz', '50', 'centerHz'],
  ['fraction bits above the coefficient width', mainsSyncSpec, 'fixedPoint.coefficientFractionBits', 19, 'fixedPoint.coefficientFractionBits'],
  ['unknown filter kind', mainsSyncSpec, 'filter.kind', 'chebyshev', 'filter.kind'],
  ['missing tau2S for lag-lead', { ...ultrasonicSinglePoleSpec, filter: { kind: 'lag-lead', tau1S: 1e-3 } }, 'name', 'x', 'filter.tau2S'],
  ['missing damping for pi targets', mainsSyncSpec, 'filter.damping', undefined, 'filter.damping'],
  ['pi with neither taus nor targets', { ...mainsSyncSpec, filter: { kind: 'pi' } }, 'name', 'x', 'filter.tau1S'],
  ['negative tau1S', { ...mainsSyncSpec, filter: { kind: 'pi', tau1S: -1, tau2S: 0.01 } }, 'name', 'x', 'filter.tau1S'],
  ['cutoffHz on a pi filter', { ...mainsSyncSpec, filter: { kind: 'pi', tau1S: 1, tau2S: 0.01, cutoffHz: 3 } }, 'name', 'x', 'filter.cutoffHz'],
  ['missing cutoffHz for single-pole', ultrasonicSinglePoleSpec, 'filter.cutoffHz', undefined, 'filter.cutoffHz'],
  ['zero cutoffHz', ultrasonicSinglePoleSpec, 'filter.cutoffHz', 0, 'filter.cutoffHz'],
  ['single-pole cutoff above Nyquist', ultrasonicSinglePoleSpec, 'filter.cutoffHz', 6e5, 'filter.cutoffHz'],
  ['butterworth order 5', { ...mainsSyncSpec, filter: { kind: 'butterworth', order: 5, cutoffHz: 10 } }, 'name', 'x', 'filter.order'],
  ['ripple filter order 0', mainsSyncSpec, 'rippleFilter.order', 0, 'rippleFilter.order'],
  ['ripple cutoff above Nyquist', mainsSyncSpec, 'rippleFilter.cutoffHz', 5000, 'rippleFilter.cutoffHz'],
  ['prewarp above Nyquist', mainsSyncSpec, 'discretization.prewarpHz', 7000, 'discretization.prewarpHz'],
  ['negative prewarp', mainsSyncSpec, 'discretization.prewarpHz', -10, 'discretization.prewarpHz'],
  ['unknown discretisation method', mainsSyncSpec, 'discretization.method', 'impulse-invariant', 'discretization.method'],
  ['wrong specVersion', mainsSyncSpec, 'specVersion', 2, 'specVersion'],
  ['name that is not an identifier', mainsSyncSpec, 'name', 'Mains Sync', 'name'],
  ['name too long', mainsSyncSpec, 'name', 'a'.repeat(41), 'name'],
  ['amplitude above full scale', mainsSyncSpec, 'input.amplitude', 1.5, 'input.amplitude'],
  ['zero amplitude', mainsSyncSpec, 'input.amplitude', 0, 'input.amplitude'],
  ['zero NCO gain', mainsSyncSpec, 'nco.gainHzPerUnit', 0, 'nco.gainHzPerUnit'],
  ['phase bits above accumulator bits', { ...mainsSyncSpec, nco: { ...mainsSyncSpec.nco, accumulatorBits: 8, phaseBits: 10 } }, 'name', 'x', 'nco.phaseBits'],
  ['unknown waveform', mainsSyncSpec, 'nco.waveform', 'triangle', 'nco.waveform'],
  ['unknown rounding', mainsSyncSpec, 'fixedPoint.rounding', 'up', 'fixedPoint.rounding'],
  ['unknown overflow', mainsSyncSpec, 'fixedPoint.overflow', 'clip', 'fixedPoint.overflow'],
  ['accumulator narrower than the data', mainsSyncSpec, 'fixedPoint.accumulatorBits', 8, 'fixedPoint.accumulatorBits'],
  ['unknown detector', mainsSyncSpec, 'detector.kind', 'xor', 'detector.kind'],
  ['misspelt optional field', { ...mainsSyncSpec, ripleFilter: null }, 'name', 'x', 'ripleFilter'],
  ['missing nco', mainsSyncSpec, 'nco', undefined, 'nco'],
  ['unreachable lag-lead damping', { ...ultrasonicSinglePoleSpec, filter: { kind: 'lag-lead', naturalHz: 2000, damping: 0.1 } }, 'name', 'x', 'filter.damping'],
  ['unreachable lag-lead natural frequency', { ...ultrasonicSinglePoleSpec, filter: { kind: 'lag-lead', naturalHz: 3000, damping: 5 } }, 'name', 'x', 'filter.naturalHz'],
];

describe('parseLoopSpec rejects bad fields by name', () => {
  it.each(badCases)('rejects %s', (_why, base, path, value, field) => {
    expect(fieldsOf(withChange(base, path, value))).toContain(field);
  });

  it.each([null, undefined, 42, 'spec', [], {}])('returns issues, not a throw, for %j', (input) => {
    const r = parseLoopSpec(input);
    expect(r.ok).toBe(false);
  });

  it('reports a cross-field issue together with an unrelated bad field (all problems at once)', () => {
    const spec = { ...mainsSyncSpec, name: 'Bad Name', sampleRateHz: 2e8, nco: { ...mainsSyncSpec.nco, waveform: 'triangle' } };
    const fields = fieldsOf(spec);
    expect(fields).toContain('name');
    expect(fields).toContain('nco.waveform');
    expect(fields).toContain('sampleRateHz');
  });

  it('says a missing field is missing, in words (not "received undefined")', () => {
    const { amplitudeBits: _dropped, ...nco } = mainsSyncSpec.nco;
    const r = parseLoopSpec({ ...mainsSyncSpec, nco, fixedPoint: undefined });
    expect(r.ok).toBe(false);
    const messages = r.ok ? [] : r.issues.map((i) => i.message);
    expect(messages).toContain('nco.amplitudeBits: missing (expected a number)');
    expect(messages).toContain('fixedPoint: missing (expected an object)');
    expect(messages.join(' ')).not.toMatch(/undefined/);
  });

  it('rejects taus and targets given together', () => {
    const spec = { ...mainsSyncSpec, filter: { kind: 'pi', tau1S: 1, tau2S: 0.01, naturalHz: 5, damping: 0.7 } };
    expect(fieldsOf(spec)).toContain('filter');
  });
});

describe('parseLoopSpec warnings', () => {
  it('warns when the clock is not an integer multiple of the sample rate, saying why', () => {
    const r = parseLoopSpec({ ...mainsSyncSpec, sampleRateHz: 12_345 });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const w = r.warnings.find((x) => x.field === 'sampleRateHz');
    expect(w?.message).toMatch(/not an integer/);
  });

  it('does not warn for an integer divider', () => {
    const r = parseLoopSpec(mainsSyncSpec);
    expect(r.ok && r.warnings.some((x) => x.field === 'sampleRateHz')).toBe(false);
  });

  it('warns that a 2·centerHz ripple above Nyquist aliases, with the alias frequency', () => {
    // 2·300 Hz = 600 Hz at fs = 1 kHz aliases to |600 − 1000| = 400 Hz (sampling theorem; OS3 Ch. 4).
    const r = parseLoopSpec({ ...mainsSyncSpec, sampleRateHz: 1000, centerHz: 300, filter: { kind: 'pi', tau1S: 1, tau2S: 0.05 }, rippleFilter: null });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.warnings.find((x) => x.field === 'centerHz')?.message).toMatch(/400 Hz/);
  });
});

describe('NCO warnings', () => {
  it('warns that a narrow sine table lowers the loop gain by (2^(B−1) − 1)/2^(B−1) (README, bit-true number formats)', () => {
    const r = parseLoopSpec({ ...mainsSyncSpec, nco: { ...mainsSyncSpec.nco, amplitudeBits: 4 } });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    // 7/8 = 0.875 → −1.16 dB
    expect(r.warnings.find((w) => w.field === 'nco.amplitudeBits')?.message).toMatch(/0\.875.*-1\.16 dB/);
    const wide = parseLoopSpec(mainsSyncSpec);
    expect(wide.ok && wide.warnings.some((w) => w.field === 'nco.amplitudeBits')).toBe(false);
  });
});
