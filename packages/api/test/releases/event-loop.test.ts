/**
 * No request stalls the server: a large conformance upload (590,000 rows, 8.3 MB) is parsed and
 * compared in the compute pool, capped at the rows the release's vectors hold, a release cut of a
 * big spec is computed and rendered there too, and so is a million-sample simulation, so /api/health
 * keeps answering meanwhile. Timed loosely (a shared machine): before, each of these held the event
 * loop for seconds. The target is an answer within 100 ms: the median answer is held to it, the
 * slowest only to HEALTH_BOUND_MS.
 */
import { mainsSyncSpec } from '@loopwright/dsp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { csrf, PASSWORD, signedInAgent, type Agent } from '../helpers.ts';
import { releaseFixtures, type ReleaseFixtures } from './fixtures.ts';
import { designFromTemplate, startHandoff, type Handoff, listening } from './handoff.ts';

/** Loose: a blocked event loop held health for 3 s and more; a busy shared machine answers within this. */
const HEALTH_BOUND_MS = 1500;

let h: Handoff;
let fixtures: ReleaseFixtures;
let firmware: Agent;
let server: Awaited<ReturnType<typeof listening>>;
let base: string;
let mainsDesignId: number;

beforeAll(async () => {
  h = await startHandoff();
  mainsDesignId = await designFromTemplate(h.designer, 'mains-sync');
  fixtures = await releaseFixtures(h.built, h.org, mainsDesignId);
  firmware = await signedInAgent(h.built.app, h.org.emails.firmware);
  server = await listening(h.built.app);
  base = server.base;
});

afterAll(async () => {
  await server.close();
  await h.close();
});

/** The issue's target for one /api/health answer while long work runs. */
const HEALTH_TARGET_MS = 100;

/** Polls /api/health until `work` settles; returns the slowest and the median answer in ms, and how many. */
async function healthDuring(work: Promise<unknown>): Promise<{ slowest: number; median: number; answers: number }> {
  let done = false;
  void work.finally(() => (done = true));
  const times: number[] = [];
  while (!done) {
    const t0 = performance.now();
    const res = await fetch(`${base}/api/health`);
    await res.arrayBuffer();
    times.push(performance.now() - t0);
    await new Promise((r) => setTimeout(r, 20));
  }
  const sorted = [...times].sort((a, b) => a - b);
  return { slowest: sorted[sorted.length - 1] ?? 0, median: sorted[Math.floor(sorted.length / 2)] ?? 0, answers: times.length };
}

interface Answer {
  readonly status: number;
  readonly text: string;
  readonly body: Record<string, any>;
}

async function sessionCookie(email: string): Promise<string> {
  const res = await fetch(`${base}/api/session`, { method: 'POST', headers: { 'content-type': 'application/json', ...csrf }, body: JSON.stringify({ email, password: PASSWORD }) });
  expect(res.status).toBe(200);
  return (res.headers.get('set-cookie') ?? '').split(';')[0]!;
}

/** A multipart/form-data body with one file (RFC 7578). */
function multipart(field: string, fileName: string, content: Buffer): { type: string; bytes: Buffer } {
  const boundary = `lw-${Date.now().toString(16)}-boundary`;
  const head = Buffer.from(`--${boundary}\r\nContent-Disposition: form-data; name="${field}"; filename="${fileName}"\r\nContent-Type: text/csv\r\n\r\n`);
  return { type: `multipart/form-data; boundary=${boundary}`, bytes: Buffer.concat([head, content, Buffer.from(`\r\n--${boundary}--\r\n`)]) };
}

/** 590,000 rows in the vector layout, about 8.3 MB (under the 8 MiB upload limit). */
function longCapture(): Buffer {
  const lines = [fixtures.goldenCsv.toString('utf8').split('\n')[0]!];
  for (let n = 0; n < 590_000; n++) lines.push('0,0,0,0,0,0,0');
  return Buffer.from(`${lines.join('\n')}\n`);
}

/** The golden vectors (65 536 rows, 2.9 MB) with every value padded by spaces (accepted) to about 7.5 MB: a full-size compare. */
function paddedGolden(): Buffer {
  const [header, ...rows] = fixtures.goldenCsv.toString('utf8').trimEnd().split('\n');
  const pad = ' '.repeat(10);
  return Buffer.from(`${header}\n${rows.map((r) => r.split(',').map((v) => `${pad}${v}`).join(',')).join('\n')}\n`);
}

