/**
 * Runs the release's self-checking testbenches under whichever simulators are installed: GHDL
 * (`ghdl -a/-e/-r --std=08`) and Icarus Verilog (`iverilog -g2005`, `vvp`). Each is a child process
 * with a timeout, working in a temporary folder of its own (the release folder is only read), so
 * several verifications can run at once. A simulator that is not installed is "not run", never "passed".
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { RtlVerdict, RtlVerification, Simulator, SimulatorRun } from '@loopwright/contract';
import { runProcess, toolVersion, type ProcessResult } from './processes.ts';
import { rtlFolder, type RtlFolder } from './releaseFolder.ts';
import { replayWording } from '../render/rtl.ts';

export interface VerifyOptions {
  /** Samples to replay (default: the testbenches' own, the first RTL_REPLAY_SAMPLES of the golden vectors). */
  readonly samples?: number;
  /** Clocks between sample strobes (default: the testbench's, the architecture's cycles per sample). */
  readonly strobePeriod?: number;
  /** Per simulator, compile and run together (default 120 s). */
  readonly timeoutMs?: number;
  readonly simulators?: readonly Simulator[];
  /** Environment of the simulators (PATH decides which are found). */
  readonly env?: NodeJS.ProcessEnv;
}

const LABELS: Readonly<Record<Simulator, string>> = { ghdl: 'GHDL', icarus: 'Icarus' };
const VERSION_PROBES: Readonly<Record<Simulator, [string, string]>> = { ghdl: ['ghdl', '--version'], icarus: ['iverilog', '-V'] };
const DEFAULT_TIMEOUT_MS = 120_000;

interface Step {
  readonly command: string;
  readonly args: readonly string[];
}

function ghdlSteps(f: RtlFolder, work: string, o: VerifyOptions): Step[] {
  const std = ['--std=08', `--workdir=${work}`];
  const generics = [...(o.samples !== undefined ? [`-gSAMPLES=${o.samples}`] : []), ...(o.strobePeriod !== undefined ? [`-gSTROBE_PERIOD=${o.strobePeriod}`] : [])];
  return [
    { command: 'ghdl', args: ['-a', ...std, ...f.vhdlFiles, f.vhdlTestbench] },
    { command: 'ghdl', args: ['-e', ...std, f.testbenchEntity] },
    // Signals start undefined before the first clock; numeric_std's warnings about that are noise.
    { command: 'ghdl', args: ['-r', ...std, f.testbenchEntity, ...generics, '--ieee-asserts=disable-at-0'] },
  ];
}

function icarusSteps(f: RtlFolder, work: string, o: VerifyOptions): Step[] {
  const tb = f.testbenchEntity;
  const params = [...(o.samples !== undefined ? [`-P${tb}.SAMPLES=${o.samples}`] : []), ...(o.strobePeriod !== undefined ? [`-P${tb}.STROBE_PERIOD=${o.strobePeriod}`] : [])];
  const vvp = join(work, `${tb}.vvp`);
  return [
    { command: 'iverilog', args: ['-g2005', '-Wall', '-o', vvp, ...params, ...f.verilogFiles, f.verilogTestbench] },
    { command: 'vvp', args: ['-n', vvp] },
  ];
}

const VERDICT_LINE = /^(PASS|FAIL) .*$/gm;
const PASS = /^PASS (\d+) samples$/;
const FAIL = /^FAIL sample (\d+) signal (\S+) expected (\S+) got (\S+)$/;

/** The testbench's verdict from the run step's output: its last PASS or FAIL line. */
export function parseVerdictLine(output: string): { line: string; pass: number | null; fail: { sampleIndex: number; column: string; expected: string; got: string } | null } | null {
  const lines = output.match(VERDICT_LINE);
  const line = lines?.[lines.length - 1];
  if (!line) return null;
  const p = PASS.exec(line);
  const f = FAIL.exec(line);
  return {
    line,
    pass: p ? Number(p[1]) : null,
    fail: f ? { sampleIndex: Number(f[1]), column: f[2]!, expected: f[3]!, got: f[4]! } : null,
  };
}

function lastLines(r: ProcessResult, n = 12): string {
  return `${r.stdout}${r.stderr}`.trim().split('\n').slice(-n).join('\n');
}

