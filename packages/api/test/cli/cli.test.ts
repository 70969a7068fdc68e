/**
 * The terminal commands as a CI pipeline runs them: a child process, stdout holding only JSON/CSV,
 * one line on stderr and exit code 2 for bad input, relative paths against INIT_CWD.
 */
import { spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { ifFmDemodSpec, mainsSyncSpec, ultrasonicSinglePoleSpec, VECTOR_CSV_COLUMNS } from '@loopwright/dsp';
import { describe, expect, it } from 'vitest';

const MAIN = fileURLToPath(new URL('../../src/cli/main.ts', import.meta.url));
const ROOT = fileURLToPath(new URL('../../../../', import.meta.url));

function cli(args: string[], initCwd: string) {
  const r = spawnSync(process.execPath, ['--import', 'tsx', MAIN, ...args], {
    // As `npm run -s loopwright` does: the process runs at the repository root and INIT_CWD says
    // where the user typed the command.
    cwd: ROOT,
    env: { ...process.env, INIT_CWD: initCwd },
    encoding: 'utf8',
    timeout: 60_000,
  });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

function workspace(): string {
  const dir = mkdtempSync(join(tmpdir(), 'lw-cli-'));
  writeFileSync(join(dir, 'spec.json'), JSON.stringify(mainsSyncSpec));
  writeFileSync(join(dir, 'tone.json'), JSON.stringify({ kind: 'tone', offsetHz: 0.5, durationS: 0.5, seed: 3 }));
  return dir;
}

const sha256 = (b: Buffer) => createHash('sha256').update(b).digest('hex');

describe('loopwright CLI', () => {
  it('design prints the analysis as JSON and nothing else', () => {
    const dir = workspace();
    const r = cli(['design', 'spec.json'], dir);
    expect(r.code, r.stderr).toBe(0);
    const out = JSON.parse(r.stdout) as { specName: string; margins: { discrete: unknown }; verdict: { stable: boolean } };
    expect(out.specName).toBe('mains_sync_50hz');
    expect(out.verdict.stable).toBe(true);
    expect(r.stderr).toBe('');
  });

  it('reads a spec file that starts with a UTF-8 byte-order mark', () => {
    const dir = workspace();
    writeFileSync(join(dir, 'bom.json'), Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(JSON.stringify(mainsSyncSpec))]));
    const r = cli(['design', 'bom.json'], dir);
    expect(r.code, r.stderr).toBe(0);
    expect(JSON.parse(r.stdout).specName).toBe('mains_sync_50hz');
  });

  it('simulate prints metrics JSON, and with --vectors N the first N golden vectors as CSV', () => {
    const dir = workspace();
    const metrics = cli(['simulate', 'spec.json', 'tone.json'], dir);
    expect(metrics.code, metrics.stderr).toBe(0);
    const m = JSON.parse(metrics.stdout) as { sampleCount: number; bitTrue: { locked: boolean; checksum: number } };
    expect(m.sampleCount).toBe(5000); // 0.5 s at 10 kHz
    expect(typeof m.bitTrue.checksum).toBe('number');

    const csv = cli(['simulate', 'spec.json', 'tone.json', '--vectors', '5'], dir);
    expect(csv.code, csv.stderr).toBe(0);
    const lines = csv.stdout.trimEnd().split('\n');
    expect(lines[0]).toBe(VECTOR_CSV_COLUMNS.join(','));
    expect(lines).toHaveLength(6);
    expect(lines.slice(1).map((l) => l.split(',')[0])).toEqual(['0', '1', '2', '3', '4']);
  });

  it('acquire prints each acquisition figure as estimate and measured side by side, a limit named instead of a figure', () => {
    const dir = workspace();
    const r = cli(['acquire', 'spec.json'], dir);
    expect(r.code, r.stderr).toBe(0);
    type Row = { name: string; estimate: { label: string; valueHz: number | null }; measured: { label: string; valueHz: number | null; passHz: number; failHz: number | null; limitedBy: string | null } };
    const out = JSON.parse(r.stdout) as { specName: string; figures: Row[]; search: { searchLimitHz: number } };
    expect(out.specName).toBe('mains_sync_50hz');
    expect(out.figures.map((f) => f.name)).toEqual(['lock-in', 'pull-out', 'hold-in', 'pull-in']);
    const [lockIn, , holdIn] = out.figures;
    expect(lockIn!.estimate.label).toBe('estimate');
    expect(lockIn!.measured.label).toBe('simulated');
    // 2ζωn/2π = 2·0.707·5 Hz for the PI targets (G3, B6).
    expect(lockIn!.estimate.valueHz).toBeCloseTo(7.07, 6);
    expect(lockIn!.measured.valueHz).toBeGreaterThan(lockIn!.measured.passHz - 1e-9);
    // Ideal PI: hold-in is unbounded (G3); the search stops at the control word's range ±gainHzPerUnit and says so.
    expect(holdIn!.measured.valueHz).toBeNull();
    expect(holdIn!.measured.limitedBy).toBe('control-range');
    expect(out.search.searchLimitHz).toBe(mainsSyncSpec.nco.gainHzPerUnit);
  });

  it('simulate runs a sweep and reports where lock was lost and regained, float and bit-true', () => {
    const dir = workspace();
    writeFileSync(join(dir, 'sweep.json'), JSON.stringify({ kind: 'sweep', fromHz: 0, toHz: 3, rateHzPerS: 3, durationS: 2.2 }));
    const r = cli(['simulate', 'spec.json', 'sweep.json'], dir);
    expect(r.code, r.stderr).toBe(0);
    const m = JSON.parse(r.stdout) as { float: { sweep: { turnS: number; heldThroughout: boolean } }; bitTrue: { sweep: { lockLostHz: number | null } } };
    expect(m.float.sweep.turnS).toBeCloseTo(1, 9);
    // 3 Hz is well inside the PI loop's pull-out range (≈ 14 Hz measured): no slip (G3).
    expect(m.float.sweep.heldThroughout).toBe(true);
    expect(m.bitTrue.sweep.lockLostHz).toBeNull();
  });

  it('render writes exactly the files the manifest lists, with the sums it states', () => {
    const dir = workspace();
    const r = cli(['render', 'spec.json', 'out'], dir);
    expect(r.code, r.stderr).toBe(0);
    const outDir = join(dir, 'out');
    const manifest = JSON.parse(readFileSync(join(outDir, 'manifest.json'), 'utf8')) as { files: { name: string; sha256: string; bytes: number }[] };
    expect(readdirSync(outDir).sort()).toEqual(['manifest.json', ...manifest.files.map((f) => f.name)].sort());
    for (const f of manifest.files) {
      const bytes = readFileSync(join(outDir, f.name));
      expect(sha256(bytes), f.name).toBe(f.sha256);
      expect(bytes.length).toBe(f.bytes);
    }
    const report = JSON.parse(r.stdout) as { manifestSha256: string };
    expect(report.manifestSha256).toBe(sha256(readFileSync(join(outDir, 'manifest.json'))));
  });

  it('renders the same bytes for the same spec on every run', () => {
    const dir = workspace();
    writeFileSync(join(dir, 'other.json'), JSON.stringify(ultrasonicSinglePoleSpec));
    const a = JSON.parse(cli(['render', 'other.json', 'a'], dir).stdout) as { manifestSha256: string };
    const b = JSON.parse(cli(['render', 'other.json', 'b'], dir).stdout) as { manifestSha256: string };
    expect(a.manifestSha256).toBe(b.manifestSha256);
  });

  it('names the offending field on one stderr line and exits 2 for a bad spec', () => {
    const dir = workspace();
    writeFileSync(join(dir, 'bad.json'), JSON.stringify({ ...mainsSyncSpec, fixedPoint: { ...mainsSyncSpec.fixedPoint, dataBits: 1 } }));
    for (const args of [['design', 'bad.json'], ['render', 'bad.json', 'out'], ['simulate', 'bad.json', 'tone.json']]) {
      const r = cli(args, dir);
      expect(r.code, args.join(' ')).toBe(2);
      expect(r.stdout).toBe('');
      expect(r.stderr.trimEnd().split('\n')).toHaveLength(1);
      expect(r.stderr).toContain('fixedPoint.dataBits');
    }
  });

  it('renders an IF demodulator with centerHz 6.87e-5 (it printed a RangeError stack trace), and refuses a 17-bit table naming it', () => {
    const dir = workspace();
    writeFileSync(join(dir, 'tiny.json'), JSON.stringify({ ...ifFmDemodSpec, centerHz: 6.87e-5 }));
    const r = cli(['render', 'tiny.json', 'out'], dir);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stderr).toBe('');
    writeFileSync(join(dir, 'wide.json'), JSON.stringify({ ...mainsSyncSpec, nco: { ...mainsSyncSpec.nco, phaseBits: 17 } }));
    const wide = cli(['render', 'wide.json', 'out2'], dir);
    expect(wide.code).toBe(2);
    expect(wide.stderr).toMatch(/^loopwright: SPEC\.json field nco\.phaseBits: .*at most 16 address bits/);
    expect(wide.stderr).not.toMatch(/\n\s+at /);
  });

  it('names the scenario field for a bad scenario', () => {
    const dir = workspace();
    writeFileSync(join(dir, 'bad-scenario.json'), JSON.stringify({ kind: 'tone', offsetHz: 1, durationS: -1 }));
    const r = cli(['simulate', 'spec.json', 'bad-scenario.json'], dir);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/SCENARIO\.json.*durationS/);
  });

  it('exits 2 with one line for a missing file, invalid JSON, an unknown command or a bad --vectors', () => {
    const dir = workspace();
    writeFileSync(join(dir, 'broken.json'), '{"specVersion": 1,');
    const cases: [string[], RegExp][] = [
      [['design', 'nope.json'], /SPEC\.json: cannot read .*nope\.json \(ENOENT\)/],
      [['design', 'broken.json'], /SPEC\.json: .*broken\.json is not valid JSON/],
      [['frobnicate'], /unknown command "frobnicate"/],
      [['simulate', 'spec.json', 'tone.json', '--vectors', 'lots'], /--vectors: must be a whole number/],
      [['render', 'spec.json'], /render takes 2 arguments, got 1/],
    ];
    for (const [args, pattern] of cases) {
      const r = cli(args, dir);
      expect(r.code, args.join(' ')).toBe(2);
      expect(r.stdout).toBe('');
      expect(r.stderr).toMatch(pattern);
      expect(r.stderr.trimEnd().split('\n')).toHaveLength(1);
    }
  });
});

