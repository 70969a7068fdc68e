/**
 * A property over the whole spec schema (fast-check, seeded): every spec the analysis accepts is
 * released, or the cut is refused with a 400 that names a field of the spec; and `loopwright render`
 * of the same spec agrees — the same files when the server released it, exit 2 naming the same
 * field when it refused — and never prints a stack trace. Specs are drawn over every filter kind and
 * every fixed-point and NCO setting, with frequencies log-uniform over the schema's range.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { MAX_PHASE_BITS, WIDTH_LIMITS, type LoopSpecInput } from '@loopwright/dsp';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cliMain } from '../../src/cli/main.ts';
import { csrf, designerWithProject, useTestApp, type Agent } from '../helpers.ts';

const SEED = 20_261_203;
/** The schema's largest Butterworth order. */
const MAX_ORDER = WIDTH_LIMITS['filter.order'][1];
const RUNS = 36;

const t = useTestApp();
let designer: Agent;
let projectId: number;
let dir: string;

beforeAll(async () => {
  ({ designer, projectId } = await designerWithProject(t, 'Release property'));
  dir = mkdtempSync(join(tmpdir(), 'lw-property-'));
});

afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
});

/** 10^u for u uniform in [lo, hi]: every decade of the range as likely as any other. */
const logUniform = (lo: number, hi: number) => fc.double({ min: lo, max: hi, noNaN: true }).map((e) => Number((10 ** e).toPrecision(6)));
/** A fraction of the Nyquist frequency, log-uniform down to 1e-13 of it (a centre far below the loop rate). */
const belowNyquist = logUniform(-13, -0.01);
/** Within the schema's frequency range, 1 µHz … 1 THz. */
const inHz = (f: number) => Math.min(1e12, Math.max(1e-6, f));

const filterArb = (nyquistHz: number) =>
  fc.oneof(
    fc.record({ kind: fc.constant('single-pole' as const), cutoffHz: belowNyquist.map((f) => inHz(f * nyquistHz)) }),
    fc.record({ kind: fc.constant('butterworth' as const), order: fc.integer({ min: 1, max: MAX_ORDER }), cutoffHz: belowNyquist.map((f) => inHz(f * nyquistHz)) }),
    ...(['lag-lead', 'pi'] as const).flatMap((kind) => [
      fc.record({ kind: fc.constant(kind), tau1S: logUniform(-9, 3), tau2S: logUniform(-9, 3) }),
      fc.record({ kind: fc.constant(kind), naturalHz: belowNyquist.map((f) => inHz(f * nyquistHz)), damping: logUniform(-3, 2) }),
    ]),
  );

const specArb: fc.Arbitrary<LoopSpecInput> = logUniform(-3, 9).chain((sampleRateHz) => {
  const nyquistHz = sampleRateHz / 2;
  return fc
    .record({
      name: fc.stringMatching(/^[a-z][a-z0-9_]{0,39}$/),
      clockRatio: fc.constantFrom(1, 2, 10, 1000, 1.5, 10_000),
      centerFraction: belowNyquist,
      amplitude: logUniform(-6, 0),
      nco: fc.record({
        accumulatorBits: fc.integer({ min: 16, max: 64 }),
        // Mostly the small tables firmware uses, now and then the largest allowed.
        phaseBits: fc.oneof({ weight: 5, arbitrary: fc.integer({ min: 2, max: 12 }) }, { weight: 1, arbitrary: fc.constant(MAX_PHASE_BITS) }),
        amplitudeBits: fc.integer({ min: 2, max: 32 }),
        gainFraction: logUniform(-8, 1),
        waveform: fc.constantFrom('sine' as const, 'square' as const),
      }),
      filter: filterArb(nyquistHz),
      ripple: fc.option(fc.record({ order: fc.integer({ min: 1, max: MAX_ORDER }), cutoffHz: belowNyquist.map((f) => inHz(f * nyquistHz)) }), { nil: null }),
      prewarp: fc.option(belowNyquist.map((f) => inHz(f * nyquistHz)), { nil: null }),
      fixedPoint: fc.record({
        coefficientBits: fc.integer({ min: 2, max: 32 }),
        fraction: fc.oneof(fc.constant('auto' as const), fc.integer({ min: 0, max: 32 })),
        dataBits: fc.integer({ min: 2, max: 32 }),
        extraAccumulatorBits: fc.integer({ min: 0, max: 32 }),
        rounding: fc.constantFrom('nearest' as const, 'half-even' as const, 'truncate' as const),
        overflow: fc.constantFrom('saturate' as const, 'wrap' as const),
      }),
    })
    .map((d) => {
      const fp = d.fixedPoint;
      return {
        specVersion: 1 as const,
        name: d.name,
        clockHz: inHz(sampleRateHz * d.clockRatio),
        sampleRateHz,
        centerHz: inHz(d.centerFraction * nyquistHz),
        input: { amplitude: d.amplitude },
        detector: { kind: 'multiplier' as const },
        nco: { accumulatorBits: d.nco.accumulatorBits, phaseBits: d.nco.phaseBits, amplitudeBits: d.nco.amplitudeBits, gainHzPerUnit: inHz(d.nco.gainFraction * sampleRateHz), waveform: d.nco.waveform },
        filter: d.filter,
        rippleFilter: d.ripple,
        discretization: { method: 'bilinear' as const, prewarpHz: d.prewarp },
        fixedPoint: {
          coefficientBits: fp.coefficientBits,
          coefficientFractionBits: fp.fraction === 'auto' ? ('auto' as const) : Math.min(fp.fraction, fp.coefficientBits),
          dataBits: fp.dataBits,
          accumulatorBits: Math.min(64, Math.max(fp.dataBits, fp.coefficientBits) + fp.extraAccumulatorBits),
          rounding: fp.rounding,
          overflow: fp.overflow,
        },
      };
    });
});

