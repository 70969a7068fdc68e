/**
 * API processes killed (SIGKILL) on the real stack: two serving processes behind nginx.
 *
 * - Under load (several clients creating and listing projects), one process dies: the requests that
 *   were acknowledged are all stored, nginx sends the traffic to the other process at once, only
 *   requests that were in flight on the dead process can fail, and the supervisor starts it again.
 * - A review decision half-made when its process dies (the link already marked used and the release
 *   approved inside the open transaction) leaves the link unused: after the restart it decides once,
 *   and only once, whichever process serves it.
 * - nginx itself killed: its worker, which outlives a SIGKILLed master and holds the port, is ended
 *   and the balancer started again.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { afterProcess, api, apiSignIn, waitForVerdict, type ApiAnswer } from '../e2e/harness/api.ts';
import { ROOT } from '../e2e/harness/paths.ts';
import { childrenOf } from '../e2e/harness/server.ts';
import { startStack, type Stack } from '../e2e/harness/stack.ts';
import { connect, waitForStatement } from './harness/sql.ts';
import { backendPorts, designIdOf, gone } from './harness/probes.ts';

let stack: Stack;
let cookie: string;

beforeAll(async () => {
  stack = await startStack({ app: false, dataDir: path.join(ROOT, '.data', `fault-process-${process.pid}`) });
  cookie = (await apiSignIn(stack.baseUrl, 'designer@example.test')).cookie;
});

afterAll(async () => {
  await stack?.stop();
});

interface Outcome {
  readonly kind: 'create' | 'list';
  readonly name: string | null;
  readonly startedAt: number;
  readonly endedAt: number;
  readonly status: number;
  readonly process: string | null;
}

const CLIENTS = 8;
/** No request may wait longer than this (a hung request fails the test instead of hanging it). */
const ANSWER_TIMEOUT_MS = 30_000;

async function timed(kind: Outcome['kind'], name: string | null, call: () => Promise<ApiAnswer>): Promise<Outcome> {
  const startedAt = performance.now();
  const answer = await call().catch(() => ({ status: 0, process: null }));
  return { kind, name, startedAt, endedAt: performance.now(), status: answer.status, process: answer.process };
}

/** One client: create a project, list the projects, again, until told to stop. */
async function client(id: number, running: () => boolean, out: Outcome[]): Promise<void> {
  for (let i = 0; running(); i += 1) {
    const name = `Load ${id}-${i}`;
    const signal = AbortSignal.timeout(ANSWER_TIMEOUT_MS);
    out.push(await timed('create', name, () => api(stack.baseUrl, '/api/projects', { cookie, json: { name }, signal })));
    out.push(await timed('list', null, () => api(stack.baseUrl, '/api/projects', { cookie, signal })));
  }
}

