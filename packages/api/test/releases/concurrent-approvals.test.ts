/**
 * Reviewers who decide at the same moment: the approval count and the state change are one
 * transaction under the release's row lock, so the last approval needed always moves the release to
 * approved, exactly once, and firmware is told exactly once. The decisions go through a listening
 * HTTP server at once (fetch), many trials for 2, 3 and 5 reviewers.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { csrf, PASSWORD, signedInAgent } from '../helpers.ts';
import { designFromTemplate, linkToken, startHandoff, type Handoff, listening } from './handoff.ts';

const TRIALS_PER_SIZE = 6;

let h: Handoff;
let server: Awaited<ReturnType<typeof listening>>;
let base: string;
let designId: number;
const reviewers: { id: number; email: string }[] = [];

beforeAll(async () => {
  h = await startHandoff();
  const admin = await signedInAgent(h.built.app, h.org.emails.admin);
  for (let i = 0; i < 5; i++) {
    const email = `concurrent-${i}-${h.org.organizationId}@example.test`;
    const res = await admin.post('/api/users').set(csrf).send({ email, displayName: `Concurrent reviewer ${i}`, password: PASSWORD, roles: ['reviewer'] }).expect(201);
    reviewers.push({ id: res.body.id, email });
  }
  designId = await designFromTemplate(h.designer, 'ultrasonic-single-pole');
  server = await listening(h.built.app);
  base = server.base;
});

afterAll(async () => {
  await server.close();
  await h.close();
});

async function trial(count: number): Promise<void> {
  const cut = await h.designer.post(`/api/designs/${designId}/releases`).set(csrf).expect(201);
  await h.built.services.handoff.verification.runOnce(cut.body.id);
  const { id, manifestSha256, label } = cut.body as { id: number; manifestSha256: string; label: string };
  const before = h.smtp.mails.length;
  const named = reviewers.slice(0, count);
  await h.designer.post(`/api/releases/${id}/reviews`).set(csrf).send({ reviewerIds: named.map((r) => r.id), approvalsRequired: count }).expect(200);
  const mails = (await h.smtp.waitFor(before + count)).slice(before);
  const tokens = named.map((r) => linkToken(mails.find((m) => m.to.includes(r.email))!.text));

  const firmwareMailsBefore = h.smtp.mails.length;
  const answers = await Promise.all(
    tokens.map((token) =>
      fetch(`${base}/api/review-links/${token}`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ decision: 'approve', manifestSha256 }) }).then(async (r) => ({ status: r.status, body: (await r.json()) as { state: string; approvals: number } })),
    ),
  );
  expect(answers.map((a) => a.status), JSON.stringify(answers)).toEqual(Array(count).fill(200));
  // Exactly one decision saw the last approval and moved the release; the others saw fewer.
  expect(answers.map((a) => a.body.approvals).sort((a, b) => a - b)).toEqual(Array.from({ length: count }, (_, i) => i + 1));
  expect(answers.filter((a) => a.body.state === 'approved')).toHaveLength(1);

  const release = await h.designer.get(`/api/releases/${id}`).expect(200);
  expect(release.body.state).toBe('approved');
  expect(release.body.approvals).toBe(count);
  const subject = `Release approved: Hand-off ultrasonic-single-pole / ${release.body.designName} ${label}`;
  const queued = (await h.dataSource.query('SELECT COUNT(*) AS n FROM `mail_outbox` WHERE `subject` = ? AND `toAddress` = ?', [subject, h.org.emails.firmware])) as { n: string | number }[];
  expect(Number(queued[0]?.n)).toBe(1);
  await h.smtp.waitFor(firmwareMailsBefore + 1);
  expect(h.smtp.mails.filter((m) => m.subject === subject && m.to.includes(h.org.emails.firmware))).toHaveLength(1);
}

describe('approvals at the same moment', () => {
  for (const count of [2, 3, 5]) {
    it(`${count} reviewers, ${TRIALS_PER_SIZE} trials: approved once, firmware told once`, async () => {
      for (let i = 0; i < TRIALS_PER_SIZE; i++) await trial(count);
    });
  }
});
