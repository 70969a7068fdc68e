/**
 * The whole hand-off on the real MariaDB and a real SMTP server: cut, request review, read the
 * e-mails, follow the links, approve, download, check the sums, upload a matching and a corrupted
 * capture.
 */
import { execFileSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CAUTION } from '../../src/render/caution.ts';
import { csrf, signedInAgent, type Agent } from '../helpers.ts';
import { binary, designFromTemplate, linkToken, PUBLIC_URL, startHandoff, type Handoff } from './handoff.ts';

const sha256 = (b: Buffer | string) => createHash('sha256').update(b).digest('hex');

let h: Handoff;
let firmware: Agent;
let designId: number;

beforeAll(async () => {
  h = await startHandoff();
  firmware = await signedInAgent(h.built.app, h.org.emails.firmware);
  designId = await designFromTemplate(h.designer);
});

afterAll(async () => {
  await h.close();
});

describe('hand-off flow', () => {
  let releaseId: number;
  let manifestSha256: string;
  let manifest: { files: { name: string; sha256: string; bytes: number }[]; constants: unknown[] };
  const downloaded = new Map<string, Buffer>();

  it('cuts v1 with every artifact, its SHA-256 and the caution', async () => {
    const res = await h.designer.post(`/api/designs/${designId}/releases`).set(csrf).expect(201);
    releaseId = res.body.id;
    manifestSha256 = res.body.manifestSha256;
    expect(res.body.verification).toMatchObject({ state: 'queued', verdict: null, approvable: false, summary: 'reference RTL verification queued' });
    // No simulator on this file's verification PATH: "not run", which does not block approval.
    expect(await h.built.services.handoff.verification.runOnce(releaseId)).toBe(true);
    expect(res.body.label).toBe('v1');
    expect(res.body.state).toBe('draft');
    expect(res.body.caution).toBe(CAUTION);
    expect(res.body.files.map((f: { name: string }) => f.name)).toEqual([
      'manifest.json',
      'mains_sync_50hz_pkg.vhd',
      'mains_sync_50hz.vh',
      'mains_sync_50hz.h',
      'mains_sync_50hz_vectors.csv',
      ...['input_code', 'nco_phase', 'table_address', 'nco_code', 'detector_code', 'filter_code'].map((c) => `mains_sync_50hz_${c}.hex`),
      ...['round', 'nco', 'detector', 'section', 'loop'].map((p) => `mains_sync_50hz_${p}.vhd`),
      'mains_sync_50hz_loop_tb.vhd',
      ...['round', 'nco', 'detector', 'section', 'loop'].map((p) => `mains_sync_50hz_${p}.v`),
      'mains_sync_50hz_loop_tb.v',
      'README.txt',
    ]);
    expect(res.body.allowedEvents).toEqual(['request-review', 'withdraw']);
    expect(res.body.results.analysis.verdict.stable).toBe(true);
  });

  it('asks two reviewers, who each receive a link to the Review page', async () => {
    const res = await h.designer
      .post(`/api/releases/${releaseId}/reviews`)
      .set(csrf)
      .send({ reviewerIds: [h.org.ids.reviewer, h.org.ids.multi], approvalsRequired: 2 })
      .expect(200);
    expect(res.body.state).toBe('in-review');
    expect(res.body.approvalsRequired).toBe(2);
    const mails = await h.smtp.waitFor(2);
    expect(mails.map((m) => m.to[0]).sort()).toEqual([h.org.emails.reviewer, h.org.emails.multi].sort());
    for (const m of mails) {
      // Project, design and release by the names people gave them; several designs may share an identifier.
      expect(m.subject).toBe('Review requested: Hand-off mains-sync / Design mains-sync v1');
      expect(m.text).toContain('Project Hand-off mains-sync, design Design mains-sync (identifier mains_sync_50hz), release v1.');
      expect(m.text).toContain(manifestSha256);
      expect(m.text).toContain('Verify these numbers in simulation and on the bench');
    }
  });

  it('lists the release as waiting for each named reviewer in the app', async () => {
    const reviewer = await signedInAgent(h.built.app, h.org.emails.reviewer);
    const waiting = (await reviewer.get('/api/reviews/waiting').expect(200)).body.reviews;
    expect(waiting).toEqual([
      expect.objectContaining({ releaseId, designId, projectName: 'Hand-off mains-sync', designName: 'Design mains-sync', label: 'v1', requestedByName: h.org.names.designer }),
    ]);
    expect(Date.parse(waiting[0].expiresAt)).toBeGreaterThan(Date.now());
  });

  it('lets each reviewer read the release from the link without using it up, then approve', async () => {
    const tokenOf = (email: string) => linkToken(h.smtp.mails.find((m) => m.to.includes(email))!.text);
    const anonymous = request(h.built.app);
    const first = tokenOf(h.org.emails.reviewer);
    for (let i = 0; i < 2; i++) {
      const view = await anonymous.get(`/api/review-links/${first}`).expect(200);
      expect(view.body.release.manifestSha256).toBe(manifestSha256);
      expect(view.body.release.caution).toBe(CAUTION);
      expect(view.body.diff).toBeNull();
      expect(view.body.previous).toBeNull();
    }
    const one = await anonymous.post(`/api/review-links/${first}`).send({ decision: 'approve', comment: 'margins fine', manifestSha256 }).expect(200);
    expect(one.body).toEqual({ decision: 'approve', state: 'in-review', approvals: 1, approvalsRequired: 2 });

    const second = tokenOf(h.org.emails.multi);
    const two = await anonymous.post(`/api/review-links/${second}`).send({ decision: 'approve', manifestSha256 }).expect(200);
    expect(two.body.state).toBe('approved');
  });

  it('no longer lists a review once its reviewer decided', async () => {
    for (const email of [h.org.emails.reviewer, h.org.emails.multi]) {
      const agent = await signedInAgent(h.built.app, email);
      expect((await agent.get('/api/reviews/waiting').expect(200)).body.reviews).toEqual([]);
    }
  });

  it('e-mails the firmware engineers of the organisation when approved', async () => {
    const mails = await h.smtp.waitFor(5);
    const approved = mails.filter((m) => m.subject === 'Release approved: Hand-off mains-sync / Design mains-sync v1');
    expect(approved.map((m) => m.to[0])).toEqual([h.org.emails.firmware]);
    // The firmware engineer's page of the release (the browser test follows it: tests/e2e/mail-links).
    expect(approved[0]!.text).toContain(`${PUBLIC_URL}/downloads?release=${releaseId}\n`);
  });

  it('tells the designer of each decision, with the release page to open', async () => {
    const decided = h.smtp.mails.filter((m) => m.to.includes(h.org.emails.designer));
    expect(decided.map((m) => m.subject)).toEqual([
      `Approved by ${h.org.names.reviewer}: Hand-off mains-sync / Design mains-sync v1`,
      `Approved by ${h.org.names.multi}: Hand-off mains-sync / Design mains-sync v1`,
    ]);
    expect(decided[0]!.text).toContain('The release is now in review, 1 of 2 approval(s).');
    expect(decided[0]!.text).toContain('Comment:\nmargins fine');
    expect(decided[1]!.text).toContain('The release is now approved.');
    for (const m of decided) expect(m.text).toContain(`${PUBLIC_URL}/designs/${designId}/releases?release=${releaseId}\n`);
  });

  it('offers the approved release to firmware on the Downloads list', async () => {
    const res = await firmware.get('/api/releases').expect(200);
    expect(res.body.releases.map((r: { id: number; state: string }) => [r.id, r.state])).toContainEqual([releaseId, 'approved']);
  });

  it('serves every file with bytes equal to the stored bytes and to the manifest sums', async () => {
    const m = await firmware.get(`/api/releases/${releaseId}/files/manifest.json`).buffer(true).parse(binary).expect(200);
    expect(sha256(m.body)).toBe(manifestSha256);
    manifest = JSON.parse(m.body.toString('utf8'));
    // The stored bytes, read from the file store (not through the API): the download must equal them.
    const rows = (await h.dataSource.query('SELECT `name`, `sha256` FROM `release_files` WHERE `releaseId` = ?', [releaseId])) as { name: string; sha256: string }[];
    const stored = await Promise.all(rows.map(async (r) => ({ name: r.name, content: readFileSync(h.built.services.handoff.files.pathOf(r.sha256)) })));
    for (const f of manifest.files) {
      const res = await firmware.get(`/api/releases/${releaseId}/files/${f.name}`).buffer(true).parse(binary).expect(200);
      expect(sha256(res.body), f.name).toBe(f.sha256);
      expect(res.body.length).toBe(f.bytes);
      expect(res.headers['x-content-sha256']).toBe(f.sha256);
      expect(Buffer.compare(res.body, stored.find((s) => s.name === f.name)!.content)).toBe(0);
      downloaded.set(f.name, res.body);
    }
  });

  it('zips every artifact with manifest.json first, byte for byte (read back with Python zipfile)', async () => {
    const res = await firmware.get(`/api/releases/${releaseId}/bundle`).buffer(true).parse(binary).expect(200);
    expect(res.headers['content-type']).toBe('application/zip');
    const dir = mkdtempSync(join(tmpdir(), 'lw-bundle-'));
    writeFileSync(join(dir, 'b.zip'), res.body);
    // Python's standard zipfile as an independent reader of the archive (reference library).
    const listing = execFileSync('/usr/bin/python3', ['-c', 'import sys,zipfile,hashlib\nz=zipfile.ZipFile(sys.argv[1])\nfor i in z.infolist(): print(i.filename, hashlib.sha256(z.read(i)).hexdigest())', join(dir, 'b.zip')], { encoding: 'utf8' });
    const entries = listing.trim().split('\n').map((l) => l.split(' '));
    expect(entries[0]![0]).toBe('mains_sync_50hz-v1/manifest.json');
    expect(entries[0]![1]).toBe(manifestSha256);
    expect(entries.slice(1).map(([n, s]) => [n, s])).toEqual(manifest.files.map((f) => [`mains_sync_50hz-v1/${f.name}`, f.sha256]));
  });

  it('logs every download: who, which release, which file, when', async () => {
    const res = await h.designer.get(`/api/releases/${releaseId}/downloads`).expect(200);
    const names = (res.body.downloads as { fileName: string; userEmail: string; at: string }[]).map((d) => d.fileName).sort();
    expect(names).toEqual(['bundle', 'manifest.json', ...manifest.files.map((f) => f.name)].sort());
    for (const d of res.body.downloads) {
      expect(d.userEmail).toBe(h.org.emails.firmware);
      expect(d.releaseId).toBe(releaseId);
      expect(Number.isNaN(Date.parse(d.at))).toBe(false);
    }
  });

  it('judges a matching capture bit-exact and a corrupted one with its first mismatch', async () => {
    const golden = downloaded.get('mains_sync_50hz_vectors.csv')!;
    const ok = await firmware.post(`/api/releases/${releaseId}/conformance`).set(csrf).attach('file', golden, 'sim_out.csv').expect(201);
    expect(ok.body).toMatchObject({ verdict: 'bit-exact', mismatchCount: 0, firstMismatches: [], samplesCompared: 65536, fileName: 'sim_out.csv' });

    const lines = golden.toString('utf8').split('\n');
    const row = lines[101]!.split(','); // sample 100
    const expected = row[6]!;
    row[6] = String(Number(expected) + 1); // filter_code off by one LSB
    lines[101] = row.join(',');
    const bad = await firmware.post(`/api/releases/${releaseId}/conformance`).set(csrf).attach('file', Buffer.from(lines.join('\n')), 'corrupt.csv').expect(201);
    expect(bad.body.verdict).toBe('mismatch');
    expect(bad.body.mismatchCount).toBe(1);
    expect(bad.body.firstMismatches).toEqual([{ sampleIndex: 100, column: 'filter_code', expected, got: row[6] }]);

    const list = await h.designer.get(`/api/releases/${releaseId}/conformance`).expect(200);
    expect(list.body.runs.map((r: { verdict: string }) => r.verdict)).toEqual(['mismatch', 'bit-exact']);
  });

  it('refuses a malformed capture naming the line', async () => {
    const golden = downloaded.get('mains_sync_50hz_vectors.csv')!.toString('utf8').split('\n');
    golden[4] = golden[4]!.replace(/,[^,]*$/, ',1.5');
    const res = await firmware.post(`/api/releases/${releaseId}/conformance`).set(csrf).attach('file', Buffer.from(golden.join('\n')), 'x.csv').expect(400);
    expect(res.body.error.field).toBe('file');
    expect(res.body.error.message).toContain('line 5');
    expect(res.body.error.message).toContain('filter_code');
    // A header alone, a run cut short and a binary file: refused, saying what is wrong with the file.
    const clean = downloaded.get('mains_sync_50hz_vectors.csv')!.toString('utf8').split('\n');
    const headerOnly = await firmware.post(`/api/releases/${releaseId}/conformance`).set(csrf).attach('file', Buffer.from(`${golden[0]}\n`), 'empty_run.csv').expect(400);
    expect(headerOnly.body.error.message).toContain('the file has the wrong length: expected 65,536 samples');
    expect(headerOnly.body.error.message).toContain('found none (the file holds the header only)');
    const cut = await firmware.post(`/api/releases/${releaseId}/conformance`).set(csrf).attach('file', Buffer.from(clean.slice(0, 2001).join('\n')), 'cut.csv').expect(400);
    expect(cut.body.error.message).toMatch(/wrong length: expected 65,536 samples .*, found 2,000$/);
    const binary = await firmware.post(`/api/releases/${releaseId}/conformance`).set(csrf).attach('file', Buffer.from([0x1f, 0x8b, 0x08, 0x00, 0xde, 0xad, 0xbe, 0xef]), 'wave.fst').expect(400);
    expect(binary.body.error.message).toMatch(/^wave\.fst: line 1: this is not a CSV text file/);
    const huge = Buffer.alloc(9 * 1024 * 1024, 0x20);
    const tooBig = await firmware.post(`/api/releases/${releaseId}/conformance`).set(csrf).attach('file', huge, 'huge.csv').expect(413);
    expect(tooBig.body.error.code).toBe('payload_too_large');
    const runs = await h.designer.get(`/api/releases/${releaseId}/conformance`).expect(200);
    expect(runs.body.runs).toHaveLength(2);
    // The refused capture stays in the release's record: who tried which file, and why.
    const refused = (await h.dataSource.query("SELECT actorEmail, detailJson FROM audit_entries WHERE action = 'release.conformance-rejected' AND objectType = 'release' AND objectId = ?", [String(releaseId)])) as { actorEmail: string; detailJson: string }[];
    expect(refused).toHaveLength(5);
    const details = refused.map((r) => JSON.parse(r.detailJson) as { fileName: string | null; reason: string });
    expect(details.map((d) => d.fileName).filter((n) => n !== null).sort()).toEqual(['cut.csv', 'empty_run.csv', 'wave.fst', 'x.csv']);
    // The 9 MiB file never reached the comparison; the parser's refusal is recorded all the same.
    expect(details.find((d) => d.fileName === null)?.reason).toBe('the file is larger than the 8 MiB a capture may be');
    expect(refused.map((r) => JSON.parse(r.detailJson) as { fileName: string; reason: string }).find((d) => d.fileName === 'x.csv')).toMatchObject({ reason: expect.stringContaining('line 5') });
  });

  it('has no way to change a release: no update route, and the database refuses', async () => {
    await h.designer.put(`/api/releases/${releaseId}`).set(csrf).send({}).expect(404);
    await h.designer.patch(`/api/releases/${releaseId}`).set(csrf).send({}).expect(404);
    await expect(h.dataSource.query("UPDATE `releases` SET `specJson` = '{}' WHERE `id` = ?", [releaseId])).rejects.toThrow(/never changes/);
    await expect(h.dataSource.query("UPDATE `release_files` SET `content` = 'x' WHERE `releaseId` = ?", [releaseId])).rejects.toThrow(/insert-only/);
    await expect(h.dataSource.query('DELETE FROM `releases` WHERE `id` = ?', [releaseId])).rejects.toThrow(/kept for the record/);
  });
});

