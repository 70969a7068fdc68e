/**
 * The SMTP relay down when a review is requested, on the real stack (two API processes behind nginx,
 * each running the outbox timer). The review must be recorded at once, the mail must wait in the
 * outbox (and the release must say so), and once the relay is back the mail must arrive exactly once,
 * though both processes keep retrying.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { api, apiSignIn } from '../e2e/harness/api.ts';
import { ROOT } from '../e2e/harness/paths.ts';
import { startStack, type Stack } from '../e2e/harness/stack.ts';
import { designIdOf } from './harness/probes.ts';
import { connect } from './harness/sql.ts';

let stack: Stack;
let cookie: string;

beforeAll(async () => {
  stack = await startStack({
    app: false,
    dataDir: path.join(ROOT, '.data', `fault-mail-${process.pid}`),
    // Retry every half second, the first retry 2 s after a failure (then 4 s, 8 s …).
    env: { LW_OUTBOX_INTERVAL_MS: '500', LW_OUTBOX_FIRST_RETRY_S: '2', LW_SMTP_TIMEOUT_MS: '2000' },
  });
  cookie = (await apiSignIn(stack.baseUrl, 'designer@example.test')).cookie;
});

afterAll(async () => {
  await stack?.stop();
});

interface ReviewMail {
  state: 'sent' | 'waiting';
  attempts: number;
  sentAt: string | null;
  nextAttemptAt: string | null;
}

async function reviewMail(releaseId: number): Promise<ReviewMail> {
  const release = await api<{ reviews: { reviewerName: string; mail: ReviewMail }[] }>(stack.baseUrl, `/api/releases/${releaseId}`, { cookie });
  expect(release.body.reviews.map((r) => r.reviewerName)).toEqual(['Robin Reviewer']);
  return release.body.reviews[0]!.mail;
}

describe('the SMTP relay down when a review is requested', () => {
  it('records the review, keeps the mail waiting (the release says so), and delivers it exactly once when the relay is back', async () => {
    const subject = 'Review requested: IF FM demodulator / FM demodulator loop v1';
    const designId = await designIdOf(stack.baseUrl, cookie, 'FM demodulator loop');
    const cut = await api<{ id: number }>(stack.baseUrl, `/api/designs/${designId}/releases`, { method: 'POST', cookie });
    expect(cut.status).toBe(201);
    const reviewers = await api<{ reviewers: { id: number; email: string }[] }>(stack.baseUrl, '/api/reviewers', { cookie });
    const reviewerId = reviewers.body.reviewers.find((r) => r.email === 'reviewer@example.test')!.id;

    await stack.stopMail();
    const asked = await api<{ state: string; reviews: { mail: ReviewMail }[] }>(stack.baseUrl, `/api/releases/${cut.body.id}/reviews`, { cookie, json: { reviewerIds: [reviewerId], approvalsRequired: 1 } });
    expect(asked.status).toBe(200);
    expect(asked.body.state).toBe('in-review');
    expect(asked.body.reviews[0]!.mail).toMatchObject({ state: 'waiting', attempts: 1, sentAt: null });

    // Both processes' timers retry while the relay is down; it still waits, and the release says when next.
    await expect.poll(async () => (await reviewMail(cut.body.id)).attempts, { timeout: 20_000, interval: 250 }).toBeGreaterThanOrEqual(2);
    const waiting = await reviewMail(cut.body.id);
    expect(waiting.state).toBe('waiting');
    expect(Date.parse(waiting.nextAttemptAt!)).toBeGreaterThan(Date.now() - 1_000);
    expect(stack.mail.messages.filter((m) => m.subject === subject)).toHaveLength(0);

    await stack.restartMail();
    const mail = await stack.mail.waitFor((m) => m.subject === subject, 30_000);
    expect(mail.to).toEqual(['reviewer@example.test']);
    await expect.poll(async () => (await reviewMail(cut.body.id)).state, { timeout: 10_000, interval: 250 }).toBe('sent');
    // Several more rounds of both timers: still one mail.
    await new Promise((resolve) => setTimeout(resolve, 3_000));
    expect(stack.mail.messages.filter((m) => m.subject === subject)).toHaveLength(1);
    const sent = await reviewMail(cut.body.id);
    expect(sent.attempts).toBeGreaterThan(waiting.attempts);
    expect(sent.nextAttemptAt).toBeNull();

    // The link it carries works, and the outbox no longer holds it.
    const token = /\/review\/([^\s"'<>]+)/.exec(mail.text)![1]!;
    expect((await api(stack.baseUrl, `/api/review-links/${token}`)).status).toBe(200);
    const sql = await connect(stack.db);
    try {
      const rows = await sql.query<{ textBody: string | null; sentAt: Date | null }>('SELECT `textBody`, `sentAt` FROM `mail_outbox` WHERE `subject` = ?', [subject]);
      expect(rows).toHaveLength(1);
      expect(rows[0]!.sentAt).not.toBeNull();
      expect(rows[0]!.textBody).toBeNull();
    } finally {
      await sql.close();
    }
  });
});
