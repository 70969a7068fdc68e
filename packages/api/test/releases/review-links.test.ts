/**
 * Every refusal of the review flow: replayed, expired, tampered, malformed, unknown and foreign
 * links (each recorded in the audit trail), and review requests the rules do not allow.
 */
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { csrf, signedInAgent } from '../helpers.ts';
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

/** Cuts a release, asks the org's reviewer, returns the release and the token from the e-mail. */
async function releaseInReview(): Promise<{ id: number; manifestSha256: string; token: string }> {
  const cut = await h.designer.post(`/api/designs/${designId}/releases`).set(csrf).expect(201);
  await h.built.services.handoff.verification.runOnce(cut.body.id);
  const before = h.smtp.mails.length;
  await h.designer.post(`/api/releases/${cut.body.id}/reviews`).set(csrf).send({ reviewerIds: [h.org.ids.reviewer], approvalsRequired: 1 }).expect(200);
  const mails = await h.smtp.waitFor(before + 1);
  return { id: cut.body.id, manifestSha256: cut.body.manifestSha256, token: linkToken(mails[mails.length - 1]!.text) };
}

async function refusals(reason: string): Promise<number> {
  const rows = (await h.dataSource.query(
    "SELECT COUNT(*) AS n FROM `audit_entries` WHERE `action` = 'review-link.refused' AND JSON_VALUE(`detailJson`, '$.reason') = ?",
    [reason],
  )) as { n: number | string }[];
  return Number(rows[0]?.n ?? 0);
}

const anonymous = () => request(h.built.app);

describe('review links refuse', () => {
  it('a replayed link, and records it', async () => {
    const r = await releaseInReview();
    await anonymous().post(`/api/review-links/${r.token}`).send({ decision: 'approve', manifestSha256: r.manifestSha256 }).expect(200);
    const before = await refusals('replayed');
    for (const call of [anonymous().post(`/api/review-links/${r.token}`).send({ decision: 'request-changes', manifestSha256: r.manifestSha256 }), anonymous().get(`/api/review-links/${r.token}`)]) {
      const res = await call.expect(403);
      expect(res.body.error.field).toBe('token');
      expect(res.body.error.message).toMatch(/already used/);
    }
    expect(await refusals('replayed')).toBe(before + 2);
    const release = await h.designer.get(`/api/releases/${r.id}`).expect(200);
    expect(release.body.state).toBe('approved');
  });

  it('an expired link', async () => {
    const r = await releaseInReview();
    const selector = r.token.split('.')[0];
    await h.dataSource.query('UPDATE `release_reviews` SET `expiresAt` = CURRENT_TIMESTAMP(3) - INTERVAL 1 SECOND WHERE `selector` = ?', [selector]);
    const before = await refusals('expired');
    const res = await anonymous().post(`/api/review-links/${r.token}`).send({ decision: 'approve', manifestSha256: r.manifestSha256 }).expect(403);
    expect(res.body.error.message).toMatch(/expired/);
    expect(await refusals('expired')).toBe(before + 1);
    expect((await h.designer.get(`/api/releases/${r.id}`).expect(200)).body.state).toBe('in-review');
  });

  it('a tampered secret, a malformed token and an unknown selector', async () => {
    const r = await releaseInReview();
    const [selector, secret] = r.token.split('.') as [string, string];
    const flipped = `${selector}.${secret[0] === 'A' ? 'B' : 'A'}${secret.slice(1)}`;
    const beforeTampered = await refusals('tampered');
    const t = await anonymous().post(`/api/review-links/${flipped}`).send({ decision: 'approve', manifestSha256: r.manifestSha256 }).expect(403);
    expect(t.body.error.message).toMatch(/does not match its record/);
    expect(await refusals('tampered')).toBe(beforeTampered + 1);

    const m = await anonymous().get(`/api/review-links/${r.token.slice(0, -3)}`).expect(403);
    expect(m.body.error.message).toMatch(/not a valid link/);
    const u = await anonymous().get(`/api/review-links/${'Z'.repeat(12)}.${secret}`).expect(403);
    expect(u.body.error.message).toMatch(/does not exist/);
    // The genuine link still works: refusals change nothing.
    await anonymous().post(`/api/review-links/${r.token}`).send({ decision: 'approve', manifestSha256: r.manifestSha256 }).expect(200);
  });

  it('a link whose row was re-pointed to another reviewer (the hash binds the reviewer)', async () => {
    const r = await releaseInReview();
    const selector = r.token.split('.')[0];
    await h.dataSource.query('UPDATE `release_reviews` SET `reviewerId` = ? WHERE `selector` = ?', [h.org.ids.multi, selector]);
    const res = await anonymous().post(`/api/review-links/${r.token}`).send({ decision: 'approve', manifestSha256: r.manifestSha256 }).expect(403);
    expect(res.body.error.message).toMatch(/does not match its record/);
  });

  it('a foreign decision: other release content, or another signed-in person', async () => {
    const r = await releaseInReview();
    const before = await refusals('foreign');
    const wrongContent = await anonymous().post(`/api/review-links/${r.token}`).send({ decision: 'approve', manifestSha256: '0'.repeat(64) }).expect(403);
    expect(wrongContent.body.error.message).toMatch(/other release content/);
    const someoneElse = await signedInAgent(h.built.app, h.org.emails.multi);
    const other = await someoneElse.post(`/api/review-links/${r.token}`).send({ decision: 'approve', manifestSha256: r.manifestSha256 }).expect(403);
    expect(other.body.error.message).toMatch(/another reviewer/);
    expect(await refusals('foreign')).toBe(before + 2);
    // Signed in as the addressed reviewer, the same link decides.
    const reviewer = await signedInAgent(h.built.app, h.org.emails.reviewer);
    await reviewer.post(`/api/review-links/${r.token}`).send({ decision: 'request-changes', comment: 'tighten the ripple filter', manifestSha256: r.manifestSha256 }).expect(200);
    expect((await h.designer.get(`/api/releases/${r.id}`).expect(200)).body.state).toBe('changes-requested');
  });

  it('a decision on a withdrawn release, with 409', async () => {
    const r = await releaseInReview();
    await h.designer.post(`/api/releases/${r.id}/withdraw`).set(csrf).send({ reason: 'superseded' }).expect(200);
    const res = await anonymous().post(`/api/review-links/${r.token}`).send({ decision: 'approve', manifestSha256: r.manifestSha256 }).expect(409);
    expect(res.body.error.message).toMatch(/withdrawn/);
  });
});