describe('loopwright verify and estimate', () => {
  const noTools = mkdtempSync(join(tmpdir(), 'lw-cli-path-'));

  it('render holds the reference RTL, both testbenches and one hex file per golden column', () => {
    const dir = workspace();
    expect(cli(['render', 'spec.json', 'out'], dir).code).toBe(0);
    const files = readdirSync(join(dir, 'out'));
    for (const part of ['round', 'nco', 'detector', 'section', 'loop']) {
      expect(files).toContain(`mains_sync_50hz_${part}.vhd`);
      expect(files).toContain(`mains_sync_50hz_${part}.v`);
    }
    expect(files).toContain('mains_sync_50hz_loop_tb.vhd');
    expect(files).toContain('mains_sync_50hz_loop_tb.v');
    for (const column of VECTOR_CSV_COLUMNS.filter((c) => c !== 'sample')) expect(files).toContain(`mains_sync_50hz_${column}.hex`);
  });

  it('verify exits 0 with the summary when the testbenches pass, 1 with the FAIL when they do not', () => {
    const dir = workspace();
    expect(cli(['render', 'spec.json', 'out'], dir).code).toBe(0);
    const pass = cli(['verify', 'out', '--samples', '200'], dir);
    expect(pass.code, pass.stderr).toBe(0);
    expect((JSON.parse(pass.stdout) as { summary: string }).summary).toBe('reference RTL bit-exact in GHDL and Icarus on the first 200 of the 65,536 golden samples');

    const include = join(dir, 'out', 'mains_sync_50hz.vh');
    writeFileSync(include, readFileSync(include, 'utf8').replace(/(MAINS_SYNC_50HZ_NCO_TUNING_WORD = 32'd)(\d+)/, (_m, head: string, v: string) => `${head}${Number(v) + 1}`));
    const fail = cli(['verify', 'out', '--samples', '200'], dir);
    expect(fail.code).toBe(1);
    const v = JSON.parse(fail.stdout) as { verdict: string; runs: { simulator: string; verdict: string; detail: string }[] };
    expect(v.verdict).toBe('failed');
    // Only the Verilog include was changed: Icarus fails at sample 1, GHDL still passes.
    expect(v.runs.map((r) => [r.simulator, r.verdict])).toEqual([['ghdl', 'pass'], ['icarus', 'fail']]);
    expect(v.runs[1]!.detail).toMatch(/^FAIL sample 1 signal nco_phase expected \d+ got \d+$/);
  });

  it('verify exits 3 when no simulator is installed, and 2 for a folder that is no release', () => {
    const dir = workspace();
    expect(cli(['render', 'spec.json', 'out'], dir).code).toBe(0);
    const r = spawnSync(process.execPath, ['--import', 'tsx', MAIN, 'verify', 'out'], { cwd: ROOT, env: { ...process.env, INIT_CWD: dir, PATH: noTools }, encoding: 'utf8' });
    expect(r.status).toBe(3);
    expect((JSON.parse(r.stdout) as { verdict: string }).verdict).toBe('not-run');
    const none = cli(['verify', 'nowhere'], dir);
    expect(none.code).toBe(2);
    expect(none.stderr).toMatch(/^loopwright: OUTDIR: .*holds no readable manifest\.json/);
  });

  it('estimate prints "not estimated" without yosys and names the field of a bad spec', () => {
    const dir = workspace();
    const r = spawnSync(process.execPath, ['--import', 'tsx', MAIN, 'estimate', 'spec.json'], { cwd: ROOT, env: { ...process.env, INIT_CWD: dir, PATH: noTools }, encoding: 'utf8' });
    expect(r.status, r.stderr).toBe(0);
    expect(JSON.parse(r.stdout)).toEqual({ state: 'not-estimated', reason: 'yosys is not installed' });
    writeFileSync(join(dir, 'bad.json'), JSON.stringify({ ...mainsSyncSpec, nco: { ...mainsSyncSpec.nco, phaseBits: 99 } }));
    const bad = cli(['estimate', 'bad.json'], dir);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/^loopwright: SPEC\.json field nco\.phaseBits/);
  });
});
