/**
 * Edges of the input a person or a browser sends: a spec file saved with a UTF-8 byte-order mark, the
 * scheme of an Origin header, percent-encoding that does not decode.
 */
import { ifFmDemodSpec } from '@loopwright/dsp';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { csrf, designerWithProject, useTestApp } from './helpers.ts';

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
