import { mainsSyncSpec } from '@loopwright/dsp';
import request from 'supertest';
import { beforeAll, describe, expect, it } from 'vitest';
import { csrf, designerWithProject, PASSWORD, useTestApp, type Agent, type TestOrg } from './helpers.ts';

const testApp = useTestApp();
let org: TestOrg;
let designer: Agent;
let projectId: number;

beforeAll(async () => {
  ({ org, designer, projectId } = await designerWithProject(testApp, 'Bad input'));
});

async function projectCount(): Promise<number> {
  const [row] = await testApp.dataSource.query('SELECT COUNT(*) AS n FROM projects WHERE organizationId = ?', [org.organizationId]);
  return Number(row.n);
}

/** No stack frames, SQL or driver codes in a response body. */
function expectNoInternals(text: string): void {
  expect(text).not.toMatch(/\n\s+at |SELECT |INSERT |ER_[A-Z_]+|node_modules|\.ts:\d+/);
}

describe('malformed and oversized bodies', () => {
  it('answers malformed JSON with 400 malformed_json and stores nothing', async () => {
    const before = await projectCount();
    const response = await designer.post('/api/projects').set(csrf).set('Content-Type', 'application/json').send('{"name": "half').expect(400);
    expect(response.body.error.code).toBe('malformed_json');
    expectNoInternals(response.text);
    expect(await projectCount()).toBe(before);
  });

  it('answers an oversized JSON body with 413 JSON', async () => {
    const response = await designer.post('/api/projects').set(csrf).send({ name: 'x', description: 'y'.repeat(300 * 1024) }).expect(413);
    expect(response.headers['content-type']).toMatch(/application\/json/);
    expect(response.body.error.code).toBe('payload_too_large');
  });

  it('answers a body that is not JSON with 415', async () => {
    const response = await designer.post('/api/projects').set(csrf).set('Content-Type', 'text/plain').send('name=x').expect(415);
    expect(response.body.error.code).toBe('unsupported_media_type');
  });
});

describe('field validation', () => {
  it('names a field of the wrong type', async () => {
    const response = await designer.post('/api/projects').set(csrf).send({ name: 42 }).expect(400);
    expect(response.body.error).toMatchObject({ code: 'invalid_input', field: 'name' });
  });

  it('refuses unknown fields, naming them', async () => {
    const response = await designer.post('/api/projects').set(csrf).send({ name: 'ok', owner: 'me' }).expect(400);
    expect(response.body.error.field).toBe('owner');
    expect(response.body.error.message).toMatch(/unknown field/);
  });

  it('refuses unknown query parameters, naming them', async () => {
    const response = await designer.get('/api/projects?sort=name').expect(400);
    expect(response.body.error.field).toBe('sort');
  });

  it('refuses huge and non-finite numbers: 1e400 parses to Infinity, ids past INT UNSIGNED', async () => {
    const design = (await designer.post(`/api/projects/${projectId}/designs`).set(csrf).send({ name: 'n', templateId: 'mains-sync' }).expect(201)).body;
    const huge = JSON.stringify({ baseRevision: 1, spec: mainsSyncSpec }).replace(`"clockHz":${mainsSyncSpec.clockHz}`, '"clockHz":1e400');
    expect(huge).toContain('1e400');
    const response = await designer.put(`/api/designs/${design.id}`).set(csrf).set('Content-Type', 'application/json').send(huge).expect(400);
    expect(response.body.error.field).toBe('spec.clockHz');
    const stored = (await designer.get(`/api/designs/${design.id}`).expect(200)).body;
    expect(stored.revision).toBe(1);

    const bigId = await designer.get('/api/designs/99999999999999999999').expect(400);
    expect(bigId.body.error.field).toBe('id');
    await designer.get('/api/designs/12abc').expect(400);
  });

  it('refuses a name with control characters', async () => {
    const response = await designer.post('/api/projects').set(csrf).send({ name: 'bell\u0007' }).expect(400);
    expect(response.body.error.field).toBe('name');
  });
});

describe('injection strings', () => {
  const sql = "Robert'); DROP TABLE projects;-- ";
  const script = '<script>alert("x")</script>';

  it('stores SQL and script text in a title verbatim (parameterised queries, JSON out)', async () => {
    for (const name of [sql.trim(), script, '" OR 1=1 --', '${7*7} {{7*7}}']) {
      const created = (await designer.post('/api/projects').set(csrf).send({ name }).expect(201)).body;
      const read = (await designer.get(`/api/projects/${created.id}`).expect(200)).body;
      expect(read.name).toBe(name);
    }
    const [row] = await testApp.dataSource.query("SELECT COUNT(*) AS n FROM information_schema.tables WHERE table_schema = DATABASE() AND table_name = 'projects'");
    expect(Number(row.n)).toBe(1);
  });

  it('refuses them where the text becomes code: the spec name is an HDL/C identifier', async () => {
    const response = await designer.post(`/api/projects/${projectId}/designs`).set(csrf).send({ name: 'ok', spec: { ...mainsSyncSpec, name: "x'; DROP TABLE designs;--" } }).expect(400);
    expect(response.body.error.field).toBe('spec.name');
  });

  it('treats injection in the sign-in e-mail as a wrong e-mail', async () => {
    const response = await request(testApp.built.app).post('/api/session').set(csrf).send({ email: "' OR '1'='1", password: PASSWORD }).expect(400);
    expect(response.body.error.field).toBe('email');
  });
});

describe('CSRF, unknown routes and headers', () => {
  it('refuses a state-changing request without the X-Requested-With header', async () => {
    const response = await designer.post('/api/projects').send({ name: 'forged' }).expect(403);
    expect(response.body.error.code).toBe('csrf_rejected');
  });

  it('refuses a cross-origin state-changing request even with the header', async () => {
    const response = await designer.post('/api/projects').set(csrf).set('Origin', 'https://evil.example').send({ name: 'forged' }).expect(403);
    expect(response.body.error.code).toBe('csrf_rejected');
  });

  it('accepts a same-origin state-changing request that sends Origin', async () => {
    await designer.post('/api/projects').set(csrf).set('Host', 'loopwright.example.test:8080').set('Origin', 'http://loopwright.example.test:8080').send({ name: 'same origin' }).expect(201);
  });

  it('answers unknown /api routes with 404 JSON', async () => {
    const response = await designer.get('/api/no-such-thing').expect(404);
    expect(response.body.error.code).toBe('not_found');
    await designer.delete('/api/projects').set(csrf).expect(404);
  });

  it('sends helmet security headers and no X-Powered-By', async () => {
    const response = await request(testApp.built.app).get('/api/health');
    expect(response.headers['x-content-type-options']).toBe('nosniff');
    expect(response.headers['content-security-policy']).toBeDefined();
    expect(response.headers['x-powered-by']).toBeUndefined();
  });
});
