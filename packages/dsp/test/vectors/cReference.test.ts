/// <reference types="node" />
/**
 * Bit-exactness proof: bench/loop.c — the bit-true arithmetic written independently in plain C with
 * 64-bit integers and compiled by gcc — must produce the same record checksum as the TypeScript loop
 * for the same input codes, across widths, rounding and overflow modes, waveforms and accumulator sizes.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { simulate } from '../../src/planDesign.ts';
import { mainsSyncSpec, ultrasonicSinglePoleSpec, ifFmDemodSpec, ultrasonicLagLeadSpec } from '../../src/spec/examples.ts';
import type { LoopSpec } from '../../src/spec/schema.ts';
import type { Scenario } from '../../src/spec/scenario.ts';
import { formatCParams } from '../../bench/cParams.ts';
import fc from 'fast-check';
import { FieldError } from '../../src/fixed/fieldError.ts';

const here = path.dirname(new URL(import.meta.url).pathname);
let dir = '';
let exe = '';

beforeAll(() => {
  dir = mkdtempSync(path.join(tmpdir(), 'loopwright-c-'));
  exe = path.join(dir, 'loop');
  execFileSync('gcc', ['-O2', '-Wall', '-Werror', '-o', exe, path.join(here, '../../bench/loop.c')]);
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function withFx(spec: LoopSpec, fx: Partial<LoopSpec['fixedPoint']>, nco: Partial<LoopSpec['nco']> = {}): LoopSpec {
  return { ...spec, fixedPoint: { ...spec.fixedPoint, ...fx }, nco: { ...spec.nco, ...nco } };
}

const CASES: ReadonlyArray<[string, LoopSpec, Scenario]> = [
  ['PI + ripple filter (mains)', mainsSyncSpec, { kind: 'frequency-step', stepHz: 2, atS: 0.05, durationS: 0.5, snrDb: 30, seed: 5 }],
  ['single pole (flow)', ultrasonicSinglePoleSpec, { kind: 'tone', offsetHz: 120, durationS: 0.02, snrDb: 20, seed: 9 }],
  ['lag-lead + ripple (flow)', ultrasonicLagLeadSpec, { kind: 'fm', modulation: 'square', rateHz: 200, deviationHz: 300, durationS: 0.02 }],
  ['Butterworth (IF FM)', ifFmDemodSpec, { kind: 'fm', modulation: 'sine', rateHz: 20e3, deviationHz: 75e3, durationS: 0.0005 }],
  ['truncate + wrap, 12-bit data', withFx(ultrasonicSinglePoleSpec, { rounding: 'truncate', overflow: 'wrap', dataBits: 12, accumulatorBits: 24 }), { kind: 'tone', offsetHz: 400, durationS: 0.01, snrDb: 10, seed: 2 }],
  ['half-even, narrow MAC that overflows', withFx(mainsSyncSpec, { rounding: 'half-even', accumulatorBits: 22 }), { kind: 'phase-step', stepDeg: 90, atS: 0.02, durationS: 0.2 }],
  ['square NCO, 48-bit accumulator', withFx(ultrasonicSinglePoleSpec, {}, { waveform: 'square', accumulatorBits: 48 }), { kind: 'tone', offsetHz: 50, durationS: 0.01 }],
  ['64-bit accumulator, 24-bit words', withFx(mainsSyncSpec, { dataBits: 24, coefficientBits: 24, accumulatorBits: 56 }, { accumulatorBits: 64, phaseBits: 16, amplitudeBits: 20 }), { kind: 'tone', offsetHz: 0.5, durationS: 0.5, snrDb: 40, seed: 3 }],
  ['40-bit accumulator, address across the word split', withFx(ultrasonicSinglePoleSpec, { overflow: 'wrap' }, { accumulatorBits: 40, phaseBits: 12 }), { kind: 'tone', offsetHz: -200, durationS: 0.01 }],
  // A square NCO with 4-bit amplitude and 8 coefficient fraction bits makes rounding ties common
  // (x·(2^3 − 1) mod 2^3 = 2^2 for many x), so these cases tell the three tie rules apart.
  ...(['nearest', 'half-even', 'truncate'] as const).map((rounding): [string, LoopSpec, Scenario] => [
    `rounding ties, ${rounding}`,
    withFx(ultrasonicSinglePoleSpec, { rounding, coefficientFractionBits: 8 }, { waveform: 'square', amplitudeBits: 4 }),
    { kind: 'tone', offsetHz: 100, durationS: 0.01, snrDb: 30, seed: 4 },
  ]),
];

describe('bench/loop.c reproduces the TypeScript bit-true loop bit for bit', () => {
  it.each(CASES)('%s', (name, spec, scenario) => {
    const r = simulate(spec, scenario, { mode: 'bit-true', keepRecord: true });
    const rec = r.bitTrue!.record!;
    const slug = name.replace(/[^a-z0-9]+/gi, '_');
    const params = path.join(dir, `${slug}.txt`);
    const input = path.join(dir, `${slug}.bin`);
    writeFileSync(params, formatCParams(r.plan!));
    writeFileSync(input, Buffer.from(rec.inputCode.buffer, rec.inputCode.byteOffset, rec.inputCode.byteLength));
    const out = JSON.parse(execFileSync(exe, [params, input], { encoding: 'utf8' })) as { samples: number; checksum: number };
    expect(out.samples).toBe(rec.length);
    expect(out.checksum).toBe(r.bitTrue!.checksum);
  });

  it('tells the tie rules apart (so a firmware with the wrong rule fails conformance)', () => {
    const sums = CASES.filter(([name]) => name.startsWith('rounding ties')).map(([, spec, sc]) => simulate(spec, sc, { mode: 'bit-true' }).bitTrue!.checksum);
    expect(new Set(sums).size).toBe(3);
  });
});

describe('bench/loop.c and the TypeScript loop agree on random widths and modes', () => {
  it('gives identical checksums for 30 random configurations (fast-check, fixed seed)', () => {
    const bases = [mainsSyncSpec, ultrasonicSinglePoleSpec, ultrasonicLagLeadSpec, ifFmDemodSpec];
    const config = fc.record({
      base: fc.integer({ min: 0, max: bases.length - 1 }),
      dataBits: fc.integer({ min: 6, max: 26 }),
      coefficientBits: fc.integer({ min: 12, max: 26 }),
      macExtra: fc.integer({ min: -8, max: 30 }),
      rounding: fc.constantFrom('nearest', 'half-even', 'truncate' as const),
      overflow: fc.constantFrom('saturate', 'wrap' as const),
      waveform: fc.constantFrom('sine', 'square' as const),
      accumulatorBits: fc.integer({ min: 16, max: 64 }),
      phaseBits: fc.integer({ min: 4, max: 14 }),
      amplitudeBits: fc.integer({ min: 4, max: 24 }),
      snrDb: fc.integer({ min: 0, max: 60 }),
    });
    let checked = 0;
    fc.assert(
      fc.property(config, (c) => {
        const base = bases[c.base]!;
        const macBits = Math.min(64, Math.max(c.dataBits, c.coefficientBits, c.dataBits + c.coefficientBits + c.macExtra));
        const spec = withFx(base, { dataBits: c.dataBits, coefficientBits: c.coefficientBits, accumulatorBits: macBits, rounding: c.rounding, overflow: c.overflow }, { waveform: c.waveform, accumulatorBits: c.accumulatorBits, phaseBits: Math.min(c.phaseBits, c.accumulatorBits), amplitudeBits: c.amplitudeBits });
        const scenario: Scenario = { kind: 'tone', offsetHz: 0.02 * spec.nco.gainHzPerUnit, durationS: 3000 / spec.sampleRateHz, snrDb: c.snrDb, seed: c.base + 1 };
        let r;
        try {
          r = simulate(spec, scenario, { mode: 'bit-true', keepRecord: true });
        } catch (err) {
          if (err instanceof FieldError) return; // a width the coefficients cannot use: nothing to compare
          throw err;
        }
        const rec = r.bitTrue!.record!;
        const params = path.join(dir, 'random.txt');
        const input = path.join(dir, 'random.bin');
        writeFileSync(params, formatCParams(r.plan!));
        writeFileSync(input, Buffer.from(rec.inputCode.buffer, rec.inputCode.byteOffset, rec.inputCode.byteLength));
        const out = JSON.parse(execFileSync(exe, [params, input], { encoding: 'utf8' })) as { checksum: number };
        expect(out.checksum).toBe(r.bitTrue!.checksum);
        checked++;
      }),
      { numRuns: 30, seed: 20261202 },
    );
    expect(checked).toBeGreaterThan(20);
  });
});
