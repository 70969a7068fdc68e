/**
 * POST /api/estimates, the word-length search's cost column: a candidate's yosys estimate is queued
 * for a background worker and answered "pending" until a worker (any process, claiming with SKIP
 * LOCKED) has synthesised it, then answered from the cache; a bad candidate is "invalid" naming its
 * field; without yosys it is "not estimated", never a figure. yosys itself is the outside judge.
 */
import { mainsSyncSpec, referenceRtlTiming, type LoopSpec } from '@loopwright/dsp';
import type { EstimateResponse } from '@loopwright/contract';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { csrf, signedInAgent, type Agent } from '../helpers.ts';
import { startHandoff, type Handoff } from './handoff.ts';

let h: Handoff;
let reviewer: Agent;
/** A width no other test file estimates, so the cache starts without it. */
const candidate: LoopSpec = { ...mainsSyncSpec, name: 'cost_probe', fixedPoint: { ...mainsSyncSpec.fixedPoint, coefficientBits: 15 } };

beforeAll(async () => {
  process.env.LW_VERIFY_PATH = process.env.PATH ?? '';
  h = await startHandoff();
  reviewer = await signedInAgent(h.built.app, h.org.emails.reviewer);
}, 120_000);

afterAll(async () => {
  await h.close();
});

const ask = async (specs: unknown[]) => (await reviewer.post('/api/estimates').set(csrf).send({ specs }).expect(200)).body as EstimateResponse;

describe('candidate estimates', () => {
  it('are pending until a worker synthesised them, then come from the cache', async () => {
    const bad = { ...candidate, nco: { ...candidate.nco, phaseBits: 99 } };
    const first = await ask([candidate, bad]);
    expect(first.estimates[0]).toEqual({ state: 'pending' });
    expect(first.estimates[1]).toMatchObject({ state: 'invalid', field: 'nco.phaseBits' });
    expect(await h.built.services.handoff.estimates.runQueued()).toBe(true);
    expect(await h.built.services.handoff.estimates.runQueued()).toBe(false);
    const second = await ask([candidate]);
    const e = second.estimates[0]!;
    if (e.state !== 'estimated') throw new Error(`not estimated: ${JSON.stringify(e)}`);
    expect(e.total.generic.multipliers).toBe(referenceRtlTiming(2).multipliers);
    expect(e.total.generic.romBits).toBe(4096 * 16);
    expect(e.total.generic.luts).toBeGreaterThan(0);
    expect(e.tool).toMatch(/^Yosys /);
    expect(e.label).toMatch(/^Estimate for a generic small FPGA/);
  }, 300_000);

  it('refuses more than 40 candidates at once, naming the field', async () => {
    const res = await reviewer.post('/api/estimates').set(csrf).send({ specs: Array.from({ length: 41 }, () => candidate) }).expect(400);
    expect(res.body.error.field).toBe('specs');
  });
});
