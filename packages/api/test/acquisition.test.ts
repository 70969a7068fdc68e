/**
 * Measured acquisition through the API: the compute pool runs dsp's measureAcquisition beside the
 * analysis's estimates (compareAcquisition), as plain JSON or as an NDJSON stream of progress lines
 * ending with the result; a cancelled request stops its worker.
 */
import { compareAcquisition, ifFmDemodSpec, measureAcquisition, planDesign, requireValidSpec } from '@loopwright/dsp';
import { beforeAll, describe, expect, it } from 'vitest';
import { expectDeepClose } from './close.ts';
import { createTestOrg, csrf, signedInAgent, useTestApp, type Agent } from './helpers.ts';

const testApp = useTestApp();
let reviewer: Agent;
let firmware: Agent;
let designId: number;
// The IF demodulator's search is the quickest of the demo specs (≈ 0.4·10^6 loop samples).
const spec = ifFmDemodSpec;

beforeAll(async () => {
  const org = await createTestOrg(testApp.dataSource);
  const designer = await signedInAgent(testApp.built.app, org.emails.designer);
  reviewer = await signedInAgent(testApp.built.app, org.emails.reviewer);
  firmware = await signedInAgent(testApp.built.app, org.emails.firmware);
  const project = (await designer.post('/api/projects').set(csrf).send({ name: 'Acquisition' }).expect(201)).body;
  designId = (await designer.post(`/api/projects/${project.id}/designs`).set(csrf).send({ name: 'IF', spec }).expect(201)).body.id;
});

/** supertest's parser for a body it does not know: the NDJSON text as it came. */
const ndjson = (res: import('supertest').Response, done: (err: Error | null, body: unknown) => void) => {
  const stream = res as unknown as NodeJS.ReadableStream;
  let text = '';
  stream.setEncoding('utf8');
  stream.on('data', (chunk: string) => (text += chunk));
  stream.on('end', () => done(null, text));
};

describe('acquisition in the worker pool', () => {
  it("answers a stored design with what dsp's compareAcquisition computes, estimate and measured side by side", async () => {
    const response = await reviewer.post(`/api/designs/${designId}/acquisitions`).set(csrf).expect(200);
    expect(response.body).toMatchObject({ designId, revision: 1 });
    const expected = JSON.parse(JSON.stringify(compareAcquisition(planDesign(requireValidSpec(spec)).analysis.estimates, measureAcquisition(spec))));
    expectDeepClose(response.body.acquisition, expected);
    expect(response.body.acquisition.figures.map((f: { estimate: { label: string }; measured: { label: string } }) => [f.estimate.label, f.measured.label])).toEqual(
      Array(4).fill(['estimate', 'simulated']),
    );
  });

  it('streams progress lines and then the result when asked for NDJSON', async () => {
    const response = await reviewer.post('/api/acquisitions').set(csrf).set('Accept', 'application/x-ndjson').send({ spec }).buffer(true).parse(ndjson).expect(200);
    expect(response.headers['content-type']).toMatch(/application\/x-ndjson/);
    const lines = (response.body as string).trimEnd().split('\n').map((l) => JSON.parse(l) as { type: string; fraction?: number });
    const progress = lines.filter((l) => l.type === 'progress').map((l) => l.fraction!);
    expect(progress.length).toBeGreaterThan(3);
    expect(progress).toEqual([...progress].sort((a, b) => a - b));
    expect(progress.at(-1)).toBe(1);
    expect(lines.at(-1)!.type).toBe('result');
    expect(lines.filter((l) => l.type === 'result')).toHaveLength(1);
  });

  it('names the spec field that is wrong with an ordinary 400, streaming or not', async () => {
    for (const accept of ['application/json', 'application/x-ndjson']) {
      const response = await reviewer.post('/api/acquisitions').set(csrf).set('Accept', accept).send({ spec: { ...spec, centerHz: -1 } }).expect(400);
      expect(response.body.error).toMatchObject({ code: 'invalid_input', field: 'spec.centerHz' });
    }
  });

  it('is for designers and reviewers', async () => {
    await firmware.post(`/api/designs/${designId}/acquisitions`).set(csrf).expect(403);
  });

  it('runs in a worker thread and stops when cancelled mid-search', async () => {
    const outcome = await testApp.built.services.compute.run({ kind: 'acquisition', spec });
    expect(outcome.ok).toBe(true);
    expect(outcome.threadId).not.toBe(0);
    const controller = new AbortController();
    const seen: number[] = [];
    const run = testApp.built.services.analysis.measureAcquisition(spec, controller.signal, (f) => {
      seen.push(f);
      controller.abort();
    });
    await expect(run).rejects.toThrow(/abort/i);
    expect(seen.length).toBeGreaterThan(0);
    expect(seen[0]).toBeLessThan(1);
  });
});
