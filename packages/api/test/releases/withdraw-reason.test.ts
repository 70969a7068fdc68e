/**
 * A withdrawn release says why: the reason the designer gave is kept in the audit trail (the release's
 * content never changes) and the release record reads it back; a withdrawal without a reason says so.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { ReleaseRecord } from '@loopwright/contract';
import { csrf } from '../helpers.ts';
import { designFromTemplate, startHandoff, type Handoff } from './handoff.ts';

let h: Handoff;
let designId: number;

beforeAll(async () => {
  h = await startHandoff();
  designId = await designFromTemplate(h.designer, 'ultrasonic-single-pole');
});

afterAll(async () => {
  await h.close();
});

describe('the withdrawal reason', () => {
  it('is on the withdrawn release, and null before and without one', async () => {
    const v1 = (await h.designer.post(`/api/designs/${designId}/releases`).set(csrf).expect(201)).body as ReleaseRecord;
    expect(v1.withdrawnReason).toBeNull();
    const reason = 'Cut from the wrong revision; superseded by v2.';
    const withdrawn = (await h.designer.post(`/api/releases/${v1.id}/withdraw`).set(csrf).send({ reason }).expect(200)).body as ReleaseRecord;
    expect(withdrawn.state).toBe('withdrawn');
    expect(withdrawn.withdrawnReason).toBe(reason);
    expect(((await h.designer.get(`/api/releases/${v1.id}`).expect(200)).body as ReleaseRecord).withdrawnReason).toBe(reason);

    const v2 = (await h.designer.post(`/api/designs/${designId}/releases`).set(csrf).expect(201)).body as ReleaseRecord;
    const silent = (await h.designer.post(`/api/releases/${v2.id}/withdraw`).set(csrf).send({}).expect(200)).body as ReleaseRecord;
    expect(silent.withdrawnReason).toBeNull();
  });
});
