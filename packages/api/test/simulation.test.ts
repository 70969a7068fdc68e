import { mainsSyncSpec, simulate } from '@loopwright/dsp';
import { beforeAll, describe, expect, it } from 'vitest';
import { expectDeepClose } from './close.ts';
import { typedArraysAsArrays } from './typedArraysAsArrays.ts';
import { createTestOrg, csrf, signedInAgent, testConfig, useTestApp, type Agent, type TestOrg } from './helpers.ts';

// Two compute threads, so a 'both' run is split over them (services/compute.ts runSimulation) where the machine has two cores.
const testApp = useTestApp(testConfig({ LW_SIM_MAX_SAMPLES: '100000', LW_SIM_THREADS: '2' }));
let org: TestOrg;
let reviewer: Agent;
let designId: number;

// 0.5 s at the 10 kHz loop rate of the mains example: 5000 samples, quick in a test.
const scenario = { kind: 'frequency-step', stepHz: 0.5, atS: 0.1, durationS: 0.5 } as const;

beforeAll(async () => {
  org = await createTestOrg(testApp.dataSource);
  const designer = await signedInAgent(testApp.built.app, org.emails.designer);
  reviewer = await signedInAgent(testApp.built.app, org.emails.reviewer);
  const project = (await designer.post('/api/projects').set(csrf).send({ name: 'Simulations' }).expect(201)).body;
  designId = (await designer.post(`/api/projects/${project.id}/designs`).set(csrf).send({ name: 'Mains', spec: mainsSyncSpec }).expect(201)).body.id;
});

describe('simulations in the worker pool', () => {
  it('simulates a stored design and returns what packages/dsp simulate computes, float and bit-true', async () => {
    const response = await reviewer.post(`/api/designs/${designId}/simulations`).set(csrf).send({ scenario }).expect(200);
    expect(response.body).toMatchObject({ designId, revision: 1, scenario });
    const expected = JSON.parse(typedArraysAsArrays(simulate(mainsSyncSpec, scenario, { mode: 'both', buckets: 1000 })));
    expectDeepClose(response.body.simulation, expected);
    expect(response.body.simulation.float).toBeDefined();
    expect(response.body.simulation.bitTrue).toBeDefined();
    // Encoded by the compute thread (src/encodedJson.ts), sent as res.json sends: its header, and JSON.stringify's text of the members in this order, traces as arrays.
    expect(response.headers['content-type']).toBe('application/json; charset=utf-8');
    expect(Object.keys(response.body)).toEqual(['scenario', 'simulation', 'designId', 'revision']);
    expect(response.text).toBe(JSON.stringify(response.body));
    // Split or not, the bytes of the sequential run.
    expect(response.text).toContain(`"simulation":${typedArraysAsArrays(simulate(mainsSyncSpec, scenario, { mode: 'both', buckets: 1000 }))},`);
    expect(response.body.simulation.float.traces.phaseErrorRad.min).toHaveLength(1000);
  });

  it('simulates an unsaved spec from the body', async () => {
    const response = await reviewer.post('/api/simulations').set(csrf).send({ spec: mainsSyncSpec, scenario, mode: 'float', buckets: 50 }).expect(200);
    expect(response.body.simulation.float).toBeDefined();
    expect(response.body.simulation.bitTrue).toBeUndefined();
  });

  it('names the scenario field that is wrong', async () => {
    const response = await reviewer.post(`/api/designs/${designId}/simulations`).set(csrf).send({ scenario: { kind: 'tone', offsetHz: 'near', durationS: 0.1 } }).expect(400);
    expect(response.body.error).toMatchObject({ code: 'invalid_input', field: 'scenario.offsetHz' });
  });

  it('refuses a simulation longer than the per-request sample budget, naming durationS', async () => {
    // 100 000 samples allowed in this app; 20 s at 10 kHz is 200 000.
    const response = await reviewer.post(`/api/designs/${designId}/simulations`).set(csrf).send({ scenario: { ...scenario, durationS: 20 } }).expect(400);
    expect(response.body.error.field).toBe('scenario.durationS');
  });

  it('simulates a sweep and reports where lock was lost and regained, float and bit-true (dsp README "Sweep")', async () => {
    const sweep = { kind: 'sweep', fromHz: 0, toHz: 3, rateHzPerS: 3, durationS: 2.2 };
    const response = await reviewer.post(`/api/designs/${designId}/simulations`).set(csrf).send({ scenario: sweep, buckets: 50 }).expect(200);
    const { float, bitTrue } = response.body.simulation;
    // 3 Hz is far inside the PI loop's pull-out range (≈ 14 Hz measured): both loops hold (G3).
    expect(float.metrics.sweep).toMatchObject({ turnS: 1, heldThroughout: true, lockLostHz: null });
    expect(bitTrue.metrics.sweep.heldThroughout).toBe(true);
    expect(float.traces.inputFrequencyHz.max).toHaveLength(50);
    expect(float.traces.inputFrequencyHz.max.every((x: unknown) => typeof x === 'number')).toBe(true);
  });

    it('runs the simulation in a worker thread', async () => {
    const outcome = await testApp.built.services.compute.run({ kind: 'simulation', spec: mainsSyncSpec, scenario, options: { mode: 'float' } });
    expect(outcome.ok).toBe(true);
    expect(outcome.threadId).not.toBe(0);
  });
});
