import { ifFmDemodSpec, mainsSyncSpec, parseLoopSpec } from '@loopwright/dsp';
import { beforeAll, describe, expect, it } from 'vitest';
import { createTestOrg, csrf, designerWithProject, signedInAgent, useTestApp, type Agent, type TestOrg } from './helpers.ts';

const testApp = useTestApp();
let org: TestOrg;
let designer: Agent;
let projectId: number;

beforeAll(async () => {
  ({ org, designer, projectId } = await designerWithProject(testApp, 'Designs under test'));
});

async function createDesign(body: object = { name: 'A loop', templateId: 'mains-sync' }) {
  return (await designer.post(`/api/projects/${projectId}/designs`).set(csrf).send(body).expect(201)).body;
}

async function auditActions(objectType: string, objectId: number): Promise<string[]> {
  const rows: { action: string }[] = await testApp.dataSource.query('SELECT action FROM audit_entries WHERE objectType = ? AND objectId = ? ORDER BY id', [objectType, String(objectId)]);
  return rows.map((row) => row.action);
}

describe('projects', () => {
  it('creates, renames, archives and restores a project, each step audited', async () => {
    const created = (await designer.post('/api/projects').set(csrf).send({ name: 'Resolver loop', description: 'Angle tracking' }).expect(201)).body;
    expect(created).toMatchObject({ name: 'Resolver loop', archived: false, designCount: 0 });
    await designer.patch(`/api/projects/${created.id}`).set(csrf).send({ name: 'Resolver tracking loop' }).expect(200);
    const archived = (await designer.patch(`/api/projects/${created.id}`).set(csrf).send({ archived: true }).expect(200)).body;
    expect(archived).toMatchObject({ name: 'Resolver tracking loop', archived: true });

    const active = (await designer.get('/api/projects').expect(200)).body.projects.map((p: { id: number }) => p.id);
    expect(active).not.toContain(created.id);
    const all = (await designer.get('/api/projects?archived=all').expect(200)).body.projects.map((p: { id: number }) => p.id);
    expect(all).toContain(created.id);

    await designer.patch(`/api/projects/${created.id}`).set(csrf).send({ archived: false }).expect(200);
    expect(await auditActions('project', created.id)).toEqual(['project.create', 'project.update', 'project.archive', 'project.restore']);
  });

  it('refuses new designs in an archived project with 409', async () => {
    const project = (await designer.post('/api/projects').set(csrf).send({ name: 'Archived one' }).expect(201)).body;
    await designer.patch(`/api/projects/${project.id}`).set(csrf).send({ archived: true }).expect(200);
    const response = await designer.post(`/api/projects/${project.id}/designs`).set(csrf).send({ name: 'x' }).expect(409);
    expect(response.body.error.code).toBe('conflict');
  });

  it("does not show another organisation's projects", async () => {
    const other = await createTestOrg(testApp.dataSource);
    const stranger = await signedInAgent(testApp.built.app, other.emails.designer);
    await stranger.get(`/api/projects/${projectId}`).expect(404);
    await stranger.get(`/api/projects/${projectId}/designs`).expect(404);
    const list = (await stranger.get('/api/projects').expect(200)).body.projects;
    expect(list).toEqual([]);
  });
});