/** Whether `field` ("spec.nco.gainHzPerUnit") names a field of `spec` (present, or an optional one of its parent). */
function namesSpecField(spec: unknown, field: unknown): boolean {
  if (typeof field !== 'string' || !field.startsWith('spec.')) return false;
  const parts = field.split('.').slice(1);
  let node: unknown = spec;
  for (const [i, key] of parts.entries()) {
    if (node === null || typeof node !== 'object') return false;
    if (!(key in node)) return i === parts.length - 1 && ['tau1S', 'tau2S', 'naturalHz', 'damping', 'rippleFilter'].includes(key);
    node = (node as Record<string, unknown>)[key];
  }
  return true;
}

async function renderWithCli(spec: unknown, n: number): Promise<{ code: number; stdout: string; stderr: string }> {
  const specPath = join(dir, `spec-${n}.json`);
  writeFileSync(specPath, JSON.stringify(spec));
  let stdout = '';
  let stderr = '';
  const code = await cliMain(['render', specPath, join(dir, `out-${n}`)], (s) => (stdout += s), (s) => (stderr += s));
  return { code, stdout, stderr };
}

describe('every spec the analysis accepts', () => {
  it(`releases, or is refused naming a spec field, and loopwright render agrees (${RUNS} specs over the whole schema)`, async () => {
    const seen = { analysed: 0, released: 0, refused: 0 };
    let n = 0;
    await fc.assert(
      fc.asyncProperty(specArb, async (spec) => {
        n += 1;
        const analysis = await designer.post('/api/analysis').set(csrf).send({ spec });
        expect(analysis.status, analysis.text.slice(0, 300)).toBeLessThan(500);
        if (analysis.status !== 200) return;
        seen.analysed += 1;
        const design = await designer.post(`/api/projects/${projectId}/designs`).set(csrf).send({ name: `Drawn ${n}`, spec }).expect(201);
        const cut = await designer.post(`/api/designs/${design.body.id}/releases`).set(csrf);
        const cli = await renderWithCli(spec, n);
        expect(cli.stderr, 'the CLI prints no stack trace').not.toMatch(/\n\s+at |internal error/);
        if (cut.status === 201) {
          seen.released += 1;
          expect(cli.code, cli.stderr).toBe(0);
          // Every file the same bytes; the release's manifest alone also names its release (test/releases/manifest-stamp).
          const sums = (files: { name: string; sha256: string }[]) => files.filter((f) => f.name !== 'manifest.json').map((f) => `${f.name} ${f.sha256}`);
          expect(sums(cut.body.files)).toEqual(sums(JSON.parse(cli.stdout).files));
        } else {
          expect(cut.status, cut.text.slice(0, 300)).toBe(400);
          expect(namesSpecField(spec, cut.body.error.field), `${cut.body.error.field}: ${cut.body.error.message}`).toBe(true);
          seen.refused += 1;
          expect(cli.code).toBe(2);
          expect(cli.stderr).toContain(`field ${String(cut.body.error.field).replace(/^spec\./, '')}`);
          expect(cli.stderr.trimEnd().split('\n')).toHaveLength(1);
        }
      }),
      { numRuns: RUNS, seed: SEED, endOnFailure: true },
    );
    // The draws reach both sides of the analysis, and some reach the cut.
    expect(seen.analysed).toBeGreaterThan(RUNS / 6);
    expect(seen.released).toBeGreaterThan(0);
    // Each draw cuts a release and renders it with the CLI, and each measures the acquisition by
    // simulation (up to a second a spec on a quiet machine): bounded, but not by the suite's 60 s.
  }, 240_000);
});
