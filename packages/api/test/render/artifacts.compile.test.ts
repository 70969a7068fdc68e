/**
 * Every artifact of several specs compiles with the real toolchains, and a checker generated from
 * manifest.json in each language asserts that the constants equal the manifest's integer codes
 * (VHDL-2008 under GHDL with --assert-level=error, Verilog under Icarus with $fatal, C under gcc
 * -std=c11 -Wall -Wextra -Werror -pedantic with the exit code).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { exampleSpecs, mainsSyncSpec, ultrasonicLagLeadSpec, type LoopSpec } from '@loopwright/dsp';
import { describe, expect, it } from 'vitest';
import { artifactNames, type Manifest } from '../../src/render/artifacts.ts';
import { renderRelease } from './release.ts';
import { codeNames } from '../../src/render/identifiers.ts';
import { checkC, checkVerilog, checkVhdl, workDir } from './toolchains.ts';

/** Wide words and an awkward name: 64-bit accumulators (the C and Verilog minimum-value paths), a
 *  48-bit NCO, a name that is no VHDL basic identifier (doubled and trailing underscore). */
const wideSpec: LoopSpec = {
  ...mainsSyncSpec,
  name: 'wide__loop_',
  nco: { ...mainsSyncSpec.nco, accumulatorBits: 48 },
  fixedPoint: { ...mainsSyncSpec.fixedPoint, coefficientBits: 24, accumulatorBits: 64 },
};

/** A 32-bit accumulator puts the int32 minimum through the C and Verilog minimum-value rules. */
const word32Spec: LoopSpec = {
  ...ultrasonicLagLeadSpec,
  name: 'acc32',
  fixedPoint: { ...ultrasonicLagLeadSpec.fixedPoint, accumulatorBits: 32, rounding: 'truncate', overflow: 'wrap' },
};

const cases: { id: string; spec: LoopSpec }[] = [
  ...exampleSpecs.map((e) => ({ id: e.id, spec: e.spec })),
  { id: 'wide words, extended VHDL name', spec: wideSpec },
  { id: '32-bit accumulator, truncate and wrap', spec: word32Spec },
];

function render(spec: LoopSpec) {
  const rendered = renderRelease(spec);
  const dir = workDir(rendered.files);
  const manifest = JSON.parse(readFileSync(join(dir, 'manifest.json'), 'utf8')) as Manifest;
  return { rendered, dir, manifest, names: artifactNames(spec.name), vhdlPackage: codeNames(spec.name).vhdlPackage };
}

describe.each(cases)('artifacts of $id', ({ spec }) => {
  const { dir, manifest, names, vhdlPackage } = render(spec);

  it('VHDL package analyses under GHDL --std=08 and its constants equal the manifest', () => {
    const r = checkVhdl(dir, names.vhdl, vhdlPackage, manifest);
    expect(r.output).toContain('checked');
    expect(r.ok, r.output).toBe(true);
  });

  it('Verilog include compiles under iverilog -g2012 -Wall and its constants equal the manifest', () => {
    const r = checkVerilog(dir, names.verilog, manifest);
    expect(r.ok, r.output).toBe(true);
    expect(r.output).toContain(`checked ${manifest.constants.length + manifest.counts.length} constants`);
  });

  it('states the minimum of every signed word without an out-of-range literal', () => {
    const header = readFileSync(join(dir, names.cHeader), 'utf8');
    for (const c of manifest.constants.filter((k) => k.name.endsWith('_MIN'))) {
      const bits = c.widthBits > 32 ? 64 : c.widthBits > 16 ? 32 : c.widthBits > 8 ? 16 : 8;
      if (BigInt(c.code) === -(2n ** BigInt(bits - 1))) expect(header).toContain(`#define ${c.name} (-INT${bits}_C(${2n ** BigInt(bits - 1) - 1n}) - 1)`);
    }
  });

  it('C header compiles under gcc -std=c11 -Wall -Wextra -Werror and its constants equal the manifest', () => {
    const r = checkC(dir, names.cHeader, manifest);
    expect(r.ok, r.output).toBe(true);
  });
});

describe('the sine table', () => {
  it('holds round((2^(B-1) - 1) sin(2 pi k / 2^P)) for every address (full scale 2^(B-1) - 1)', () => {
    // The table definition of TRG71 with the symmetric full scale the dsp README states; sin from Math.
    const { manifest } = render(mainsSyncSpec);
    const table = manifest.tables.find((t) => t.name === 'MAINS_SYNC_50HZ_SINE')!;
    const { phaseBits: p, amplitudeBits: b } = mainsSyncSpec.nco;
    expect(table.codes).toHaveLength(2 ** p);
    expect(table.widthBits).toBe(b);
    const fullScale = 2 ** (b - 1) - 1;
    table.codes.forEach((code, k) => {
      const exact = fullScale * Math.sin((2 * Math.PI * k) / 2 ** p);
      expect(Math.abs(code - exact), `entry ${k}`).toBeLessThanOrEqual(0.5 + 1e-9);
    });
  });
});

describe('the checkers can fail', () => {
  // A checker that cannot fail proves nothing: change one code in the manifest and each language must object.
  const { dir, manifest, names, vhdlPackage } = render(mainsSyncSpec);
  const target = manifest.constants.find((c) => c.name.endsWith('_S0_B0'))!;
  const tampered: Manifest = {
    ...manifest,
    constants: manifest.constants.map((c) => (c === target ? { ...c, code: String(BigInt(c.code) + 1n) } : c)),
  };

  const tamperedTable: Manifest = {
    ...manifest,
    tables: manifest.tables.map((t) => ({ ...t, codes: t.codes.map((c, k) => (k === 7 ? c - 1 : c)) })),
  };

  it('each language reports a changed sine-table entry', () => {
    const runs = [checkVhdl(dir, names.vhdl, vhdlPackage, tamperedTable), checkVerilog(dir, names.verilog, tamperedTable), checkC(dir, names.cHeader, tamperedTable)];
    for (const r of runs) {
      expect(r.ok).toBe(false);
      expect(r.output).toMatch(/MAINS_SYNC_50HZ_SINE value at 7/);
    }
  });

  it('GHDL reports the changed constant', () => {
    const r = checkVhdl(dir, names.vhdl, vhdlPackage, tampered);
    expect(r.ok).toBe(false);
    expect(r.output).toContain(`${target.name} value`);
  });

  it('vvp stops with $fatal on the changed constant', () => {
    const r = checkVerilog(dir, names.verilog, tampered);
    expect(r.ok).toBe(false);
    expect(r.output).toContain(`${target.name} value`);
  });

  it('the C checker exits non-zero on the changed constant', () => {
    const r = checkC(dir, names.cHeader, tampered);
    expect(r.ok).toBe(false);
    expect(r.output).toContain(target.name);
  });
});