describe('an API process killed', () => {
  it('under load loses no acknowledged request: nginx moves the traffic to the other process and the supervisor starts the dead one again', async () => {
    const outcomes: Outcome[] = [];
    let load = true;
    const clients = Array.from({ length: CLIENTS }, (_, id) => client(id, () => load, outcomes));

    await new Promise((resolve) => setTimeout(resolve, 2_000));
    const victim = (await stack.server.processes()).find((p) => p.name === 'api-2')!;
    process.kill(victim.pid, 'SIGKILL');
    await gone(victim.pid);
    // From here on nothing may fail: the kernel has closed the dead process's sockets, and nginx has had a
    // moment to see its idle upstream connections close.
    const killedAt = performance.now() + 100;
    const restarted = await stack.server.waitForRestart('api-2', victim.pid);
    await new Promise((resolve) => setTimeout(resolve, 3_000));
    load = false;
    await Promise.all(clients);

    // Load ran on both sides of the kill.
    const ok = (o: Outcome) => o.status >= 200 && o.status < 300;
    const before = outcomes.filter((o) => o.endedAt < killedAt - 100 && ok(o));
    // Down: from the kill until the restarted api-2 first answers (nginx tries it again after 2 s).
    const backAt = Math.min(...outcomes.filter((o) => o.startedAt > killedAt && o.process === 'api-2').map((o) => o.startedAt));
    const whileDown = outcomes.filter((o) => o.startedAt > killedAt && o.endedAt < backAt);
    expect(new Set(before.map((o) => o.process))).toEqual(new Set(['api-1', 'api-2']));
    expect(whileDown.length).toBeGreaterThan(20);

    // Only requests in flight on the dead process failed, and only POSTs (nginx passes a GET that lost
    // its process on to the other one; it never resends a POST it had passed on): 502 from nginx.
    const failed = outcomes.filter((o) => !ok(o));
    for (const f of failed) {
      expect(f).toMatchObject({ kind: 'create', status: 502 });
      expect(f.startedAt).toBeLessThan(killedAt);
    }
    expect(failed.length).toBeLessThanOrEqual(CLIENTS);
    // While it was down, the other process served everything, and nothing started after the kill failed.
    expect(new Set(whileDown.map((o) => o.process))).toEqual(new Set(['api-1']));
    expect(outcomes.filter((o) => o.startedAt > killedAt).every(ok)).toBe(true);

    // Every acknowledged project is stored, once.
    const acknowledged = outcomes.filter((o) => o.kind === 'create' && o.status === 201).map((o) => o.name!);
    expect(acknowledged.length).toBeGreaterThan(50);
    const list = await api<{ projects: { name: string }[] }>(stack.baseUrl, '/api/projects', { cookie });
    const stored = list.body.projects.map((p) => p.name);
    for (const name of acknowledged) expect(stored.filter((s) => s === name)).toHaveLength(1);

    // The supervisor started it again, on its port, and nginx uses it again.
    expect(stack.server.output()).toContain(`api-2 (pid ${victim.pid}) exited (SIGKILL); starting it again`);
    expect(restarted.pid).not.toBe(victim.pid);
    await expect.poll(async () => (await api(stack.baseUrl, '/api/health')).process, { timeout: 10_000, interval: 100 }).toBe('api-2');
  });

  it('in the middle of a review decision leaves the link unused: after the restart it decides once, on either process', async () => {
    const designId = await designIdOf(stack.baseUrl, cookie, 'Carrier tracker');
    const cut = await api<{ id: number; manifestSha256: string }>(stack.baseUrl, `/api/designs/${designId}/releases`, { method: 'POST', cookie });
    expect(cut.status).toBe(201);
    // Approval waits for the server's verification of the reference RTL, which runs in the background.
    expect((await waitForVerdict(stack.baseUrl, cookie, cut.body.id)).verdict).toBe('passed');
    const reviewers = await api<{ reviewers: { id: number; email: string }[] }>(stack.baseUrl, '/api/reviewers', { cookie });
    const reviewerId = reviewers.body.reviewers.find((r) => r.email === 'reviewer@example.test')!.id;
    expect((await api(stack.baseUrl, `/api/releases/${cut.body.id}/reviews`, { cookie, json: { reviewerIds: [reviewerId], approvalsRequired: 1 } })).status).toBe(200);
    const mail = await stack.mail.waitFor((m) => m.subject === 'Review requested: Ultrasonic flow meter / Carrier tracker v1');
    const token = /\/review\/([^\s"'<>]+)/.exec(mail.text)![1]!;
    // The reviewer opens the link (it stays unused)…
    expect((await api(stack.baseUrl, `/api/review-links/${token}`)).status).toBe(200);

    // …and decides on api-1, whose transaction is stopped just before its audit entry.
    const ports = await backendPorts(stack.dataDir);
    const look = await connect(stack.db);
    const lock = await connect(stack.db);
    await lock.query('LOCK TABLES `audit_entries` WRITE');
    const decision = { decision: 'approve', manifestSha256: cut.body.manifestSha256 };
    const halfMade = api(`http://127.0.0.1:${ports.get('api-1')}`, `/api/review-links/${token}`, { json: decision, signal: AbortSignal.timeout(ANSWER_TIMEOUT_MS) }).catch((err: Error) => err);
    await waitForStatement(look, /^INSERT INTO `audit_entries`/);
    await look.query('SET SESSION TRANSACTION ISOLATION LEVEL READ UNCOMMITTED');
    const inFlight = await look.query<{ usedAt: Date | null; state: string }>('SELECT v.`usedAt`, r.`state` FROM `release_reviews` v JOIN `releases` r ON r.`id` = v.`releaseId` WHERE v.`releaseId` = ?', [cut.body.id]);
    expect(inFlight).toHaveLength(1);
    expect(inFlight[0]!.usedAt).not.toBeNull();
    expect(inFlight[0]!.state).toBe('approved');

    const victim = (await stack.server.processes()).find((p) => p.name === 'api-1')!;
    process.kill(victim.pid, 'SIGKILL');
    expect(await halfMade).toBeInstanceOf(Error);
    await lock.close();
    await stack.server.waitForRestart('api-1', victim.pid);

    // Nothing of the half-made decision was kept.
    await look.query('SET SESSION TRANSACTION ISOLATION LEVEL READ COMMITTED');
    const committed = await look.query<{ usedAt: Date | null; state: string }>('SELECT v.`usedAt`, r.`state` FROM `release_reviews` v JOIN `releases` r ON r.`id` = v.`releaseId` WHERE v.`releaseId` = ?', [cut.body.id]);
    expect(committed).toEqual([{ usedAt: null, state: 'in-review' }]);

    // The link decides now, once; a second use is refused by the other process too.
    const decided = await api<{ state: string }>(stack.baseUrl, `/api/review-links/${token}`, { json: decision });
    expect(decided.status).toBe(200);
    expect(decided.body.state).toBe('approved');
    await afterProcess(stack.baseUrl, decided.process!);
    const replayed = await api<{ error: { message: string } }>(stack.baseUrl, `/api/review-links/${token}`, { json: decision });
    expect(replayed.process).not.toBe(decided.process);
    expect(replayed.status).toBe(403);
    expect(replayed.body.error.message).toMatch(/already used/);
    const approvals = await look.query<{ n: number }>("SELECT COUNT(*) AS n FROM `audit_entries` WHERE `action` = 'review.approve' AND `objectId` = ?", [String(cut.body.id)]);
    expect(Number(approvals[0]!.n)).toBe(1);
    // Firmware is told once.
    await stack.mail.waitFor((m) => m.subject === 'Release approved: Ultrasonic flow meter / Carrier tracker v1');
    await new Promise((resolve) => setTimeout(resolve, 2_000));
    expect(stack.mail.messages.filter((m) => m.subject === 'Release approved: Ultrasonic flow meter / Carrier tracker v1')).toHaveLength(1);
    await look.close();
  });

  it('the balancer itself killed (SIGKILL): the supervisor ends its orphaned worker, starts nginx again, and both processes serve', async () => {
    const master = (await stack.server.balancerPid())!;
    expect(master).toBeGreaterThan(0);
    const [worker] = await childrenOf(master);
    expect(worker).toBeGreaterThan(0);
    process.kill(master, 'SIGKILL');
    await gone(master);
    await expect.poll(async () => stack.server.output().includes('nginx is back'), { timeout: 30_000, interval: 100 }).toBe(true);
    // The old worker held the public port; it is gone, and a new master with its own worker serves.
    await gone(worker!);
    const again = (await stack.server.balancerPid())!;
    expect(again).not.toBe(master);
    const served = new Set<string | null>();
    for (let i = 0; i < 6; i += 1) {
      const health = await api(stack.baseUrl, '/api/health');
      expect(health.status).toBe(200);
      served.add(health.process);
    }
    expect([...served].sort()).toEqual(['api-1', 'api-2']);
  });
});
