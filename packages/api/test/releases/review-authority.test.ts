/**
 * A review link carries the authority of its holder only while the holder has it: a link whose
 * reviewer was disabled or lost the reviewer role is refused at GET and POST time, and every refusal
 * of a link that names a release is filed under that release's organisation, where its admins read it.
 */
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { csrf, signedInAgent, type Agent } from '../helpers.ts';
import { designFromTemplate, linkToken, startHandoff, type Handoff } from './handoff.ts';

let h: Handoff;
let admin: Agent;
let designId: number;

beforeAll(async () => {
  h = await startHandoff();
  admin = await signedInAgent(h.built.app, h.org.emails.admin);
  designId = await designFromTemplate(h.designer, 'ultrasonic-single-pole');
});

afterAll(async () => {
  await h.close();
});

const anonymous = () => request(h.built.app);

/** A release in review by `reviewerId` alone, with the token from that reviewer's e-mail. */
async function releaseInReview(reviewerId: number, reviewerEmail: string): Promise<{ id: number; manifestSha256: string; token: string }> {
  const cut = await h.designer.post(`/api/designs/${designId}/releases`).set(csrf).expect(201);
  await h.built.services.handoff.verification.runOnce(cut.body.id);
  const before = h.smtp.mails.length;
  await h.designer.post(`/api/releases/${cut.body.id}/reviews`).set(csrf).send({ reviewerIds: [reviewerId], approvalsRequired: 1 }).expect(200);
  const mails = await h.smtp.waitFor(before + 1);
  const mail = mails.slice(before).find((m) => m.to.includes(reviewerEmail));
  return { id: cut.body.id, manifestSha256: cut.body.manifestSha256, token: linkToken(mail!.text) };
}

/** A fresh reviewer account of the org (each test changes one, so they do not share). */
async function newReviewer(tag: string): Promise<{ id: number; email: string }> {
  const email = `reviewer-${tag}-${Date.now()}@example.test`;
  const res = await admin.post('/api/users').set(csrf).send({ email, displayName: `Reviewer ${tag}`, password: 'a-long-enough-password', roles: ['reviewer'] }).expect(201);
  return { id: res.body.id, email };
}

async function refusalsOf(releaseId: number): Promise<{ action: string; objectType: string; objectId: string; detail: { reason: string; attempted: string } }[]> {
  const res = await admin.get('/api/audit').query({ objectType: 'release', objectId: String(releaseId) }).expect(200);
  return res.body.entries.filter((e: { action: string }) => e.action === 'review-link.refused');
}

describe('a review link whose holder lost the authority', () => {
  it('is refused, at GET and at POST, once the reviewer holds only the firmware role', async () => {
    const reviewer = await newReviewer('rerole');
    const r = await releaseInReview(reviewer.id, reviewer.email);
    await admin.patch(`/api/users/${reviewer.id}`).set(csrf).send({ roles: ['firmware'] }).expect(200);

    const read = await anonymous().get(`/api/review-links/${r.token}`).expect(403);
    expect(read.body.error.field).toBe('token');
    expect(read.body.error.message).toMatch(/no longer holds the reviewer role/);
    expect(read.body.release).toBeUndefined();
    const decide = await anonymous().post(`/api/review-links/${r.token}`).send({ decision: 'approve', manifestSha256: r.manifestSha256 }).expect(403);
    expect(decide.body.error.message).toMatch(/no longer holds the reviewer role/);

    const release = await h.designer.get(`/api/releases/${r.id}`).expect(200);
    expect(release.body.state).toBe('in-review');
    expect(release.body.approvals).toBe(0);
    const refusals = await refusalsOf(r.id);
    expect(refusals.map((e) => [e.detail.reason, e.detail.attempted]).sort()).toEqual([
      ['revoked', 'decide'],
      ['revoked', 'read'],
    ]);
  });

  it('is refused once the reviewer account is disabled, and counts as no approval', async () => {
    const reviewer = await newReviewer('disabled');
    const r = await releaseInReview(reviewer.id, reviewer.email);
    await admin.patch(`/api/users/${reviewer.id}`).set(csrf).send({ disabled: true }).expect(200);

    await anonymous().get(`/api/review-links/${r.token}`).expect(403);
    const decide = await anonymous().post(`/api/review-links/${r.token}`).send({ decision: 'approve', manifestSha256: r.manifestSha256 }).expect(403);
    expect(decide.body.error.message).toMatch(/was sent to is disabled/);
    const release = await h.designer.get(`/api/releases/${r.id}`).expect(200);
    expect(release.body.state).toBe('in-review');
    expect(release.body.approvals).toBe(0);
    expect((await refusalsOf(r.id)).map((e) => e.detail.reason)).toEqual(['disabled', 'disabled']);
  });

  it('decides again once the authority is given back (it is checked when the link is used)', async () => {
    const reviewer = await newReviewer('restored');
    const r = await releaseInReview(reviewer.id, reviewer.email);
    await admin.patch(`/api/users/${reviewer.id}`).set(csrf).send({ roles: ['firmware'] }).expect(200);
    await anonymous().post(`/api/review-links/${r.token}`).send({ decision: 'approve', manifestSha256: r.manifestSha256 }).expect(403);
    await admin.patch(`/api/users/${reviewer.id}`).set(csrf).send({ roles: ['firmware', 'reviewer'] }).expect(200);
    const ok = await anonymous().post(`/api/review-links/${r.token}`).send({ decision: 'approve', manifestSha256: r.manifestSha256 }).expect(200);
    expect(ok.body.state).toBe('approved');
  });
});

describe('refused review links in the audit trail', () => {
  it('files a refusal of a known link under the release and its organisation, for its admins', async () => {
    const r = await releaseInReview(h.org.ids.reviewer, h.org.emails.reviewer);
    const [selector, secret] = r.token.split('.') as [string, string];
    const tampered = `${selector}.${secret[0] === 'A' ? 'B' : 'A'}${secret.slice(1)}`;
    await anonymous().post(`/api/review-links/${tampered}`).send({ decision: 'approve', manifestSha256: r.manifestSha256 }).expect(403);
    const [entry] = await refusalsOf(r.id);
    expect(entry).toMatchObject({ objectType: 'release', objectId: String(r.id), detail: { reason: 'tampered', attempted: 'decide' } });
    // Another organisation's admin does not see it.
    const { createTestOrg } = await import('../helpers.ts');
    const other = await createTestOrg(h.dataSource);
    const otherAdmin = await signedInAgent(h.built.app, other.emails.admin);
    const foreign = await otherAdmin.get('/api/audit').query({ objectType: 'release', objectId: String(r.id) }).expect(200);
    expect(foreign.body.entries).toEqual([]);
  });
});
