/**
 * Once a mail is delivered, the outbox keeps only what the record needs (recipient, subject, kind,
 * when it was sent), not the text: a review link is a credential, stored hashed in release_reviews,
 * and a copy of the database must not hold it in the clear. Undelivered mail keeps its text for the retry.
 */
import { afterAll, beforeAll, expect, it, vi } from 'vitest';
import { csrf } from '../helpers.ts';
import { designFromTemplate, linkToken, startHandoff, type Handoff } from '../releases/handoff.ts';

let h: Handoff;

beforeAll(async () => {
  h = await startHandoff();
});

afterAll(async () => {
  await h.close();
});

it('drops the text, with its review link, of every mail it delivered', async () => {
  const designId = await designFromTemplate(h.designer, 'mains-sync');
  const cut = await h.designer.post(`/api/designs/${designId}/releases`).set(csrf).expect(201);
  await h.designer.post(`/api/releases/${cut.body.id}/reviews`).set(csrf).send({ reviewerIds: [h.org.ids.reviewer], approvalsRequired: 1 }).expect(200);
  const [mail] = await h.smtp.waitFor(1);
  const token = linkToken(mail!.text);
  const read = async () => (await h.dataSource.query('SELECT `subject`, `kind`, `sentAt`, `textBody` FROM `mail_outbox` WHERE `toAddress` = ?', [h.org.emails.reviewer])) as { subject: string; kind: string; sentAt: Date | null; textBody: string | null }[];
  // The relay has the mail a moment before the sender marks the row sent.
  await vi.waitFor(async () => expect((await read())[0]?.sentAt).not.toBeNull(), { timeout: 10_000, interval: 50 });
  const rows = await read();
  expect(rows).toHaveLength(1);
  expect(rows[0]).toMatchObject({ subject: 'Review requested: Hand-off mains-sync / Design mains-sync v1', kind: 'review-request' });
  expect(rows[0]!.sentAt).not.toBeNull();
  expect(rows[0]!.textBody ?? '').not.toContain(token.split('.')[1]);
  expect(rows[0]!.textBody ?? '').not.toContain('/review/');
});