async function runSimulator(sim: Simulator, f: RtlFolder, o: VerifyOptions): Promise<SimulatorRun> {
  const label = LABELS[sim];
  const [probe, flag] = VERSION_PROBES[sim];
  const version = await toolVersion(probe, flag, o.env);
  const base = { simulator: sim, label, version, samples: null, mismatch: null };
  if (version === null) return { ...base, verdict: 'not-run', durationMs: 0, detail: `${probe} is not installed` };
  const work = mkdtempSync(join(tmpdir(), `lw-verify-${sim}-`));
  const deadline = Date.now() + (o.timeoutMs ?? DEFAULT_TIMEOUT_MS);
  let durationMs = 0;
  try {
    const steps = sim === 'ghdl' ? ghdlSteps(f, work, o) : icarusSteps(f, work, o);
    for (const [i, step] of steps.entries()) {
      const r = await runProcess(step.command, step.args, { cwd: f.dir, timeoutMs: Math.max(1, deadline - Date.now()), ...(o.env ? { env: o.env } : {}) });
      durationMs += r.durationMs;
      if (r.missing) return { ...base, verdict: 'not-run', durationMs, detail: `${step.command} is not installed` };
      if (r.timedOut) return { ...base, verdict: 'error', durationMs, detail: `${step.command} did not finish within ${o.timeoutMs ?? DEFAULT_TIMEOUT_MS} ms` };
      if (i < steps.length - 1) {
        if (r.code !== 0) return { ...base, verdict: 'error', durationMs, detail: `${step.command} ${step.args[0]} failed (exit ${r.code}):\n${lastLines(r)}` };
        continue;
      }
      const verdict = parseVerdictLine(r.stdout + r.stderr);
      if (verdict?.pass !== null && verdict?.pass !== undefined && r.code === 0) return { ...base, verdict: 'pass', samples: verdict.pass, durationMs, detail: verdict.line };
      if (verdict?.fail && r.code !== 0) return { ...base, verdict: 'fail', mismatch: verdict.fail, durationMs, detail: verdict.line };
      return { ...base, verdict: 'error', durationMs, detail: `no verdict line (exit ${r.code}):\n${lastLines(r)}` };
    }
    throw new Error('unreachable: a simulator has at least one step');
  } finally {
    rmSync(work, { recursive: true, force: true });
  }
}

export function overallVerdict(runs: readonly SimulatorRun[]): RtlVerdict {
  if (runs.some((r) => r.verdict === 'fail' || r.verdict === 'error')) return 'failed';
  const passed = runs.filter((r) => r.verdict === 'pass').length;
  if (passed === 0) return 'not-run';
  return passed === runs.length ? 'passed' : 'partial';
}

/**
 * The one sentence every screen and e-mail shows for a verification: which simulators agreed bit for
 * bit, and on how many of the release's golden samples (a prefix, said as one).
 */
export function verificationSummary(runs: readonly SimulatorRun[], samples: number, recordSamples: number): string {
  const names = (rs: readonly SimulatorRun[]) => rs.map((r) => r.label).join(' and ');
  const passed = runs.filter((r) => r.verdict === 'pass');
  const notRun = runs.filter((r) => r.verdict === 'not-run');
  const failed = runs.filter((r) => r.verdict === 'fail' || r.verdict === 'error');
  if (failed.length > 0) {
    return `reference RTL FAILED: ${failed
      .map((r) => (r.mismatch ? `${r.label} at sample ${r.mismatch.sampleIndex}, ${r.mismatch.column} expected ${r.mismatch.expected} got ${r.mismatch.got}` : `${r.label} gave no verdict (${r.detail.split('\n')[0]})`))
      .join('; ')}`;
  }
  if (passed.length === 0) return `reference RTL not verified: ${names(notRun)} not run (not installed)`;
  const sampleCount = passed[0]?.samples ?? samples;
  const base = `reference RTL bit-exact in ${names(passed)} on ${replayWording(sampleCount, recordSamples)}`;
  return notRun.length > 0 ? `${base}; ${names(notRun)} not run (not installed)` : base;
}

/** Run the testbenches of the rendered release in `dir` (both simulators at once). */
export async function verifyFolder(dir: string, options: VerifyOptions = {}): Promise<RtlVerification> {
  const folder = rtlFolder(dir);
  const sims = options.simulators ?? ['ghdl', 'icarus'];
  const runs = await Promise.all(sims.map((s) => runSimulator(s, folder, options)));
  const samples = Math.min(options.samples ?? folder.replaySamples, folder.samples);
  return { verdict: overallVerdict(runs), samples, recordSamples: folder.samples, runs, summary: verificationSummary(runs, samples, folder.samples) };
}