describe('designs', () => {
  it('creates a blank design with a valid spec named after the title', async () => {
    const design = await createDesign({ name: 'Blank carrier loop' });
    expect(design.revision).toBe(1);
    expect(design.spec.name).toBe('blank_carrier_loop');
    expect(parseLoopSpec(design.spec).ok).toBe(true);
  });

  it('creates a design from a template of the demo scenario', async () => {
    const design = await createDesign({ name: 'FM', templateId: 'if-fm-demod' });
    expect(design.spec).toEqual(ifFmDemodSpec);
  });

  it('refuses an unknown template naming templateId', async () => {
    const response = await designer.post(`/api/projects/${projectId}/designs`).set(csrf).send({ name: 'x', templateId: 'no-such' }).expect(400);
    expect(response.body.error.field).toBe('templateId');
  });

  it('updates with the current revision and bumps it; a stale revision gets 409 with the current design', async () => {
    const design = await createDesign();
    const spec = { ...design.spec, centerHz: 60 };
    const updated = (await designer.put(`/api/designs/${design.id}`).set(csrf).send({ baseRevision: 1, spec }).expect(200)).body;
    expect(updated).toMatchObject({ revision: 2, spec: { centerHz: 60 } });

    const stale = await designer.put(`/api/designs/${design.id}`).set(csrf).send({ baseRevision: 1, name: 'Lost edit' }).expect(409);
    expect(stale.body.error).toMatchObject({ code: 'stale_revision', field: 'baseRevision' });
    expect(stale.body.error.current).toMatchObject({ id: design.id, revision: 2, name: design.name, spec: { centerHz: 60 } });
    const stored = (await designer.get(`/api/designs/${design.id}`).expect(200)).body;
    expect(stored.name).toBe(design.name);
    expect(await auditActions('design', design.id)).toEqual(['design.create', 'design.update']);
  });

  it('logs which spec fields an edit changed, with the old and new value of each', async () => {
    const design = await createDesign();
    const spec = { ...design.spec, centerHz: 60, fixedPoint: { ...design.spec.fixedPoint, coefficientBits: design.spec.fixedPoint.coefficientBits + 1 } };
    await designer.put(`/api/designs/${design.id}`).set(csrf).send({ baseRevision: 1, spec, name: 'Renamed loop' }).expect(200);
    const rows: { detailJson: string }[] = await testApp.dataSource.query("SELECT detailJson FROM audit_entries WHERE objectType = 'design' AND objectId = ? AND action = 'design.update'", [String(design.id)]);
    const detail = JSON.parse(rows[0]!.detailJson);
    expect(detail).toMatchObject({ baseRevision: 1, name: { from: design.name, to: 'Renamed loop' } });
    expect(detail.specChanges).toEqual([
      { field: 'centerHz', from: design.spec.centerHz, to: 60 },
      { field: 'fixedPoint.coefficientBits', from: design.spec.fixedPoint.coefficientBits, to: design.spec.fixedPoint.coefficientBits + 1 },
    ]);
  });

  it('lets exactly one of two concurrent updates from the same revision win', async () => {
    const design = await createDesign();
    const [a, b] = await Promise.all([
      designer.put(`/api/designs/${design.id}`).set(csrf).send({ baseRevision: 1, name: 'Edit A' }),
      designer.put(`/api/designs/${design.id}`).set(csrf).send({ baseRevision: 1, name: 'Edit B' }),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 409]);
  });

  it('refuses an invalid spec on update naming the field, and keeps the stored one', async () => {
    const design = await createDesign();
    const response = await designer
      .put(`/api/designs/${design.id}`)
      .set(csrf)
      .send({ baseRevision: 1, spec: { ...design.spec, filter: { kind: 'pi', tau1S: -1, tau2S: 0.01 } } })
      .expect(400);
    expect(response.body.error.field).toBe('spec.filter.tau1S');
    const stored = (await designer.get(`/api/designs/${design.id}`).expect(200)).body;
    expect(stored).toMatchObject({ revision: 1, spec: design.spec });
  });

  it('duplicates a design as a new one at revision 1', async () => {
    const design = await createDesign();
    const copy = (await designer.post(`/api/designs/${design.id}/duplicate`).set(csrf).send({}).expect(201)).body;
    expect(copy.id).not.toBe(design.id);
    expect(copy).toMatchObject({ name: `${design.name} (copy)`, revision: 1, spec: design.spec });
  });

  it('archives a design out of the default list, refuses edits while archived, and duplicates it as an active copy', async () => {
    const design = await createDesign({ name: 'Old mains loop', templateId: 'mains-sync' });
    const archived = (await designer.patch(`/api/designs/${design.id}`).set(csrf).send({ archived: true }).expect(200)).body;
    expect(archived).toMatchObject({ archived: true, revision: 1, spec: design.spec });
    const ids = async (query: string) => (await designer.get(`/api/projects/${projectId}/designs${query}`).expect(200)).body.designs.map((d: { id: number }) => d.id);
    expect(await ids('')).not.toContain(design.id);
    expect(await ids('?archived=true')).toContain(design.id);
    expect(await ids('?archived=all')).toContain(design.id);

    const refused = await designer.put(`/api/designs/${design.id}`).set(csrf).send({ baseRevision: 1, spec: { ...design.spec, centerHz: 60 } }).expect(409);
    expect(refused.body.error).toMatchObject({ code: 'conflict', field: 'archived' });
    expect((await designer.get(`/api/designs/${design.id}`).expect(200)).body).toMatchObject({ revision: 1, spec: { centerHz: design.spec.centerHz } });

    const copy = (await designer.post(`/api/designs/${design.id}/duplicate`).set(csrf).send({ name: 'New mains loop' }).expect(201)).body;
    expect(copy).toMatchObject({ name: 'New mains loop', archived: false, revision: 1, spec: design.spec });
    expect(await ids('')).toContain(copy.id);
    expect(await auditActions('design', design.id)).toEqual(['design.create', 'design.archive']);
  });

  it('refuses an archive request without a boolean, naming archived', async () => {
    const design = await createDesign();
    const response = await designer.patch(`/api/designs/${design.id}`).set(csrf).send({ archived: 'yes' }).expect(400);
    expect(response.body.error.field).toBe('archived');
    const list = await designer.get(`/api/projects/${projectId}/designs?archived=maybe`).expect(400);
    expect(list.body.error.field).toBe('archived');
  });

  it('deletes a design without releases and answers 404 afterwards', async () => {
    const design = await createDesign();
    await designer.delete(`/api/designs/${design.id}`).set(csrf).expect(204);
    await designer.get(`/api/designs/${design.id}`).expect(404);
    expect(await auditActions('design', design.id)).toEqual(['design.create', 'design.delete']);
  });

  it('refuses to delete a design a deletion guard protects, keeping it', async () => {
    const design = await createDesign();
    testApp.built.services.designs.addDeletionGuard(async (id) => (id === design.id ? 'it has releases' : null));
    const response = await designer.delete(`/api/designs/${design.id}`).set(csrf).expect(409);
    expect(response.body.error.message).toMatch(/releases/);
    await designer.get(`/api/designs/${design.id}`).expect(200);
  });
});

