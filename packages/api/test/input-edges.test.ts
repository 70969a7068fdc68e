/**
 * Edges of the input a person or a browser sends: a spec file saved with a UTF-8 byte-order mark, the
 * scheme of an Origin header, percent-encoding that does not decode, characters that hide or reorder
 * text in names, ids that are numbers only to a lenient parser.
 */
import { ifFmDemodSpec } from '@loopwright/dsp';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { csrf, designerWithProject, signedInAgent, useTestApp } from './helpers.ts';

const t = useTestApp();

describe('a spec file', () => {
  it('that starts with a UTF-8 byte-order mark (as some Windows editors save it) is read like one without', async () => {
    const { designer, projectId } = await designerWithProject(t, 'BOM upload');
    const file = Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(JSON.stringify(ifFmDemodSpec))]);
    const res = await designer.post(`/api/projects/${projectId}/designs/upload`).set(csrf).attach('file', file, 'fm.json').expect(201);
    expect(res.body.spec).toEqual(ifFmDemodSpec);
  });
});

describe('the Origin check', () => {
  it('refuses an Origin whose scheme differs from the one the server was reached by (https page, http API)', async () => {
    const { designer } = await designerWithProject(t, 'Origin scheme');
    const host = 'lw.example.test:8080';
    const refused = await designer.post('/api/projects').set(csrf).set('Host', host).set('Origin', `https://${host}`).send({ name: 'From elsewhere' }).expect(403);
    expect(refused.body.error.code).toBe('csrf_rejected');
    await designer.post('/api/projects').set(csrf).set('Host', host).set('Origin', `http://${host}`).send({ name: 'Same origin' }).expect(201);
  });

  it('compares the scheme a trusted proxy reports (X-Forwarded-Proto) when LW_TRUST_PROXY is on', async () => {
    const { designer } = await designerWithProject(t, 'Origin proxy');
    // This app does not trust the proxy, so the forwarded scheme is ignored and http is what counts.
    await designer.post('/api/projects').set(csrf).set('Host', 'lw.example.test').set('X-Forwarded-Proto', 'https').set('Origin', 'https://lw.example.test').send({ name: 'Forged scheme' }).expect(403);
  });
});

describe('a path with percent-encoding that does not decode', () => {
  it('is a 400 naming the path, not a 500', async () => {
    const { designer } = await designerWithProject(t, 'Percent');
    for (const path of ['/api/designs/%E0%A4%A', '/api/designs/%', '/api/releases/12/files/a%ZZb', '/api/review-links/%C0%AF']) {
      const res = await designer.get(path);
      expect(res.status, path).toBe(400);
      expect(res.body.error).toMatchObject({ code: 'invalid_input', field: 'path' });
    }
    const anonymous = await request(t.built.app).get('/api/designs/%E0%A4%A').expect(400);
    expect(anonymous.body.error.field).toBe('path');
  });
});

describe('names and titles', () => {
  const hidden = { 'U+2028 line separator': '\u2028', 'U+2029 paragraph separator': '\u2029', 'U+202E right-to-left override': '\u202e', 'U+0085 next line': '\u0085', 'U+2066 left-to-right isolate': '\u2066' };

  it.each(Object.entries(hidden))('refuse %s in a display name, a project name and a design name, naming the field', async (_label, ch) => {
    const { org, designer, projectId } = await designerWithProject(t, 'Hidden characters');
    const admin = await signedInAgent(t.built.app, org.emails.admin);
    const created = await admin.post('/api/users').set(csrf).send({ email: `hidden-${Date.now()}@example.test`, displayName: `Eve${ch}Mallory`, password: 'a-long-enough-password', roles: ['reviewer'] }).expect(400);
    expect(created.body.error.field).toBe('displayName');
    expect(created.body.error.message).toMatch(/control, line-separator or bidirectional/);
    const renamed = await admin.patch(`/api/users/${org.ids.reviewer}`).set(csrf).send({ displayName: `Eve${ch}Mallory` }).expect(400);
    expect(renamed.body.error.field).toBe('displayName');
    const project = await designer.post('/api/projects').set(csrf).send({ name: `Loop${ch}s` }).expect(400);
    expect(project.body.error.field).toBe('name');
    const design = await designer.post(`/api/projects/${projectId}/designs`).set(csrf).send({ name: `PLL${ch}1`, templateId: 'mains-sync' }).expect(400);
    expect(design.body.error.field).toBe('name');
  });

  it('still accept names in any script, with accents, quotes and angle brackets', async () => {
    const { org } = await designerWithProject(t, 'Names');
    const admin = await signedInAgent(t.built.app, org.emails.admin);
    for (const displayName of ['Zoë Ødegård-Nakamura', 'Άννα Παπαδοπούλου', 'יעל כהן', "O'Brien <lab 3>"]) {
      await admin.patch(`/api/users/${org.ids.reviewer}`).set(csrf).send({ displayName }).expect(200);
    }
  });
});

describe('ids in paths and queries', () => {
  it.each(['0x4', '+4', '04', '%204', '4%20', '1e0', '4.0', '٤'])('refuse the non-canonical id %s with 400 naming the parameter', async (id) => {
    const { designer } = await designerWithProject(t, 'Ids');
    const res = await designer.get(`/api/designs/${id}`);
    expect(res.status, id).toBe(400);
    expect(res.body.error.field).toBe('id');
  });

  it('refuse non-canonical numbers in queries and in bodies too', async () => {
    const { org, designer } = await designerWithProject(t, 'Ids 2');
    const admin = await signedInAgent(t.built.app, org.emails.admin);
    expect((await admin.get('/api/audit?limit=0x10').expect(400)).body.error.field).toBe('limit');
    expect((await admin.get('/api/audit?actorId=+1').expect(400)).body.error.field).toBe('actorId');
    expect((await designer.get('/api/releases/1/diff?against=01').expect(400)).body.error.field).toBe('against');
    const review = await designer.post('/api/releases/1/reviews').set(csrf).send({ reviewerIds: ['07'], approvalsRequired: 1 }).expect(400);
    expect(review.body.error.field).toBe('reviewerIds.0');
    // The canonical forms still work.
    await admin.get('/api/audit?limit=16').expect(200);
    await designer.get('/api/designs/2147483647').expect(404);
  });
});
