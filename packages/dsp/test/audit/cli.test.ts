/// <reference types="node" />
/**
 * The CLI of DESIGN.md ("API shape"): `npm run -s loopwright -- design|simulate|render`, run as a CI
 * pipeline would, from the repository root. Checks stdout is only the promised output and that the
 * numbers are the library's (and, for the first vectors, the arithmetic worked by hand).
 */
import { spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { analyzeDesign, mainsSyncSpec, ncoTuning } from '../../src/index.ts';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../../..');
const dir = mkdtempSync(path.join(tmpdir(), 'lw-audit-'));
const specPath = path.join(dir, 'mains.json');
writeFileSync(specPath, JSON.stringify(mainsSyncSpec));
const scenarioPath = path.join(dir, 'step.json');
writeFileSync(scenarioPath, JSON.stringify({ kind: 'frequency-step', stepHz: 2, atS: 0.1, durationS: 0.5 }));

afterAll(() => rmSync(dir, { recursive: true, force: true }));

function cli(...args: string[]) {
  const r = spawnSync('npm', ['run', '-s', 'loopwright', '--', ...args], { cwd: ROOT, encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

describe('loopwright CLI', () => {
  it('design SPEC prints JSON only, the same analysis as analyzeDesign (DESIGN.md: the server\'s library)', () => {
    const r = cli('design', specPath);
    expect(r.status).toBe(0);
    const out = JSON.parse(r.stdout); // throws if anything but JSON is on stdout
    const lib = JSON.parse(JSON.stringify(analyzeDesign(mainsSyncSpec)));
    expect(out.margins).toEqual(lib.margins);
    expect(out.noiseBandwidth).toEqual(lib.noiseBandwidth);
    expect(out.nco.tuning.tuningWordDecimal).toBe(ncoTuning(50, 10e3, 32).tuningWordDecimal);
    expect(r.stdout).not.toMatch(/NaN|Infinity/);
  }, 60_000);

  it('simulate SPEC SCENARIO prints the metrics JSON', () => {
    const r = cli('simulate', specPath, scenarioPath);
    expect(r.status).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.float.locked).toBe(true);
    expect(out.bitTrue.locked).toBe(true);
  }, 60_000);

  it('simulate --vectors 5: the README columns, and the first samples as worked by hand', () => {
    const r = cli('simulate', specPath, scenarioPath, '--vectors', '5');
    expect(r.status).toBe(0);
    const lines = r.stdout.trim().split('\n');
    expect(lines[0]).toBe('sample,input_code,nco_phase,table_address,nco_code,detector_code,filter_code');
    expect(lines).toHaveLength(6);
    const rows = lines.slice(1).map((l) => l.split(',').map(Number));
    // M = round(50·2^32/10^4) = round(21474836.48) = 21474836 (TRG71, by hand)
    const m = 21474836;
    expect(rows[0]![2]).toBe(0);
    expect(rows[1]![2]! - rows[0]![2]!).toBe(m + 0); // y[0] = 0 ⇒ Δ = 0: one sample of delay
    // input x[1] = round(sin(2π·50/10^4)·2^15) = round(1029.27) = 1029; address = top 12 bits + 1024
    expect(rows[1]![1]).toBe(1029);
    expect(rows[0]![3]).toBe(1024);
    expect(rows[0]![4]).toBe(32767); // cos 0 at full scale 2^15 − 1
    // detector u = round_15(x·c): 1029·32752/2^15 = 1028.497 → 1028 (nearest)
    expect(rows[1]![5]).toBe(Math.round((rows[1]![1]! * rows[1]![4]!) / 2 ** 15));
  }, 60_000);

  it('render SPEC OUTDIR writes the artifacts whose SHA-256 match the manifest; stdout is JSON', () => {
    const out = path.join(dir, 'out');
    const r = cli('render', specPath, out);
    expect(r.status).toBe(0);
    const summary = JSON.parse(r.stdout);
    const manifest = JSON.parse(readFileSync(path.join(out, 'manifest.json'), 'utf8'));
    expect(manifest.files.length).toBeGreaterThanOrEqual(5);
    for (const f of manifest.files as { name: string; sha256: string }[]) {
      const sha = createHash('sha256').update(readFileSync(path.join(out, f.name))).digest('hex');
      expect(sha, f.name).toBe(f.sha256);
    }
    const m = createHash('sha256').update(readFileSync(path.join(out, 'manifest.json'))).digest('hex');
    expect(summary.manifestSha256).toBe(m);
  }, 60_000);

  it('a bad spec exits non-zero with nothing on stdout and the field on stderr', () => {
    const bad = path.join(dir, 'bad.json');
    writeFileSync(bad, JSON.stringify({ ...mainsSyncSpec, nco: { ...mainsSyncSpec.nco, accumulatorBits: 65 } }));
    const r = cli('design', bad);
    expect(r.status).not.toBe(0);
    expect(r.stdout).toBe('');
    expect(r.stderr).toContain('nco.accumulatorBits');
  }, 60_000);
});
