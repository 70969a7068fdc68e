import { randomUUID } from 'node:crypto';
import { mainsSyncSpec, ultrasonicSinglePoleSpec } from '@loopwright/dsp';
import request from 'supertest';
import { beforeAll, describe, expect, it } from 'vitest';
import { ROLES, type Role } from '@loopwright/contract';
import { createTestOrg, csrf, PASSWORD, signedInAgent, useTestApp, type Agent, type TestOrg } from './helpers.ts';
import { releaseFixtures, type ReleaseFixtures } from './releases/fixtures.ts';

/**
 * Every route × every role (and signed out): the expected answer is 2xx when the policy below allows
 * it, 401 signed out, 403 otherwise. The policy is written here by hand, apart from the route table,
 * so a wrong `access` in a route fails. A route the router knows but this table does not fails too.
 */
type Who = 'signed-out' | Role;
type Policy = 'public' | 'signed-in' | readonly Role[];

interface Fixtures {
  projectId: number;
  designId: number;
  freshDesign(): Promise<number>;
  freshUser(): Promise<number>;
  releases: ReleaseFixtures;
}

interface Case {
  readonly allowed: Policy;
  readonly call: (agent: Agent, f: Fixtures) => Promise<request.Response> | request.Test;
}

const DESIGNER: readonly Role[] = ['designer'];
const ANALYSTS: readonly Role[] = ['designer', 'reviewer'];
const ADMIN: readonly Role[] = ['admin'];