describe('the review page', () => {
  it('shows the diff to the previous release of the design', async () => {
    await releaseInReview();
    const second = await releaseInReview();
    const view = await anonymous().get(`/api/review-links/${second.token}`).expect(200);
    expect(view.body.diff.to.id).toBe(second.id);
    // Same spec, so the same constants: a re-cut changes nothing, and every section says so.
    expect(view.body.diff.sections.map((s: { id: string }) => s.id).slice(0, 6)).toEqual(['formats', 'widths', 'codes', 'tables', 'spec', 'margins']);
    expect(view.body.diff.sections.flatMap((s: { rows: unknown[] }) => s.rows)).toEqual([]);
  });
});

describe('deciding in the app', () => {
  it('lets the named reviewer decide signed in, once, on the content they read', async () => {
    const r = await releaseInReview();
    const reviewer = await signedInAgent(h.built.app, h.org.emails.reviewer);
    const stale = await reviewer.post(`/api/releases/${r.id}/reviews/decision`).set(csrf).send({ decision: 'approve', manifestSha256: 'f'.repeat(64) }).expect(400);
    expect(stale.body.error.field).toBe('manifestSha256');
    const ok = await reviewer.post(`/api/releases/${r.id}/reviews/decision`).set(csrf).send({ decision: 'approve', manifestSha256: r.manifestSha256 }).expect(200);
    expect(ok.body.state).toBe('approved');
    const again = await reviewer.post(`/api/releases/${r.id}/reviews/decision`).set(csrf).send({ decision: 'approve', manifestSha256: r.manifestSha256 }).expect(409);
    expect(again.body.error.message).toMatch(/already decided/);
    // The e-mailed link of the same review is used up with it.
    const link = await anonymous().post(`/api/review-links/${r.token}`).send({ decision: 'approve', manifestSha256: r.manifestSha256 }).expect(403);
    expect(link.body.error.message).toMatch(/already used/);
  });

  it('refuses a reviewer who was not named on the release', async () => {
    const r = await releaseInReview();
    const other = await signedInAgent(h.built.app, h.org.emails.multi);
    const res = await other.post(`/api/releases/${r.id}/reviews/decision`).set(csrf).send({ decision: 'approve', manifestSha256: r.manifestSha256 }).expect(403);
    expect(res.body.error.message).toMatch(/not a named reviewer/);
  });
});

describe('review requests refuse', () => {
  it('a reviewer without the reviewer role, naming the field', async () => {
    const cut = await h.designer.post(`/api/designs/${designId}/releases`).set(csrf).expect(201);
    const res = await h.designer.post(`/api/releases/${cut.body.id}/reviews`).set(csrf).send({ reviewerIds: [h.org.ids.reviewer, h.org.ids.firmware], approvalsRequired: 1 }).expect(400);
    expect(res.body.error.field).toBe('reviewerIds.1');
    expect(res.body.error.message).toMatch(/reviewer role/);
    expect((await h.designer.get(`/api/releases/${cut.body.id}`).expect(200)).body.state).toBe('draft');
  });

  it('more approvals than reviewers, and a second request on a release already in review', async () => {
    const cut = await h.designer.post(`/api/designs/${designId}/releases`).set(csrf).expect(201);
    const tooMany = await h.designer.post(`/api/releases/${cut.body.id}/reviews`).set(csrf).send({ reviewerIds: [h.org.ids.reviewer], approvalsRequired: 2 }).expect(400);
    expect(tooMany.body.error.field).toBe('approvalsRequired');
    await h.designer.post(`/api/releases/${cut.body.id}/reviews`).set(csrf).send({ reviewerIds: [h.org.ids.reviewer], approvalsRequired: 1 }).expect(200);
    const again = await h.designer.post(`/api/releases/${cut.body.id}/reviews`).set(csrf).send({ reviewerIds: [h.org.ids.multi], approvalsRequired: 1 }).expect(409);
    expect(again.body.error.message).toMatch(/cannot request-review a release that is in-review/);
  });

  it('hides unapproved releases from an account that is firmware only', async () => {
    const cut = await h.designer.post(`/api/designs/${designId}/releases`).set(csrf).expect(201);
    const firmware = await signedInAgent(h.built.app, h.org.emails.firmware);
    await firmware.get(`/api/releases/${cut.body.id}`).expect(404);
    await firmware.get(`/api/releases/${cut.body.id}/files/manifest.json`).expect(404);
    const list = await firmware.get(`/api/designs/${designId}/releases`).expect(200);
    expect(list.body.releases.every((r: { state: string }) => r.state === 'approved')).toBe(true);
  });
});