describe('a design with releases', () => {
  it('is never deleted; archiving freezes it (no edit, no cut) and keeps its releases; restoring thaws it', async () => {
    const id = await designFromTemplate(h.designer);
    const v1 = (await h.designer.post(`/api/designs/${id}/releases`).set(csrf).expect(201)).body;
    const projectId = (await h.designer.get(`/api/designs/${id}`).expect(200)).body.projectId;
    const listed = (await h.designer.get(`/api/projects/${projectId}/designs`).expect(200)).body.designs;
    expect(listed.find((d: { id: number }) => d.id === id)).toMatchObject({ archived: false, releaseCount: 1 });

    const refused = await h.designer.delete(`/api/designs/${id}`).set(csrf).expect(409);
    expect(refused.body.error.message).toMatch(/1 release/);

    const archived = (await h.designer.patch(`/api/designs/${id}`).set(csrf).send({ archived: true }).expect(200)).body;
    expect(archived).toMatchObject({ archived: true, revision: 1 });
    const active = (await h.designer.get(`/api/projects/${projectId}/designs`).expect(200)).body.designs.map((d: { id: number }) => d.id);
    expect(active).not.toContain(id);
    const onlyArchived = (await h.designer.get(`/api/projects/${projectId}/designs?archived=true`).expect(200)).body.designs;
    expect(onlyArchived.map((d: { id: number }) => d.id)).toEqual([id]);

    const edit = await h.designer.put(`/api/designs/${id}`).set(csrf).send({ baseRevision: 1, name: 'Edited while archived' }).expect(409);
    expect(edit.body.error).toMatchObject({ code: 'conflict', field: 'archived' });
    const cut = await h.designer.post(`/api/designs/${id}/releases`).set(csrf).expect(409);
    expect(cut.body.error).toMatchObject({ code: 'conflict', field: 'archived' });
    // Its release is still the record it was.
    const kept = (await h.designer.get(`/api/releases/${v1.id}`).expect(200)).body;
    expect(kept.manifestSha256).toBe(v1.manifestSha256);
    expect((await h.designer.get(`/api/designs/${id}/releases`).expect(200)).body.releases).toHaveLength(1);

    await h.designer.patch(`/api/designs/${id}`).set(csrf).send({ archived: false }).expect(200);
    await h.designer.put(`/api/designs/${id}`).set(csrf).send({ baseRevision: 1, name: 'Edited after restore' }).expect(200);
    const actions: { action: string }[] = await h.dataSource.query("SELECT action FROM audit_entries WHERE objectType = 'design' AND objectId = ? ORDER BY id", [String(id)]);
    expect(actions.map((a) => a.action)).toEqual(['design.create', 'design.archive', 'design.restore', 'design.update']);
  });
});
