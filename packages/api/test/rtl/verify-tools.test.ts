/**
 * What `verify` and `estimate` say when the tools are there, missing, or cannot give a verdict: a
 * missing simulator is "not run" (never "passed"), a compile error is a failure without a verdict
 * line, and a missing yosys gives "not estimated". (The estimate's figures: test/releases/verification.test.ts.)
 */
import { mkdtempSync, readFileSync, rmSync, symlinkSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { mainsSyncSpec } from '@loopwright/dsp';
import { afterAll, describe, expect, it } from 'vitest';
import { estimateResources } from '../../src/rtl/estimate.ts';
import { rtlFolder } from '../../src/rtl/releaseFolder.ts';
import { parseVerdictLine, verifyFolder } from '../../src/rtl/verify.ts';
import { renderToFolder, tamper } from './rtlCases.ts';

const { dir } = renderToFolder(mainsSyncSpec);
const emptyPath = mkdtempSync(join(tmpdir(), 'lw-nopath-'));
afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
  rmSync(emptyPath, { recursive: true, force: true });
});

function verilogSources(folder: string) {
  const f = rtlFolder(folder);
  return { files: new Map([...f.verilogFiles, f.verilogInclude].map((n) => [n, readFileSync(join(folder, n), 'utf8')])), modules: f.verilogFiles, top: f.loopEntity };
}

describe('parseVerdictLine', () => {
  it('reads the last PASS or FAIL line among a simulator\'s own output', () => {
    expect(parseVerdictLine('note: x\nPASS 1024 samples\nsimulation finished @1ms')).toEqual({ line: 'PASS 1024 samples', pass: 1024, fail: null });
    expect(parseVerdictLine('FAIL sample 7 signal filter_code expected -3 got 12\nFATAL: tb.v:90: golden vector mismatch')?.fail).toEqual({
      sampleIndex: 7,
      column: 'filter_code',
      expected: '-3',
      got: '12',
    });
    expect(parseVerdictLine('error: cannot find unit')).toBeNull();
  });
});

describe('verify without the simulators', () => {
  it('says "not run" for both, and never "passed", when neither is installed', async () => {
    const v = await verifyFolder(dir, { samples: 64, env: { PATH: emptyPath } });
    expect(v.runs.map((r) => [r.simulator, r.verdict, r.version])).toEqual([
      ['ghdl', 'not-run', null],
      ['icarus', 'not-run', null],
    ]);
    expect(v.verdict).toBe('not-run');
    expect(v.summary).toBe('reference RTL not verified: GHDL and Icarus not run (not installed)');
  });

  it('passes with the one that is installed and names the other as not run', async () => {
    const onlyIcarus = mkdtempSync(join(tmpdir(), 'lw-icarus-'));
    try {
      for (const tool of ['iverilog', 'vvp']) symlinkSync(`/usr/bin/${tool}`, join(onlyIcarus, tool));
      const v = await verifyFolder(dir, { samples: 64, env: { PATH: onlyIcarus } });
      expect(v.runs.map((r) => r.verdict)).toEqual(['not-run', 'pass']);
      expect(v.verdict).toBe('partial');
      expect(v.summary).toBe('reference RTL bit-exact in Icarus on the first 64 of the 65,536 golden samples; GHDL not run (not installed)');
    } finally {
      rmSync(onlyIcarus, { recursive: true, force: true });
    }
  });
});

describe('verify of damaged RTL', () => {
  it('is a failure without a verdict line, naming the simulator', async () => {
    const broken = renderToFolder(mainsSyncSpec).dir;
    try {
      tamper(broken, 'mains_sync_50hz_section.vhd', 'end architecture rtl;', 'end architecture nonsense;');
      tamper(broken, 'mains_sync_50hz_section.v', 'endmodule', 'endmodule oops');
      const v = await verifyFolder(broken, { samples: 64 });
      expect(v.runs.map((r) => r.verdict)).toEqual(['error', 'error']);
      expect(v.verdict).toBe('failed');
      expect(v.summary).toMatch(/^reference RTL FAILED: GHDL gave no verdict \(ghdl -a failed .*\); Icarus gave no verdict \(iverilog -g2005 failed/);
    } finally {
      rmSync(broken, { recursive: true, force: true });
    }
  });

  // The classic trap of a hand-written loop (an unsigned localparam zero-extends in a signed product)
  // cannot catch the reference RTL: its modules declare every coefficient parameter signed themselves.
  it('still passes when a coefficient localparam of the include loses its signed keyword', async () => {
    const unsigned = renderToFolder(mainsSyncSpec).dir;
    try {
      tamper(unsigned, 'mains_sync_50hz.vh', 'localparam signed [17:0] MAINS_SYNC_50HZ_S0_B1', 'localparam [17:0] MAINS_SYNC_50HZ_S0_B1');
      const v = await verifyFolder(unsigned, { samples: 256, simulators: ['icarus'] });
      expect(v.runs[0]?.detail).toBe('PASS 256 samples');
    } finally {
      rmSync(unsigned, { recursive: true, force: true });
    }
  });
});

describe('estimate', () => {
  it('says "not estimated" when yosys is not installed', async () => {
    expect(await estimateResources(verilogSources(dir), { env: { PATH: emptyPath } })).toEqual({ state: 'not-estimated', reason: 'yosys is not installed' });
  });
});
