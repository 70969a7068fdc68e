/**
 * Two cuts of one unchanged spec are two releases a reader can tell apart: each manifest.json names
 * project, design title, release label and cut time, so the manifests (and their SHA-256) differ while
 * every generated file stays byte for byte the same; the second cut is recorded as the same spec as
 * the first. Expected values are the test's own names and the server's clock (common practice, no source).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { csrf } from '../helpers.ts';
import { binary, designFromTemplate, startHandoff, type Handoff } from './handoff.ts';

let h: Handoff;
let designId: number;

beforeAll(async () => {
  h = await startHandoff();
  designId = await designFromTemplate(h.designer, 'ultrasonic-single-pole');
});

afterAll(async () => {
  await h.close();
});

async function manifestOf(id: number): Promise<{ release: unknown; spec: unknown }> {
  const res = await h.designer.get(`/api/releases/${id}/files/manifest.json`).buffer(true).parse(binary).expect(200);
  return JSON.parse((res.body as Buffer).toString('utf8'));
}

describe('manifest of a release', () => {
  it('names project, design, label and cut time, so identical specs get different SHA-256s', async () => {
    const before = Date.now();
    const v1 = (await h.designer.post(`/api/designs/${designId}/releases`).set(csrf).expect(201)).body;
    const v2 = (await h.designer.post(`/api/designs/${designId}/releases`).set(csrf).expect(201)).body;
    expect(v2.specSha256).toBe(v1.specSha256);
    expect(v2.manifestSha256).not.toBe(v1.manifestSha256);

    const m1 = await manifestOf(v1.id);
    const m2 = await manifestOf(v2.id);
    expect(m1.release).toEqual({ project: 'Hand-off ultrasonic-single-pole', designTitle: 'Design ultrasonic-single-pole', label: 'v1', cutAt: expect.any(String) });
    expect(m2.release).toMatchObject({ label: 'v2' });
    const cutAt = Date.parse((m1.release as { cutAt: string }).cutAt);
    expect(cutAt).toBeGreaterThanOrEqual(before - 1000);
    expect(cutAt).toBeLessThanOrEqual(Date.now() + 1000);
    // Apart from that stamp the manifests agree, and every other file is the same bytes.
    expect({ ...m2, release: null }).toEqual({ ...m1, release: null });
    const sums = (files: { name: string; sha256: string }[]) => files.filter((f) => f.name !== 'manifest.json').map((f) => `${f.name} ${f.sha256}`);
    expect(sums(v2.files)).toEqual(sums(v1.files));
    expect(v1.files[0]).toMatchObject({ name: 'manifest.json', sha256: v1.manifestSha256 });

    const audit = (await h.dataSource.query("SELECT `detailJson` FROM `audit_entries` WHERE `action` = 'release.cut' AND `objectId` IN (?, ?) ORDER BY `id`", [String(v1.id), String(v2.id)])) as { detailJson: string }[];
    const details = audit.map((a) => JSON.parse(a.detailJson) as { sameSpecAs: string | null });
    expect(details.map((d) => d.sameSpecAs)).toEqual([null, 'v1']);
  });
});
