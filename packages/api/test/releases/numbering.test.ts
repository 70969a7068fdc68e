/** Release numbers come from the database: concurrent cuts of one design never collide. */
import { afterAll, beforeAll, expect, it } from 'vitest';
import { csrf } from '../helpers.ts';
import { designFromTemplate, startHandoff, type Handoff } from './handoff.ts';

let h: Handoff;

beforeAll(async () => {
  h = await startHandoff();
});

afterAll(async () => {
  await h.close();
});

it('numbers 20 concurrent cuts of one design v1…v20, each once', async () => {
  const designId = await designFromTemplate(h.designer, 'if-fm-demod');
  const responses = await Promise.all(Array.from({ length: 20 }, () => h.designer.post(`/api/designs/${designId}/releases`).set(csrf)));
  expect(responses.map((r) => r.status)).toEqual(Array(20).fill(201));
  const numbers = responses.map((r) => r.body.number as number).sort((a, b) => a - b);
  expect(numbers).toEqual(Array.from({ length: 20 }, (_, i) => i + 1));
  const rows = (await h.dataSource.query('SELECT `number` FROM `releases` WHERE `designId` = ? ORDER BY `number`', [designId])) as { number: number }[];
  expect(rows.map((r) => Number(r.number))).toEqual(numbers);
  // The same spec renders the same bytes every time; only manifest.json, which names its release
  // (label and cut time), differs from cut to cut (test/releases/manifest-stamp).
  const sums = (files: { name: string; sha256: string }[]) => files.filter((f) => f.name !== 'manifest.json').map((f) => `${f.name} ${f.sha256}`).join('\n');
  expect(new Set(responses.map((r) => sums(r.body.files))).size).toBe(1);
  expect(new Set(responses.map((r) => r.body.manifestSha256)).size).toBe(20);
});

it('refuses a second row with a taken number (the unique index behind the lock)', async () => {
  const designId = await designFromTemplate(h.designer, 'mains-sync');
  await h.designer.post(`/api/designs/${designId}/releases`).set(csrf).expect(201);
  await expect(
    h.dataSource.query(
      "INSERT INTO `releases` (`designId`, `number`, `specJson`, `resultsJson`, `specSha256`, `manifestSha256`, `designRevision`, `createdById`) VALUES (?, 1, '{}', '{}', ?, ?, 1, ?)",
      [designId, '0'.repeat(64), '0'.repeat(64), h.org.ids.designer],
    ),
  ).rejects.toThrow(/Duplicate entry/);
});

it('keeps a design with releases from being deleted', async () => {
  const designId = await designFromTemplate(h.designer, 'mains-sync');
  await h.designer.post(`/api/designs/${designId}/releases`).set(csrf).expect(201);
  const res = await h.designer.delete(`/api/designs/${designId}`).set(csrf).expect(409);
  expect(res.body.error.message).toMatch(/release/);
});

it('diffs two releases: spec fields, codes and margins that changed', async () => {
  const designId = await designFromTemplate(h.designer, 'mains-sync');
  const v1 = await h.designer.post(`/api/designs/${designId}/releases`).set(csrf).expect(201);
  const design = await h.designer.get(`/api/designs/${designId}`).expect(200);
  const spec = { ...design.body.spec, filter: { ...design.body.spec.filter, naturalHz: 4 } };
  await h.designer.put(`/api/designs/${designId}`).set(csrf).send({ baseRevision: design.body.revision, spec }).expect(200);
  const v2 = await h.designer.post(`/api/designs/${designId}/releases`).set(csrf).expect(201);
  const diff = await h.designer.get(`/api/releases/${v2.body.id}/diff?against=${v1.body.id}`).expect(200);
  expect(diff.body.from.label).toBe('v1');
  expect(diff.body.to.label).toBe('v2');
  const rowsOf = (id: string) => (diff.body.sections as { id: string; rows: { key: string; before: string | null; after: string | null }[] }[]).find((sec) => sec.id === id)?.rows ?? [];
  expect(rowsOf('spec').map((r) => [r.key, r.before, r.after])).toEqual([['filter.naturalHz', '5', '4']]);
  // PI from targets: tau1 = K/wn^2 grows, so the integrator-section codes change (G3 Ch. 2).
  expect(rowsOf('codes').map((r) => r.key)).toContain('MAINS_SYNC_50HZ_S0_B0');
  const keys = rowsOf('margins').map((r) => r.key);
  expect(keys).toContain('discrete.phaseMarginDeg');
  expect(keys.some((k) => k.startsWith('quantized.'))).toBe(true);
  const other = await designFromTemplate(h.designer, 'ultrasonic-single-pole');
  const foreign = await h.designer.post(`/api/designs/${other}/releases`).set(csrf).expect(201);
  const refused = await h.designer.get(`/api/releases/${v2.body.id}/diff?against=${foreign.body.id}`).expect(400);
  expect(refused.body.error.field).toBe('against');
});
