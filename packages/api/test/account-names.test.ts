/**
 * People's names in sessions and e-mail. The session caches who the user is (middleware/auth.ts); a
 * rename by an admin reaches the user's open sessions at once, so the next page and the next e-mail
 * show the new name. E-mail text stays plain even for a name stored before names were checked.
 */
import { afterAll, beforeAll, expect, it } from 'vitest';
import { csrf, signedInAgent } from './helpers.ts';
import { designFromTemplate, startHandoff, type Handoff } from './releases/handoff.ts';

let h: Handoff;

beforeAll(async () => {
  h = await startHandoff();
});

afterAll(async () => {
  await h.close();
});

it('shows a renamed designer the new name in the open session and in the review e-mail they send', async () => {
  const admin = await signedInAgent(h.built.app, h.org.emails.admin);
  await admin.patch(`/api/users/${h.org.ids.designer}`).set(csrf).send({ displayName: 'Ines Okafor-Lund' }).expect(200);
  const me = await h.designer.get('/api/session').expect(200);
  expect(me.body.user.displayName).toBe('Ines Okafor-Lund');

  const designId = await designFromTemplate(h.designer, 'mains-sync');
  const cut = await h.designer.post(`/api/designs/${designId}/releases`).set(csrf).expect(201);
  expect(cut.body.createdByName).toBe('Ines Okafor-Lund');
  await h.designer.post(`/api/releases/${cut.body.id}/reviews`).set(csrf).send({ reviewerIds: [h.org.ids.reviewer], approvalsRequired: 1 }).expect(200);
  const [mail] = await h.smtp.waitFor(1);
  expect(mail!.text).toContain('Ines Okafor-Lund asks you to review');
});

it('keeps the session of a renamed account signed in, with its roles', async () => {
  const admin = await signedInAgent(h.built.app, h.org.emails.admin);
  const reviewer = await signedInAgent(h.built.app, h.org.emails.reviewer);
  await admin.patch(`/api/users/${h.org.ids.reviewer}`).set(csrf).send({ displayName: 'Tomasz Brandvold' }).expect(200);
  const me = await reviewer.get('/api/session').expect(200);
  expect(me.body.user).toMatchObject({ displayName: 'Tomasz Brandvold', roles: ['reviewer'] });
});

it('writes a name stored before the character rule into the e-mail without its hidden characters', async () => {
  await h.dataSource.query('UPDATE `users` SET `displayName` = ? WHERE `id` = ?', ['Eve\u202eyrallaM\u2028Approved\u0085 by QA', h.org.ids.reviewer]);
  const before = h.smtp.mails.length;
  const designId = await designFromTemplate(h.designer, 'mains-sync');
  const cut = await h.designer.post(`/api/designs/${designId}/releases`).set(csrf).expect(201);
  await h.designer.post(`/api/releases/${cut.body.id}/reviews`).set(csrf).send({ reviewerIds: [h.org.ids.reviewer], approvalsRequired: 1 }).expect(200);
  const mail = (await h.smtp.waitFor(before + 1))[before]!;
  expect(mail.text).not.toMatch(/[\u0085\u2028\u2029\u202a-\u202e\u2066-\u2069]/);
  expect(mail.text).toContain('Hello Eve yrallaM Approved by QA,');
});
