/**
 * Helpers of the reference-RTL tests: render a spec's release into a folder of its own, lint the
 * Verilog with Verilator, tamper with a rendered file, and run work with bounded parallelism (the
 * machine has two cores shared with other work).
 */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { LoopSpec } from '@loopwright/dsp';
import { artifactNames, type Manifest } from '../../src/render/artifacts.ts';
import { renderRelease } from '../render/release.ts';
import { bitPattern } from '../../src/render/literals.ts';
import { runProcess } from '../../src/rtl/processes.ts';
import { rtlFolder } from '../../src/rtl/releaseFolder.ts';

export function renderToFolder(spec: LoopSpec): { dir: string; manifest: Manifest } {
  const rendered = renderRelease(spec);
  const dir = mkdtempSync(join(tmpdir(), 'lw-rtl-'));
  for (const f of rendered.files) writeFileSync(join(dir, f.name), f.bytes);
  return { dir, manifest: rendered.manifest };
}

/** Verilator's -Wall lint of the RTL modules (the testbench uses simulation-only system tasks). */
export async function lintVerilog(dir: string): Promise<string> {
  const f = rtlFolder(dir);
  const r = await runProcess('verilator', ['--lint-only', '-Wall', '--top-module', f.loopEntity, ...f.verilogFiles], { cwd: dir, timeoutMs: 120_000 });
  if (r.missing) return 'verilator is not installed';
  return `${r.stdout}${r.stderr}`.trim() + (r.code === 0 ? '' : `\n(exit ${r.code})`);
}

/** Replace one exact piece of a rendered file; fails loudly when the piece is not there. */
export function tamper(dir: string, file: string, from: string | RegExp, to: string): void {
  const path = join(dir, file);
  const text = readFileSync(path, 'utf8');
  const changed = text.replace(from, to);
  if (changed === text) throw new Error(`${file}: nothing matched ${String(from)}`);
  writeFileSync(path, changed);
}

/** The constant's code with one bit of its two's-complement pattern flipped (bit 0 = LSB). */
function flippedPattern(manifest: Manifest, constant: string, bit: number): { width: number; pattern: string; signed: boolean } {
  const c = manifest.constants.find((x) => x.name === constant);
  if (!c) throw new Error(`manifest has no constant ${constant}`);
  const p = bitPattern(BigInt(c.code), c.signedness, c.widthBits).split('');
  const i = c.widthBits - 1 - bit;
  p[i] = p[i] === '0' ? '1' : '0';
  return { width: c.widthBits, pattern: p.join(''), signed: c.signedness === 'signed' };
}

/** Flip one bit of a constant in both the VHDL package and the Verilog include the RTL reads. */
export function flipConstantBit(dir: string, manifest: Manifest, constant: string, bit: number): void {
  const names = artifactNames(manifest.design);
  const f = flippedPattern(manifest, constant, bit);
  tamper(dir, names.vhdl, new RegExp(`(${constant} : (?:un)?signed\\(${f.width - 1} downto 0\\) := )"[01]+"`), `$1"${f.pattern}"`);
  // A sized binary literal of the pattern, valid for every width and sign.
  tamper(dir, names.verilog, new RegExp(`(localparam (?:signed )?\\[${f.width - 1}:0\\] ${constant} = )[^;]+;`), `$1${f.width}'${f.signed ? 's' : ''}b${f.pattern};`);
}

/** Runs `jobs` with at most `limit` at once; resolves each in its own promise. */
export function bounded<T>(limit: number, jobs: readonly (() => Promise<T>)[]): Promise<T>[] {
  let running = 0;
  const waiting: (() => void)[] = [];
  const slot = async <R>(job: () => Promise<R>): Promise<R> => {
    if (running >= limit) await new Promise<void>((resolve) => waiting.push(resolve));
    running++;
    try {
      return await job();
    } finally {
      running--;
      waiting.shift()?.();
    }
  };
  return jobs.map((j) => slot(j));
}
