/**
 * Mail that cannot be sent is kept in the outbox and retried, never lost; the change it reports
 * (a review request) is made all the same.
 */
import { createServer, type AddressInfo } from 'node:net';
import { afterAll, beforeAll, expect, it, vi } from 'vitest';
import { backoffS } from '../../src/mail/outbox.ts';
import { csrf } from '../helpers.ts';
import { designFromTemplate, linkToken, startHandoff, type Handoff } from '../releases/handoff.ts';
import { startSmtpFake } from './smtpFake.ts';

/** A loopback port with nothing listening (taken, then released). */
async function deadPort(): Promise<number> {
  const server = createServer();
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', () => resolve()));
  const port = (server.address() as AddressInfo).port;
  await new Promise<void>((resolve) => server.close(() => resolve()));
  return port;
}

let h: Handoff;
let port: number;

beforeAll(async () => {
  port = await deadPort();
  h = await startHandoff({ LW_SMTP_PORT: String(port), LW_SMTP_TIMEOUT_MS: '2000' });
});

afterAll(async () => {
  await h.close();
});

it('backs off 30 s, 60 s, 120 s … up to an hour, or from the first retry delay set', () => {
  expect([1, 2, 3, 4].map((n) => backoffS(n))).toEqual([30, 60, 120, 240]);
  expect(backoffS(20)).toBe(3600);
  expect([1, 2, 3].map((n) => backoffS(n, 2))).toEqual([2, 4, 8]);
  expect(backoffS(20, 2)).toBe(3600);
});

it('keeps a mail the relay refused, still makes the change, and delivers it on retry', async () => {
  const designId = await designFromTemplate(h.designer, 'mains-sync');
  const cut = await h.designer.post(`/api/designs/${designId}/releases`).set(csrf).expect(201);
  const res = await h.designer.post(`/api/releases/${cut.body.id}/reviews`).set(csrf).send({ reviewerIds: [h.org.ids.reviewer], approvalsRequired: 1 }).expect(200);
  expect(res.body.state).toBe('in-review');

  const pending = (await h.dataSource.query("SELECT `id`, `attempts`, `lastError`, `sentAt`, `toAddress` FROM `mail_outbox` WHERE `toAddress` = ?", [h.org.emails.reviewer])) as {
    id: string;
    attempts: number;
    lastError: string | null;
    sentAt: Date | null;
  }[];
  expect(pending).toHaveLength(1);
  expect(pending[0]!.sentAt).toBeNull();
  expect(Number(pending[0]!.attempts)).toBe(1);
  expect(pending[0]!.lastError).toMatch(/ECONNREFUSED/);
  // The release says so: the reviewer is named and the e-mail waits.
  const waiting = await h.designer.get(`/api/releases/${cut.body.id}`).expect(200);
  expect(waiting.body.reviews).toHaveLength(1);
  expect(waiting.body.reviews[0].mail).toMatchObject({ state: 'waiting', attempts: 1, sentAt: null });
  expect(Date.parse(waiting.body.reviews[0].mail.nextAttemptAt)).toBeGreaterThan(Date.now() + 20_000);

  // Not due yet: a retry now sends nothing. (Test files share the database, so other files' mail may be
  // due meanwhile: the checks below look only at this test's row and recipient.)
  expect(await h.built.services.handoff.outbox.deliverPending([pending[0]!.id])).toEqual({ sent: 0, failed: 0 });

  // The relay comes back on the same port; the backoff has passed.
  const smtp = await startSmtpFake(port);
  try {
    await h.dataSource.query('UPDATE `mail_outbox` SET `nextAttemptAt` = CURRENT_TIMESTAMP(3) WHERE `id` = ?', [pending[0]!.id]);
    const mine = () => smtp.mails.filter((m) => m.to.includes(h.org.emails.reviewer));
    const stop = h.built.services.handoff.outbox.startTimer(50);
    const sentRow = async () => ((await h.dataSource.query('SELECT `sentAt`, `attempts` FROM `mail_outbox` WHERE `id` = ?', [pending[0]!.id])) as { sentAt: Date | null; attempts: number }[])[0];
    try {
      await vi.waitFor(() => expect(mine()).toHaveLength(1), { timeout: 10_000, interval: 50 });
      // The relay has the mail a moment before the sender hears back and marks the row sent.
      await vi.waitFor(async () => expect((await sentRow())?.sentAt).not.toBeNull(), { timeout: 10_000, interval: 50 });
    } finally {
      stop();
    }
    expect(linkToken(mine()[0]!.text)).toMatch(/^[A-Za-z0-9_-]{12}\.[A-Za-z0-9_-]{43}$/);
    const row = await sentRow();
    expect(Number(row!.attempts)).toBe(2);
    // Sent once only: a further retry finds nothing due.
    expect(await h.built.services.handoff.outbox.deliverPending([pending[0]!.id])).toEqual({ sent: 0, failed: 0 });
    expect(mine()).toHaveLength(1);
    const sent = await h.designer.get(`/api/releases/${cut.body.id}`).expect(200);
    expect(sent.body.reviews[0].mail).toMatchObject({ state: 'sent', attempts: 2, nextAttemptAt: null });
  } finally {
    await smtp.close();
  }
});
