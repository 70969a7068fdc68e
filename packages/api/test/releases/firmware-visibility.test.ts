/**
 * An account that is firmware only sees what approved releases contain, in every route: the design
 * as its latest approved release holds it (never the spec being edited or in review), nothing of a
 * design without an approved release, and no release that is not approved.
 */
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { csrf, signedInAgent, type Agent } from '../helpers.ts';
import { linkToken, startHandoff, type Handoff } from './handoff.ts';

let h: Handoff;
let firmware: Agent;
let projectId: number;
/** A design with v1 approved, then edited, and v2 (the edit) in review. */
let designId: number;
let approved: { id: number; spec: { centerHz: number; filter: unknown }; designRevision: number };
let inReviewId: number;
/** A design with only a draft release. */
let unreleasedId: number;

async function approve(releaseId: number): Promise<void> {
  await h.built.services.handoff.verification.runOnce(releaseId);
  const before = h.smtp.mails.length;
  await h.designer.post(`/api/releases/${releaseId}/reviews`).set(csrf).send({ reviewerIds: [h.org.ids.reviewer], approvalsRequired: 1 }).expect(200);
  const mail = (await h.smtp.waitFor(before + 1)).slice(before).find((m) => m.to.includes(h.org.emails.reviewer))!;
  const release = await h.designer.get(`/api/releases/${releaseId}`).expect(200);
  await request(h.built.app).post(`/api/review-links/${linkToken(mail.text)}`).send({ decision: 'approve', manifestSha256: release.body.manifestSha256 }).expect(200);
}

beforeAll(async () => {
  h = await startHandoff();
  firmware = await signedInAgent(h.built.app, h.org.emails.firmware);
  projectId = (await h.designer.post('/api/projects').set(csrf).send({ name: 'Firmware visibility' }).expect(201)).body.id;
  const design = await h.designer.post(`/api/projects/${projectId}/designs`).set(csrf).send({ name: 'Released design', templateId: 'mains-sync' }).expect(201);
  designId = design.body.id;
  const v1 = await h.designer.post(`/api/designs/${designId}/releases`).set(csrf).expect(201);
  await approve(v1.body.id);
  approved = (await h.designer.get(`/api/releases/${v1.body.id}`).expect(200)).body;
  const edited = { ...design.body.spec, centerHz: 51 };
  await h.designer.put(`/api/designs/${designId}`).set(csrf).send({ baseRevision: design.body.revision, spec: edited }).expect(200);
  const v2 = await h.designer.post(`/api/designs/${designId}/releases`).set(csrf).expect(201);
  inReviewId = v2.body.id;
  await h.designer.post(`/api/releases/${inReviewId}/reviews`).set(csrf).send({ reviewerIds: [h.org.ids.reviewer], approvalsRequired: 1 }).expect(200);
  unreleasedId = (await h.designer.post(`/api/projects/${projectId}/designs`).set(csrf).send({ name: 'Draft only', templateId: 'mains-sync' }).expect(201)).body.id;
  await h.designer.post(`/api/designs/${unreleasedId}/releases`).set(csrf).expect(201);
});

afterAll(async () => {
  await h.close();
});

describe('a firmware-only account', () => {
  it('reads a design as its latest approved release holds it, not the spec in review', async () => {
    const res = await firmware.get(`/api/designs/${designId}`).expect(200);
    expect(res.body.spec).toEqual(approved.spec);
    expect(res.body.spec.centerHz).toBe(50);
    expect(res.body.revision).toBe(approved.designRevision);
    const file = await firmware.get(`/api/designs/${designId}/spec.json`).expect(200);
    expect(JSON.parse(file.text)).toEqual(approved.spec);
    // The designer sees the design as it is now.
    expect((await h.designer.get(`/api/designs/${designId}`).expect(200)).body.spec.centerHz).toBe(51);
  });

  it('finds nothing of a design without an approved release', async () => {
    await firmware.get(`/api/designs/${unreleasedId}`).expect(404);
    await firmware.get(`/api/designs/${unreleasedId}/spec.json`).expect(404);
    await firmware.get(`/api/designs/${unreleasedId}/releases`).expect(404);
    const list = await firmware.get(`/api/projects/${projectId}/designs`).expect(200);
    expect(list.body.designs.map((d: { id: number }) => d.id)).toEqual([designId]);
    expect(list.body.designs[0].revision).toBe(approved.designRevision);
  });

  it('counts only the designs it can see in a project', async () => {
    expect((await firmware.get(`/api/projects/${projectId}`).expect(200)).body.designCount).toBe(1);
    const listed = (await firmware.get('/api/projects').expect(200)).body.projects.find((p: { id: number }) => p.id === projectId);
    expect(listed.designCount).toBe(1);
    expect((await h.designer.get(`/api/projects/${projectId}`).expect(200)).body.designCount).toBe(2);
  });

  it('gets 404 for the release in review on every release route', async () => {
    for (const path of ['', '/files/manifest.json', '/bundle', '/reviews', '/conformance', `/diff?against=${approved.id}`]) {
      await firmware.get(`/api/releases/${inReviewId}${path}`).expect(404);
    }
    await firmware.post(`/api/releases/${inReviewId}/conformance`).set(csrf).attach('file', Buffer.from('sample\n'), 'x.csv').expect(404);
    const list = await firmware.get(`/api/designs/${designId}/releases`).expect(200);
    expect(list.body.releases.map((r: { id: number }) => r.id)).toEqual([approved.id]);
  });

  it('cannot run the analysis or a simulation of a design', async () => {
    await firmware.post(`/api/designs/${designId}/analysis`).set(csrf).expect(403);
    await firmware.post(`/api/designs/${designId}/simulations`).set(csrf).send({ scenario: { kind: 'tone', offsetHz: 1, durationS: 0.1 } }).expect(403);
    await firmware.post('/api/analysis').set(csrf).send({ spec: approved.spec }).expect(403);
  });
});

describe('an account with firmware and another role', () => {
  it('sees the design as it is now', async () => {
    const admin = await signedInAgent(h.built.app, h.org.emails.admin);
    await admin.patch(`/api/users/${h.org.ids.firmware}`).set(csrf).send({ roles: ['firmware', 'reviewer'] }).expect(200);
    const both = await signedInAgent(h.built.app, h.org.emails.firmware);
    expect((await both.get(`/api/designs/${designId}`).expect(200)).body.spec.centerHz).toBe(51);
    await both.get(`/api/releases/${inReviewId}`).expect(200);
    await admin.patch(`/api/users/${h.org.ids.firmware}`).set(csrf).send({ roles: ['firmware'] }).expect(200);
  });
});
