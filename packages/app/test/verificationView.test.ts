/** The verification panel's rows: the server's sentence, a row per simulator, the estimate per part (common practice, no source). */
import { describe, expect, it } from 'vitest';
import type { ReleaseVerificationRecord } from '../src/api/types.ts';
import { estimateView, simulatorRows, verificationSummary } from '../src/components/verificationView.ts';

const base: ReleaseVerificationRecord = {
  state: 'running', progress: 'running the testbenches in GHDL and Icarus', verdict: null, summary: 'reference RTL verification running: running the testbenches in GHDL and Icarus',
  verification: null, estimate: null, attempts: 1, startedAt: null, finishedAt: null, approvable: false, blockedReason: 'the reference RTL verification has not finished',
};

describe('verification view', () => {
  it('keeps asking while the server runs, with the server sentence', () => {
    expect(verificationSummary(base)).toEqual({ tone: 'pending', text: base.summary, pending: true });
    expect(estimateView(null, true)).toEqual({ state: 'pending', text: 'estimating with yosys…' });
  });

  it('tells pass, fail and "not run" apart, and lists the simulators', () => {
    const runs = [
      { simulator: 'ghdl' as const, label: 'GHDL', version: 'GHDL 2.0.0', verdict: 'pass' as const, samples: 4096, mismatch: null, durationMs: 2150, detail: 'PASS 4096 samples' },
      { simulator: 'icarus' as const, label: 'Icarus', version: null, verdict: 'not-run' as const, samples: null, mismatch: null, durationMs: 0, detail: 'iverilog is not installed' },
    ];
    const partial: ReleaseVerificationRecord = { ...base, state: 'done', verdict: 'partial', summary: 'reference RTL bit-exact in GHDL on 4096 samples; Icarus not run (not installed)', verification: { verdict: 'partial', samples: 4096, runs, summary: '' }, approvable: true, blockedReason: null };
    expect(verificationSummary(partial).tone).toBe('warn');
    expect(verificationSummary({ ...partial, verdict: 'failed' }).tone).toBe('fail');
    expect(verificationSummary({ ...partial, verdict: 'passed' }).tone).toBe('pass');
    expect(simulatorRows(partial)).toEqual([
      { simulator: 'GHDL', version: 'GHDL 2.0.0', verdict: 'PASS', tone: 'success', samples: '4,096', duration: '2.1 s', detail: 'PASS 4096 samples' },
      { simulator: 'Icarus', version: 'not installed', verdict: 'not run', tone: 'info', samples: '—', duration: '—', detail: 'iverilog is not installed' },
    ]);
  });

  it('shows a replay of a prefix as "replayed of record" (a record made before recordSamples shows the count alone)', () => {
    const run = { simulator: 'ghdl' as const, label: 'GHDL', version: 'GHDL 2.0.0', verdict: 'pass' as const, samples: 4096, mismatch: null, durationMs: 2150, detail: 'PASS 4096 samples' };
    const prefix: ReleaseVerificationRecord = { ...base, state: 'done', verdict: 'passed', verification: { verdict: 'passed', samples: 4096, recordSamples: 65536, runs: [run], summary: '' }, approvable: true, blockedReason: null };
    expect(simulatorRows(prefix).map((r) => r.samples)).toEqual(['4,096 of 65,536']);
    const whole: ReleaseVerificationRecord = { ...prefix, verification: { verdict: 'passed', samples: 4096, recordSamples: 4096, runs: [run], summary: '' } };
    expect(simulatorRows(whole).map((r) => r.samples)).toEqual(['4,096']);
  });

  it('shows the estimate per part and in total, or why there is none', () => {
    const g = { luts: 10, flipFlops: 5, multipliers: 1, romBits: 0 };
    const i = { luts: 3, flipFlops: 5, carries: 1, dspBlocks: 1, ramBlocks: 0 };
    const v = estimateView({ state: 'estimated', tool: 'Yosys 0.23', label: 'Estimate for a generic small FPGA', parts: [{ part: 'detector', instance: 'u_detector', generic: g, ice40: i }], total: { generic: g, ice40: i }, durationMs: 1 }, false);
    expect(v.state === 'estimated' && v.rows.map((r) => r.part)).toEqual(['detector', 'whole loop']);
    expect(estimateView({ state: 'not-estimated', reason: 'yosys is not installed' }, false)).toEqual({ state: 'not-estimated', text: 'not estimated: yosys is not installed' });
  });
});