const CASES: Record<string, Case> = {
  'GET /health': { allowed: 'public', call: (a) => a.get('/api/health') },
  'GET /session': { allowed: 'public', call: (a) => a.get('/api/session') },
  'POST /session': { allowed: 'public', call: (a) => a.post('/api/session').set(csrf).send({ email: org.emails.firmware, password: PASSWORD }) },
  'DELETE /session': { allowed: 'public', call: (a) => a.delete('/api/session').set(csrf) },
  'PUT /session/password': { allowed: 'signed-in', call: (a) => a.put('/api/session/password').set(csrf).send({ currentPassword: PASSWORD, newPassword: PASSWORD }) },
  'GET /users': { allowed: ADMIN, call: (a) => a.get('/api/users') },
  'POST /users': {
    allowed: ADMIN,
    call: (a) => a.post('/api/users').set(csrf).send({ email: `new-${randomUUID().slice(0, 8)}@example.test`, displayName: 'New person', password: 'a-long-enough-password', roles: ['firmware'] }),
  },
  'GET /reviewers': { allowed: DESIGNER, call: (a) => a.get('/api/reviewers') },
  'PATCH /users/:id': { allowed: ADMIN, call: async (a, f) => a.patch(`/api/users/${await f.freshUser()}`).set(csrf).send({ displayName: 'Renamed' }) },
  'GET /projects': { allowed: 'signed-in', call: (a) => a.get('/api/projects') },
  'POST /projects': { allowed: DESIGNER, call: (a) => a.post('/api/projects').set(csrf).send({ name: 'Role table project' }) },
  'GET /projects/:id': { allowed: 'signed-in', call: (a, f) => a.get(`/api/projects/${f.projectId}`) },
  'PATCH /projects/:id': { allowed: DESIGNER, call: (a, f) => a.patch(`/api/projects/${f.projectId}`).set(csrf).send({ description: 'touched by the role table' }) },
  'GET /templates': { allowed: 'signed-in', call: (a) => a.get('/api/templates') },
  'GET /projects/:id/designs': { allowed: 'signed-in', call: (a, f) => a.get(`/api/projects/${f.projectId}/designs`) },
  'POST /projects/:id/designs': { allowed: DESIGNER, call: (a, f) => a.post(`/api/projects/${f.projectId}/designs`).set(csrf).send({ name: 'New design', templateId: 'mains-sync' }) },
  'POST /projects/:id/designs/upload': {
    allowed: DESIGNER,
    call: (a, f) => a.post(`/api/projects/${f.projectId}/designs/upload`).set(csrf).attach('file', Buffer.from(JSON.stringify(mainsSyncSpec)), 'spec.json'),
  },
  'GET /designs/:id': { allowed: 'signed-in', call: (a, f) => a.get(`/api/designs/${f.designId}`) },
  'GET /designs/:id/spec.json': { allowed: 'signed-in', call: (a, f) => a.get(`/api/designs/${f.designId}/spec.json`) },
  'PUT /designs/:id': { allowed: DESIGNER, call: async (a, f) => a.put(`/api/designs/${await f.freshDesign()}`).set(csrf).send({ baseRevision: 1, name: 'Edited' }) },
  'PATCH /designs/:id': { allowed: DESIGNER, call: async (a, f) => a.patch(`/api/designs/${await f.freshDesign()}`).set(csrf).send({ archived: true }) },
  'POST /designs/:id/duplicate': { allowed: DESIGNER, call: (a, f) => a.post(`/api/designs/${f.designId}/duplicate`).set(csrf).send({}) },
  'DELETE /designs/:id': { allowed: DESIGNER, call: async (a, f) => a.delete(`/api/designs/${await f.freshDesign()}`).set(csrf) },
  'POST /analysis': { allowed: ANALYSTS, call: (a) => a.post('/api/analysis').set(csrf).send({ spec: ultrasonicSinglePoleSpec }) },
  'POST /designs/:id/analysis': { allowed: ANALYSTS, call: (a, f) => a.post(`/api/designs/${f.designId}/analysis`).set(csrf) },
  'POST /simulations': {
    allowed: ANALYSTS,
    call: (a) => a.post('/api/simulations').set(csrf).send({ spec: ultrasonicSinglePoleSpec, scenario: { kind: 'tone', offsetHz: 10, durationS: 0.001 }, mode: 'float', buckets: 10 }),
  },
  'POST /designs/:id/simulations': {
    allowed: ANALYSTS,
    call: (a, f) => a.post(`/api/designs/${f.designId}/simulations`).set(csrf).send({ scenario: { kind: 'tone', offsetHz: 10, durationS: 0.001 }, mode: 'float', buckets: 10 }),
  },
  'POST /acquisitions': { allowed: ANALYSTS, call: (a) => a.post('/api/acquisitions').set(csrf).send({ spec: ultrasonicSinglePoleSpec }) },
  'POST /designs/:id/acquisitions': { allowed: ANALYSTS, call: (a, f) => a.post(`/api/designs/${f.designId}/acquisitions`).set(csrf) },
  'GET /audit': { allowed: ADMIN, call: (a) => a.get('/api/audit') },
  // Releases (src/releases/routes.ts). The approved fixture release is visible to every role.
  'POST /designs/:id/releases': { allowed: DESIGNER, call: (a, f) => a.post(`/api/designs/${f.designId}/releases`).set(csrf) },
  'GET /designs/:id/releases': { allowed: 'signed-in', call: (a, f) => a.get(`/api/designs/${f.designId}/releases`) },
  'GET /releases': { allowed: 'signed-in', call: (a) => a.get('/api/releases') },
  'GET /releases/:id': { allowed: 'signed-in', call: (a, f) => a.get(`/api/releases/${f.releases.approvedId}`) },
  'POST /estimates': { allowed: ['designer', 'reviewer'], call: (a) => a.post('/api/estimates').set(csrf).send({ specs: [mainsSyncSpec] }) },
  'GET /releases/:id/verification': { allowed: 'signed-in', call: (a, f) => a.get(`/api/releases/${f.releases.approvedId}/verification`) },
  'POST /releases/:id/withdraw': { allowed: DESIGNER, call: async (a, f) => a.post(`/api/releases/${await f.releases.freshDraft()}/withdraw`).set(csrf).send({}) },
  'GET /releases/:id/diff': { allowed: 'signed-in', call: (a, f) => a.get(`/api/releases/${f.releases.approvedId}/diff?against=${f.releases.approvedId}`) },
  'GET /releases/:id/files/:name': { allowed: 'signed-in', call: (a, f) => a.get(`/api/releases/${f.releases.approvedId}/files/manifest.json`) },
  'GET /releases/:id/bundle': { allowed: 'signed-in', call: (a, f) => a.get(`/api/releases/${f.releases.approvedId}/bundle`) },
  'GET /releases/:id/downloads': { allowed: ['designer', 'admin'], call: (a, f) => a.get(`/api/releases/${f.releases.approvedId}/downloads`) },
  'POST /releases/:id/reviews': {
    allowed: DESIGNER,
    call: async (a, f) => a.post(`/api/releases/${await f.releases.freshDraft()}/reviews`).set(csrf).send({ reviewerIds: [org.ids.reviewer], approvalsRequired: 1 }),
  },
  'POST /releases/:id/reviews/decision': {
    allowed: ['reviewer'],
    call: async (a, f) => {
      const link = await f.releases.freshToken();
      return a.post(`/api/releases/${link.releaseId}/reviews/decision`).set(csrf).send({ decision: 'approve', manifestSha256: link.manifestSha256 });
    },
  },
  'GET /reviews/waiting': { allowed: ['reviewer'], call: (a) => a.get('/api/reviews/waiting') },
  'GET /releases/:id/reviews': { allowed: 'signed-in', call: (a, f) => a.get(`/api/releases/${f.releases.approvedId}/reviews`) },
  // The token is the authority on review links: called without a session, whoever holds the role.
  'GET /review-links/:token': { allowed: 'public', call: async (_a, f) => request(testApp.built.app).get(`/api/review-links/${(await f.releases.freshToken()).token}`) },
  'GET /review-links/:token/files/:name': {
    allowed: 'public',
    call: async (_a, f) => request(testApp.built.app).get(`/api/review-links/${(await f.releases.freshToken()).token}/files/manifest.json`),
  },
  'POST /review-links/:token': {
    allowed: 'public',
    call: async (_a, f) => {
      const link = await f.releases.freshToken();
      return request(testApp.built.app).post(`/api/review-links/${link.token}`).send({ decision: 'approve', manifestSha256: link.manifestSha256 });
    },
  },
  'POST /releases/:id/conformance': {
    allowed: ['firmware', 'designer'],
    call: (a, f) => a.post(`/api/releases/${f.releases.approvedId}/conformance`).set(csrf).attach('file', f.releases.goldenCsv, 'capture.csv'),
  },
  'GET /releases/:id/conformance': { allowed: 'signed-in', call: (a, f) => a.get(`/api/releases/${f.releases.approvedId}/conformance`) },
};

