import { analyzeDesign, mainsSyncSpec, ultrasonicSinglePoleSpec } from '@loopwright/dsp';
import { beforeAll, describe, expect, it } from 'vitest';
import { expectDeepClose } from './close.ts';
import { createTestOrg, csrf, signedInAgent, useTestApp, type Agent, type TestOrg } from './helpers.ts';

const testApp = useTestApp();
let org: TestOrg;
let designer: Agent;

beforeAll(async () => {
  org = await createTestOrg(testApp.dataSource);
  designer = await signedInAgent(testApp.built.app, org.emails.designer);
});

describe('analysis on the server, in worker threads', () => {
  it('POST /api/analysis returns what packages/dsp analyzeDesign computes, from a worker thread (TypeScript loaded by tsx)', async () => {
    const response = await designer.post('/api/analysis').set(csrf).send({ spec: mainsSyncSpec }).expect(200);
    // Equivalence with the library called in-process: the API adds transport, never its own numbers.
    expectDeepClose(response.body.analysis, JSON.parse(JSON.stringify(analyzeDesign(mainsSyncSpec))));
    expect(testApp.built.services.compute.threadCount).toBeGreaterThan(0);
  });

  it("POST /api/designs/:id/analysis analyses the stored design and says which revision", async () => {
    const project = await designer.post('/api/projects').set(csrf).send({ name: 'Analysis project' }).expect(201);
    const design = await designer.post(`/api/projects/${project.body.id}/designs`).set(csrf).send({ name: 'Tracker', spec: ultrasonicSinglePoleSpec }).expect(201);
    const response = await designer.post(`/api/designs/${design.body.id}/analysis`).set(csrf).expect(200);
    expect(response.body).toMatchObject({ designId: design.body.id, revision: 1 });
    expectDeepClose(response.body.analysis, JSON.parse(JSON.stringify(analyzeDesign(ultrasonicSinglePoleSpec))));
  });

  it('answers 400 naming the spec field when the spec is invalid', async () => {
    const spec = { ...mainsSyncSpec, sampleRateHz: 'fast' };
    const response = await designer.post('/api/analysis').set(csrf).send({ spec }).expect(400);
    expect(response.body.error).toMatchObject({ code: 'invalid_input', field: 'spec.sampleRateHz' });
  });

  it('computes in a worker thread, not on the main event loop', async () => {
    const outcome = await testApp.built.services.compute.run({ kind: 'analysis', spec: ultrasonicSinglePoleSpec });
    expect(outcome.ok).toBe(true);
    expect(outcome.threadId).not.toBe(0);
  });
});