describe('designs as files', () => {
  it('downloads the spec as a JSON attachment that parses back to the same spec', async () => {
    const design = await createDesign({ name: 'Download me', spec: mainsSyncSpec });
    const response = await designer.get(`/api/designs/${design.id}/spec.json`).expect(200);
    expect(response.headers['content-disposition']).toBe(`attachment; filename=${mainsSyncSpec.name}.spec.json`);
    expect(JSON.parse(response.text)).toEqual(mainsSyncSpec);
  });

  it('creates a design from an uploaded spec file', async () => {
    const file = Buffer.from(JSON.stringify(ifFmDemodSpec));
    const response = await designer.post(`/api/projects/${projectId}/designs/upload`).set(csrf).attach('file', file, 'fm.json').expect(201);
    expect(response.body).toMatchObject({ name: ifFmDemodSpec.name, spec: ifFmDemodSpec, revision: 1 });
  });

  it('refuses an uploaded spec with a bad field, naming it, and stores nothing', async () => {
    const before = (await designer.get(`/api/projects/${projectId}/designs`).expect(200)).body.designs.length;
    const bad = { ...ifFmDemodSpec, nco: { ...ifFmDemodSpec.nco, phaseBits: 'twelve' } };
    const response = await designer.post(`/api/projects/${projectId}/designs/upload`).set(csrf).attach('file', Buffer.from(JSON.stringify(bad)), 'bad.json').expect(400);
    expect(response.body.error).toMatchObject({ code: 'invalid_input', field: 'file.nco.phaseBits' });
    expect(response.body.error.message).toMatch(/nco\.phaseBits/);
    const after = (await designer.get(`/api/projects/${projectId}/designs`).expect(200)).body.designs.length;
    expect(after).toBe(before);
  });

  it('refuses an upload that is not JSON, naming the file field', async () => {
    const response = await designer.post(`/api/projects/${projectId}/designs/upload`).set(csrf).attach('file', Buffer.from('{"specVersion": 1,'), 'broken.json').expect(400);
    expect(response.body.error).toMatchObject({ code: 'invalid_input', field: 'file' });
  });

  it('puts a refused upload in the audit trail: who, which file, why', async () => {
    await designer.post(`/api/projects/${projectId}/designs/upload`).set(csrf).attach('file', Buffer.from('{"specVersion": 1,'), 'refused-upload.json').expect(400);
    const rows: { actorEmail: string; detailJson: string }[] = await testApp.dataSource.query("SELECT actorEmail, detailJson FROM audit_entries WHERE action = 'design.upload-rejected' AND objectType = 'project' AND objectId = ?", [String(projectId)]);
    const refused = rows.map((r) => ({ who: r.actorEmail, ...JSON.parse(r.detailJson) })).find((d) => d.fileName === 'refused-upload.json');
    expect(refused).toMatchObject({ who: org.emails.designer, field: 'file', sizeBytes: 18 });
    expect(refused.reason).toMatch(/not valid JSON/);
  });

  it('refuses an oversized upload with 413 JSON', async () => {
    const big = Buffer.alloc(300 * 1024, 0x20);
    const response = await designer.post(`/api/projects/${projectId}/designs/upload`).set(csrf).attach('file', big, 'big.json').expect(413);
    expect(response.body.error.code).toBe('payload_too_large');
  });

  it('refuses an upload without a file, naming the field', async () => {
    const response = await designer.post(`/api/projects/${projectId}/designs/upload`).set(csrf).field('name', 'no file').expect(400);
    expect(response.body.error.field).toBe('file');
  });
});
