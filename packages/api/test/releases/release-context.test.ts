/**
 * What a release page and a review page show beside a release. A withdrawn release says why: the
 * reason the designer gave is kept in the audit trail (the release's content never changes) and the
 * release record reads it back; a withdrawal without a reason says so. A review link's view carries
 * the previous release's label and stored spec, so the page can overlay both releases' plots.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { ReleaseRecord } from '@loopwright/contract';
import { csrf } from '../helpers.ts';
import { createHash } from 'node:crypto';
import request from 'supertest';
import { designFromTemplate, linkToken, startHandoff, type Handoff } from './handoff.ts';

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

describe('the review page of a later release', () => {
  it('gets the previous release with its stored spec', async () => {
    const v1 = (await h.designer.post(`/api/designs/${designId}/releases`).set(csrf).expect(201)).body as ReleaseRecord;
    const design = (await h.designer.get(`/api/designs/${designId}`).expect(200)).body as { revision: number; spec: { filter: object } };
    const spec = { ...design.spec, filter: { kind: 'single-pole', cutoffHz: 1800 } };
    await h.designer.put(`/api/designs/${designId}`).set(csrf).send({ baseRevision: design.revision, spec }).expect(200);
    const v2 = (await h.designer.post(`/api/designs/${designId}/releases`).set(csrf).expect(201)).body as ReleaseRecord;
    const before = h.smtp.mails.length;
    await h.designer.post(`/api/releases/${v2.id}/reviews`).set(csrf).send({ reviewerIds: [h.org.ids.reviewer], approvalsRequired: 1 }).expect(200);
    const mail = (await h.smtp.waitFor(before + 1)).slice(before)[0]!;
    const view = await request(h.built.app).get(`/api/review-links/${linkToken(mail.text)}`).expect(200);
    expect(view.body.previous).toEqual({ id: v1.id, label: v1.label, spec: v1.spec });
    expect(view.body.release.spec).toEqual(spec);
  });
});

describe('a file read through a review link', () => {
  it('is the stored file, logged as the reviewer’s download, and leaves the link unused', async () => {
    const id = await designFromTemplate(h.designer, 'if-fm-demod');
    const v1 = (await h.designer.post(`/api/designs/${id}/releases`).set(csrf).expect(201)).body as ReleaseRecord;
    const before = h.smtp.mails.length;
    await h.designer.post(`/api/releases/${v1.id}/reviews`).set(csrf).send({ reviewerIds: [h.org.ids.reviewer], approvalsRequired: 1 }).expect(200);
    const token = linkToken((await h.smtp.waitFor(before + 1)).slice(before)[0]!.text);
    const header = v1.files.find((f) => f.name.endsWith('.h'))!;
    const res = await request(h.built.app).get(`/api/review-links/${token}/files/${header.name}`).expect(200);
    expect(res.headers['x-content-sha256']).toBe(header.sha256);
    expect(createHash('sha256').update(res.text).digest('hex')).toBe(header.sha256);
    const log = (await h.designer.get(`/api/releases/${v1.id}/downloads`).expect(200)).body as { downloads: { userId: number; fileName: string }[] };
    expect(log.downloads).toEqual([expect.objectContaining({ userId: h.org.ids.reviewer, fileName: header.name })]);
    await request(h.built.app).get(`/api/review-links/${token}/files/no_such_file.txt`).expect(404);
    await request(h.built.app).get(`/api/review-links/${token.slice(0, -2)}xx/files/${header.name}`).expect(403);
    // Still unused: it decides once.
    await request(h.built.app).post(`/api/review-links/${token}`).send({ decision: 'request-changes', comment: 'read the header', manifestSha256: v1.manifestSha256 }).expect(200);
  });
});