const testApp = useTestApp();
let org: TestOrg;
let fixtures: Fixtures;

beforeAll(async () => {
  org = await createTestOrg(testApp.dataSource);
  // Fixtures come from the services, not from signed-in agents: PUT /session/password ends the
  // other sessions of its account, which would sign such agents out half-way through the table.
  const designerActor = { id: org.ids.designer, email: org.emails.designer, ip: null };
  const adminActor = { id: org.ids.admin, email: org.emails.admin, ip: null };
  const { projects, designs, users } = testApp.built.services;
  const projectId = (await projects.create(org.organizationId, { name: 'Role table', description: '' }, designerActor)).id;
  const freshDesign = async (): Promise<number> => (await designs.create(org.organizationId, projectId, { name: 'Fixture', templateId: 'ultrasonic-single-pole' }, designerActor)).id;
  const freshUser = async (): Promise<number> =>
    (await users.create(org.organizationId, { email: `fixture-${randomUUID().slice(0, 8)}@example.test`, displayName: 'Fixture', password: 'a-long-enough-password', roles: ['reviewer'] }, adminActor)).id;
  const designId = await freshDesign();
  fixtures = { projectId, designId, freshDesign, freshUser, releases: await releaseFixtures(testApp.built, org, designId) };
});

function registeredRoutes(): string[] {
  const keys: string[] = [];
  for (const layer of testApp.built.apiRouter.stack) {
    const route = layer.route as { path: string; methods: Record<string, boolean> } | undefined;
    if (!route) continue;
    for (const method of Object.keys(route.methods)) keys.push(`${method.toUpperCase()} ${route.path}`);
  }
  return keys.sort();
}

function expectedStatus(policy: Policy, who: Who): 'ok' | 401 | 403 {
  if (policy === 'public') return 'ok';
  if (who === 'signed-out') return 401;
  if (policy === 'signed-in') return 'ok';
  return policy.includes(who) ? 'ok' : 403;
}

describe('route × role table', () => {
  it('covers every route the API router has registered, and only those', () => {
    expect(registeredRoutes()).toEqual(Object.keys(CASES).sort());
  });

  const WHO: readonly Who[] = ['signed-out', ...ROLES];
  for (const [key, testCase] of Object.entries(CASES)) {
    for (const who of WHO) {
      const expected = expectedStatus(testCase.allowed, who);
      it(`${key} as ${who} → ${expected === 'ok' ? '2xx' : expected}`, async () => {
        const agent = who === 'signed-out' ? request.agent(testApp.built.app) : await signedInAgent(testApp.built.app, org.emails[who]);
        const response = await testCase.call(agent, fixtures);
        if (expected === 'ok') {
          expect([200, 201, 204], `${key} as ${who}: ${response.status} ${response.text.slice(0, 200)}`).toContain(response.status);
        } else {
          expect(response.status, response.text.slice(0, 200)).toBe(expected);
          expect(response.body.error.code).toBe(expected === 401 ? 'unauthenticated' : 'forbidden');
        }
      });
    }
  }
});