describe('while big uploads are compared, a big release is cut and a long simulation runs', () => {
  // The work runs in compute threads at the lowered priority (LW_COMPUTE_NICE): on a machine busy with
  // other work it finishes late; what this test asserts is the health latency meanwhile, not the total time.
  it(`answers /api/health in ${HEALTH_TARGET_MS} ms typically and always within ${HEALTH_BOUND_MS} ms, and gets each answer right`, async () => {
    const long = longCapture();
    const padded = paddedGolden();
    expect(long.length).toBeGreaterThan(8_000_000);
    expect(padded.length).toBeGreaterThan(7_000_000);
    const bigSpec = { ...mainsSyncSpec, name: 'big_tables', nco: { ...mainsSyncSpec.nco, phaseBits: 16, amplitudeBits: 32 }, fixedPoint: { ...mainsSyncSpec.fixedPoint, dataBits: 21 } };
    const project = await h.designer.post('/api/projects').set(csrf).send({ name: 'Big cut' }).expect(201);
    const design = await h.designer.post(`/api/projects/${project.body.id}/designs`).set(csrf).send({ name: 'Big tables', spec: bigSpec }).expect(201);

    const runsBefore = (await firmware.get(`/api/releases/${fixtures.approvedId}/conformance`).expect(200)).body.runs.length as number;
    // The requests are built before the clock starts and sent with fetch, so the test's own work
    // (building 8 MB multipart bodies) does not hold the event loop it shares with the server.
    const firmwareCookie = await sessionCookie(h.org.emails.firmware);
    const designerCookie = await sessionCookie(h.org.emails.designer);
    const uploadBody = (file: Buffer, name: string) => multipart('file', name, file);
    const bodies = [uploadBody(long, 'long.csv'), uploadBody(padded, 'padded.csv'), uploadBody(long, 'long-again.csv')];
    const post = (path: string, cookie: string, body?: { type: string; bytes: Buffer }) =>
      fetch(`${base}${path}`, { method: 'POST', headers: { cookie, ...csrf, ...(body ? { 'content-type': body.type } : {}) }, body: body?.bytes }).then(async (r) => ({ status: r.status, text: await r.text() }));
    const uploadPath = `/api/releases/${fixtures.approvedId}/conformance`;
    // A million loop samples (100 s at the 10 kHz update rate), float and bit-true.
    const simulation = { type: 'application/json', bytes: Buffer.from(JSON.stringify({ scenario: { kind: 'frequency-step', stepHz: 0.5, atS: 1, durationS: 100 }, mode: 'both' })) };
    const work = Promise.all([
      post(uploadPath, firmwareCookie, bodies[0]),
      post(uploadPath, firmwareCookie, bodies[1]),
      post(`/api/designs/${design.body.id}/releases`, designerCookie),
      post(`/api/designs/${mainsDesignId}/simulations`, designerCookie, simulation),
      post(uploadPath, firmwareCookie, bodies[2]),
    ]).then((answers) => answers.map((a) => ({ ...a, body: JSON.parse(a.text) as Record<string, any> })));
    const health = await healthDuring(work);
    const [tooLong, bitExact, cut, simulated, tooLongAgain] = (await work) as [Answer, Answer, Answer, Answer, Answer];
    expect(health.answers).toBeGreaterThan(10);
    expect(health.median, 'median /api/health answer (ms)').toBeLessThan(HEALTH_TARGET_MS);
    expect(health.slowest, 'slowest /api/health answer (ms)').toBeLessThan(HEALTH_BOUND_MS);
    expect(simulated.status, simulated.text.slice(0, 300)).toBe(200);
    expect(simulated.body.simulation.sampleCount).toBe(1_000_000);
    expect(simulated.body.simulation.bitTrue.checksum).toEqual(expect.any(Number));

    expect(tooLong.status, tooLong.text.slice(0, 300)).toBe(400);
    expect(tooLong.body.error.field).toBe('file');
    expect(tooLong.body.error.message).toMatch(/line 65538: .*65,536 samples/);
    expect(tooLongAgain.status).toBe(400);
    expect(bitExact.status, bitExact.text.slice(0, 300)).toBe(201);
    expect(bitExact.body).toMatchObject({ verdict: 'bit-exact', samplesCompared: 65536, mismatchCount: 0 });
    expect(cut.status, cut.text.slice(0, 300)).toBe(201);
    // Only the readable capture is stored as a run.
    expect((await firmware.get(`/api/releases/${fixtures.approvedId}/conformance`).expect(200)).body.runs).toHaveLength(runsBefore + 1);
  }, 180_000);
});
