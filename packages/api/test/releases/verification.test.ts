/**
 * The server verifies each release's reference RTL after the cut, off the request thread: a queued
 * job that one process claims (SELECT … FOR UPDATE SKIP LOCKED), the real GHDL, Icarus and yosys as
 * child processes, a record beside the immutable files, its sentence in the review e-mail, and a
 * failed verification blocking approval until the designer withdraws and cuts again. The outside
 * judges are the simulators and yosys; a stand-in `ghdl` that reports a FAIL line plays a simulator
 * that found a mismatch (the release files cannot be changed to make the real ones fail).
 */
import { chmodSync, mkdtempSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { referenceRtlTiming } from '@loopwright/dsp';
import type { ReleaseRecord, ReleaseVerificationRecord } from '@loopwright/contract';
import { EstimateCache } from '../../src/releases/estimateCache.ts';
import { MAX_ATTEMPTS, VerificationService } from '../../src/releases/verificationService.ts';
import { csrf } from '../helpers.ts';
import { designFromTemplate, linkToken, startHandoff, type Handoff } from './handoff.ts';

let h: Handoff;
let designId: number;
const fakeTools = mkdtempSync(join(tmpdir(), 'lw-fake-ghdl-'));

beforeAll(async () => {
  // This file verifies with the machine's own simulators and yosys.
  process.env.LW_VERIFY_PATH = process.env.PATH ?? '';
  h = await startHandoff();
  designId = await designFromTemplate(h.designer);
  // A `ghdl` whose testbench run reports a mismatch; Icarus stays the real one.
  writeFileSync(
    join(fakeTools, 'ghdl'),
    '#!/bin/sh\ncase "$1" in\n  --version) echo "GHDL stand-in 0.0";;\n  -r) echo "FAIL sample 17 signal filter_code expected 5 got 6"; exit 1;;\nesac\nexit 0\n',
  );
  chmodSync(join(fakeTools, 'ghdl'), 0o755);
  for (const tool of ['iverilog', 'vvp', 'yosys']) symlinkSync(`/usr/bin/${tool}`, join(fakeTools, tool));
}, 120_000);

afterAll(async () => {
  await h.close();
  rmSync(fakeTools, { recursive: true, force: true });
});

const service = () => h.built.services.handoff.verification;
function otherProcess(env?: NodeJS.ProcessEnv): VerificationService {
  const settings = { intervalMs: 0, leaseS: 900, simulatorTimeoutMs: 300_000, ...(env ? { env } : {}) };
  return new VerificationService(h.dataSource, h.built.services.handoff.files, new EstimateCache(h.dataSource, env ? { env } : {}), settings);
}
const cut = async (): Promise<ReleaseRecord> => (await h.designer.post(`/api/designs/${designId}/releases`).set(csrf).expect(201)).body as ReleaseRecord;
const verificationOf = async (id: number): Promise<ReleaseVerificationRecord> => (await h.designer.get(`/api/releases/${id}/verification`).expect(200)).body as ReleaseVerificationRecord;

describe('release verification', () => {
  let v1: ReleaseRecord;

  it('is queued at the cut and shows its progress while it runs', async () => {
    v1 = await cut();
    expect(v1.verification).toMatchObject({ state: 'queued', verdict: null, approvable: false, blockedReason: 'the reference RTL verification has not finished' });
    const job = await service().claim(v1.id);
    expect(job?.releaseId).toBe(v1.id);
    expect(await verificationOf(v1.id)).toMatchObject({ state: 'running', progress: 'starting', summary: 'reference RTL verification running: starting', attempts: 1 });
    await service().runClaimed(job!);
  }, 300_000);

  it('records both simulators bit-exact on the stated prefix of the golden vectors, with tool versions and durations', async () => {
    const v = await verificationOf(v1.id);
    expect(v.state).toBe('done');
    expect(v.verdict).toBe('passed');
    // The testbenches replay the first RTL_REPLAY_SAMPLES (4096) of the 65 536-sample record, and say so.
    expect(v.summary).toBe('reference RTL bit-exact in GHDL and Icarus on the first 4,096 of the 65,536 golden samples');
    expect(v.approvable).toBe(true);
    expect([v.verification?.samples, v.verification?.recordSamples]).toEqual([4096, 65536]);
    expect(v.verification?.runs.map((r) => [r.simulator, r.verdict, r.samples])).toEqual([['ghdl', 'pass', 4096], ['icarus', 'pass', 4096]]);
    expect(v.verification?.runs[0]?.version).toMatch(/^GHDL \d/);
    expect(v.verification?.runs[1]?.version).toMatch(/^Icarus Verilog version \d/);
    for (const r of v.verification?.runs ?? []) expect(r.durationMs).toBeGreaterThan(0);
    expect(v.finishedAt).not.toBeNull();
  });

  it('records the yosys estimate per part: one multiplier per section plus two, the 2^12 x 16 sine ROM', async () => {
    const e = (await verificationOf(v1.id)).estimate;
    if (e?.state !== 'estimated') throw new Error(`not estimated: ${JSON.stringify(e)}`);
    expect(e.tool).toMatch(/^Yosys /);
    expect(e.parts.map((p) => p.part)).toEqual(['detector', 'nco', 'section 0', 'section 1', 'top']);
    expect(e.total.generic.multipliers).toBe(referenceRtlTiming(2).multipliers);
    for (const p of e.parts.filter((x) => x.part !== 'top')) expect(p.generic.multipliers, p.part).toBe(1);
    expect(e.parts.find((p) => p.part === 'nco')?.generic.romBits).toBe(4096 * 16);
    // The iCE40 holds the table in 4-kbit block RAMs and gives each multiplier at least one DSP block.
    expect(e.total.ice40.ramBlocks * 4096).toBeGreaterThanOrEqual(4096 * 16);
    expect(e.total.ice40.dspBlocks).toBeGreaterThanOrEqual(referenceRtlTiming(2).multipliers);
    // Each section keeps v, x1, x2, y1, y2 (5 x 16 bits) and its 18 + 16 + 2-bit accumulator in flip-flops.
    expect(e.parts.find((p) => p.part === 'section 0')!.generic.flipFlops).toBeGreaterThanOrEqual(5 * 16 + 36);
    const sum = (k: 'luts' | 'flipFlops') => e.parts.reduce((s, p) => s + p.generic[k], 0);
    expect(sum('luts')).toBe(e.total.generic.luts);
    expect(sum('flipFlops')).toBe(e.total.generic.flipFlops);
    expect(e.label).toMatch(/^Estimate for a generic small FPGA/);
  });

  it('leaves the release files and manifest exactly as cut', async () => {
    const now = (await h.designer.get(`/api/releases/${v1.id}`).expect(200)).body as ReleaseRecord;
    expect(now.manifestSha256).toBe(v1.manifestSha256);
    expect(now.files).toEqual(v1.files);
  });

  it('puts the verdict in the review e-mail', async () => {
    const before = h.smtp.mails.length;
    await h.designer.post(`/api/releases/${v1.id}/reviews`).set(csrf).send({ reviewerIds: [h.org.ids.reviewer], approvalsRequired: 1 }).expect(200);
    const mail = (await h.smtp.waitFor(before + 1)).slice(before)[0]!;
    expect(mail.text).toContain('Server verification: reference RTL bit-exact in GHDL and Icarus on the first 4,096 of the 65,536 golden samples.');
    await request(h.built.app).post(`/api/review-links/${linkToken(mail.text)}`).send({ decision: 'approve', manifestSha256: v1.manifestSha256 }).expect(200);
  });
});

describe('a failed verification', () => {
  it('blocks approval until the designer withdraws and cuts again', async () => {
    const bad = await cut();
    expect(await otherProcess({ ...process.env, PATH: fakeTools }).runOnce(bad.id)).toBe(true);
    const v = await verificationOf(bad.id);
    expect(v.verdict).toBe('failed');
    expect(v.verification?.runs.map((r) => r.verdict)).toEqual(['fail', 'pass']);
    expect(v.summary).toBe('reference RTL FAILED: GHDL at sample 17, filter_code expected 5 got 6');
    expect(v.approvable).toBe(false);

    const before = h.smtp.mails.length;
    await h.designer.post(`/api/releases/${bad.id}/reviews`).set(csrf).send({ reviewerIds: [h.org.ids.reviewer], approvalsRequired: 1 }).expect(200);
    const mail = (await h.smtp.waitFor(before + 1)).slice(before)[0]!;
    expect(mail.text).toContain('Server verification: reference RTL FAILED: GHDL at sample 17, filter_code expected 5 got 6.');
    const refused = await request(h.built.app).post(`/api/review-links/${linkToken(mail.text)}`).send({ decision: 'approve', manifestSha256: bad.manifestSha256 }).expect(409);
    expect(refused.body.error.field).toBe('verification');
    expect(refused.body.error.message).toMatch(/^reference RTL FAILED: .*approval is blocked: the designer must withdraw this release and cut a new one$/);
    expect(((await h.designer.get(`/api/releases/${bad.id}`).expect(200)).body as ReleaseRecord).state).toBe('in-review');

    await h.designer.post(`/api/releases/${bad.id}/withdraw`).set(csrf).send({}).expect(200);
    const again = await cut();
    expect(again.number).toBe(bad.number + 1);
    expect(await service().runOnce(again.id)).toBe(true);
    expect((await verificationOf(again.id)).verdict).toBe('passed');
  }, 300_000);
});

describe('the verification job across processes', () => {
  it('is claimed by one process only when two ask at once', async () => {
    const r = await cut();
    const [a, b] = await Promise.all([otherProcess().claim(r.id), otherProcess().claim(r.id)]);
    expect([a, b].filter((j) => j !== null)).toHaveLength(1);
  });

  it('is taken over after its lease when the process holding it stopped, and ends as failed after the last attempt', async () => {
    const r = await cut();
    const stale = () => h.dataSource.query('UPDATE `release_verifications` SET `claimedAt` = NOW(3) - INTERVAL 1 DAY WHERE `releaseId` = ?', [r.id]);
    for (let attempt = 1; attempt <= MAX_ATTEMPTS; attempt++) {
      expect((await otherProcess().claim(r.id))?.releaseId, `attempt ${attempt}`).toBe(r.id);
      expect((await verificationOf(r.id)).attempts).toBe(attempt);
      await stale();
    }
    expect(await otherProcess().claim(r.id)).toBeNull();
    await otherProcess().giveUpStale();
    const v = await verificationOf(r.id);
    expect(v).toMatchObject({ state: 'done', verdict: 'failed', approvable: false });
    expect(v.summary).toBe(`reference RTL verification FAILED: it did not complete in ${MAX_ATTEMPTS} attempts (the process running it stopped each time)`);
  });
});
