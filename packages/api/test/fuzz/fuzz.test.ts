/**
 * A bounded, seeded fuzz of the HTTP routes that read a spec or a scenario: 2,000 mutated specs
 * (analysis, design create and update) and 400 mutated scenarios (simulations of an unsaved spec and
 * of a stored design). Every answer must be a 2xx or a 4xx — never a 5xx — hold no "undefined" or
 * "NaN" in its body, and come within 5 s. The seed fixes every document, so a failure replays exactly.
 * The app runs with LW_SIM_MAX_SAMPLES at 200,000 loop samples, so a mutated duration is refused
 * rather than simulated for seconds (the limit is the server's; the fuzz checks it holds).
 */
import { exampleSpecs } from '@loopwright/dsp';
import { beforeAll, describe, expect, it } from 'vitest';
import { csrf, designerWithProject, testConfig, useTestApp, type Agent } from '../helpers.ts';
import { draws, mutated } from './mutate.ts';

const SEED = 20_261_202;
const SPECS = 2000;
const SCENARIOS = 400;
const CONCURRENCY = 4;
const SLOW_MS = 5000;

const t = useTestApp(testConfig({ LW_SIM_MAX_SAMPLES: '200000' }));
let designer: Agent;
let projectId: number;
/** A stored design per example spec, for updates and stored-design simulations. */
const stored: { id: number; revision: number }[] = [];

beforeAll(async () => {
  ({ designer, projectId } = await designerWithProject(t, 'Fuzz'));
  for (const e of exampleSpecs) {
    const res = await designer.post(`/api/projects/${projectId}/designs`).set(csrf).send({ name: `Fuzz ${e.id}`, spec: e.spec }).expect(201);
    stored.push({ id: res.body.id, revision: res.body.revision });
  }
});

interface Call {
  readonly what: string;
  readonly send: () => PromiseLike<{ status: number; text: string }>;
}

interface Finding {
  readonly what: string;
  readonly status: number;
  readonly ms: number;
  readonly body: string;
}

/** Runs the calls `CONCURRENCY` at a time; returns every answer that breaks a rule. */
async function runAll(calls: readonly Call[]): Promise<{ findings: Finding[]; statuses: Map<number, number> }> {
  const findings: Finding[] = [];
  const statuses = new Map<number, number>();
  let next = 0;
  const lane = async () => {
    while (next < calls.length) {
      const call = calls[next++]!;
      const t0 = performance.now();
      const res = await call.send();
      const ms = performance.now() - t0;
      statuses.set(res.status, (statuses.get(res.status) ?? 0) + 1);
      if (res.status >= 500 || /undefined|NaN/.test(res.text) || ms > SLOW_MS) findings.push({ what: call.what, status: res.status, ms: Math.round(ms), body: res.text.slice(0, 400) });
    }
  };
  await Promise.all(Array.from({ length: CONCURRENCY }, lane));
  return { findings, statuses };
}

const baseSpecs = exampleSpecs.map((e) => e.spec);

/** Sends `value` as JSON text, whatever it is (a mutation may have made the body a number or null). */
const postJson = (path: string, value: unknown) => designer.post(path).set(csrf).set('content-type', 'application/json').send(JSON.stringify(value));

describe('fuzzed specs', () => {
  it(`${SPECS} mutated specs through analysis, design create and design update: no 5xx, no undefined/NaN, none over ${SLOW_MS / 1000} s`, async () => {
    const specs = draws(mutated(baseSpecs), SPECS, SEED);
    const calls = specs.map((spec, i): Call => {
      const target = stored[i % stored.length]!;
      const json = JSON.stringify(spec);
      switch (i % 4) {
        case 0:
        case 1:
          return { what: `POST /api/analysis ${json}`, send: () => postJson('/api/analysis', { spec }) };
        case 2:
          return { what: `POST /api/projects/:id/designs ${json}`, send: () => postJson(`/api/projects/${projectId}/designs`, { name: `Fuzzed ${i}`, spec }) };
        default:
          // A stale revision is answered 409 without validating, so read the current one first.
          return {
            what: `PUT /api/designs/:id ${json}`,
            send: async () => {
              const current = await designer.get(`/api/designs/${target.id}`);
              return designer.put(`/api/designs/${target.id}`).set(csrf).set('content-type', 'application/json').send(JSON.stringify({ baseRevision: current.body.revision, spec }));
            },
          };
      }
    });
    const { findings, statuses } = await runAll(calls);
    expect(findings, JSON.stringify(findings.slice(0, 5), null, 2)).toEqual([]);
    // The fuzz reaches both sides: accepted specs and refused ones.
    expect(statuses.get(200) ?? 0).toBeGreaterThan(SPECS / 20);
    expect(statuses.get(400) ?? 0).toBeGreaterThan(SPECS / 5);
  });
});

const baseScenarios = [
  { scenario: { kind: 'tone', offsetHz: 2, durationS: 0.5, snrDb: 30, seed: 7 }, mode: 'both', buckets: 200 },
  { scenario: { kind: 'frequency-step', stepHz: 5, atS: 0.1, durationS: 0.5, initialPhaseDeg: 20 }, mode: 'bit-true', buckets: 100 },
  { scenario: { kind: 'phase-step', stepDeg: 45, atS: 0.05, durationS: 0.3 }, mode: 'float', buckets: 1000 },
  { scenario: { kind: 'fm', modulation: 'triangle', rateHz: 2, deviationHz: 3, durationS: 1 }, mode: 'both', buckets: 500 },
];

describe('fuzzed scenarios', () => {
  it(`${SCENARIOS} mutated scenarios through both simulation routes: no 5xx, no undefined/NaN, none over ${SLOW_MS / 1000} s`, async () => {
    const requests = draws(mutated(baseScenarios), SCENARIOS, SEED + 1);
    const mains = baseSpecs[0]!;
    const calls = requests.map((body, i): Call => {
      const json = JSON.stringify(body);
      if (i % 2 === 0) {
        const withSpec = body !== null && typeof body === 'object' && !Array.isArray(body) ? { ...body, spec: mains } : body;
        return { what: `POST /api/simulations ${json}`, send: () => postJson('/api/simulations', withSpec) };
      }
      return { what: `POST /api/designs/:id/simulations ${json}`, send: () => postJson(`/api/designs/${stored[0]!.id}/simulations`, body) };
    });
    const { findings, statuses } = await runAll(calls);
    expect(findings, JSON.stringify(findings.slice(0, 5), null, 2)).toEqual([]);
    expect(statuses.get(200) ?? 0).toBeGreaterThan(SCENARIOS / 20);
    expect(statuses.get(400) ?? 0).toBeGreaterThan(SCENARIOS / 5);
  });
});
