import request from 'supertest';
import { beforeAll, describe, expect, it } from 'vitest';
import { buildApp, createTestOrg, csrf, openDataSource, PASSWORD, signedInAgent, useTestApp, type TestOrg } from './helpers.ts';

const testApp = useTestApp();
let org: TestOrg;

beforeAll(async () => {
  org = await createTestOrg(testApp.dataSource);
});

describe('sign-in and sign-out', () => {
  it('signs in with the right password and reports who I am', async () => {
    const agent = await signedInAgent(testApp.built.app, org.emails.designer);
    const me = await agent.get('/api/session').expect(200);
    expect(me.body.user).toMatchObject({ email: org.emails.designer, roles: ['designer'], organizationId: org.organizationId });
    expect(me.body.user.passwordHash).toBeUndefined();
  });

  it('sets an http-only, SameSite=Lax session cookie', async () => {
    const response = await request(testApp.built.app).post('/api/session').set(csrf).send({ email: org.emails.reviewer, password: PASSWORD }).expect(200);
    const cookie = String(response.headers['set-cookie']);
    expect(cookie).toMatch(/lw\.sid=/);
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
  });

  it('refuses a wrong password with 401 and the same message as an unknown e-mail', async () => {
    const wrong = await request(testApp.built.app).post('/api/session').set(csrf).send({ email: org.emails.designer, password: 'not-the-password' }).expect(401);
    const unknown = await request(testApp.built.app).post('/api/session').set(csrf).send({ email: 'nobody-here@example.test', password: 'not-the-password' }).expect(401);
    expect(wrong.body.error.code).toBe('unauthenticated');
    expect(wrong.body.error.message).toBe(unknown.body.error.message);
  });

  it('accepts the e-mail in any letter case', async () => {
    await request(testApp.built.app).post('/api/session').set(csrf).send({ email: org.emails.firmware.toUpperCase(), password: PASSWORD }).expect(200);
  });

  it('answers GET /api/session with 200 and no user when signed out (no error status for the browser to log)', async () => {
    const response = await request(testApp.built.app).get('/api/session').expect(200);
    expect(response.body).toEqual({ user: null });
  });

  it('signs out: the session ends and its row is deleted', async () => {
    const agent = await signedInAgent(testApp.built.app, org.emails.admin);
    const before = await testApp.dataSource.query('SELECT COUNT(*) AS n FROM sessions');
    await agent.delete('/api/session').set(csrf).expect(204);
    expect((await agent.get('/api/session').expect(200)).body.user).toBeNull();
    const after = await testApp.dataSource.query('SELECT COUNT(*) AS n FROM sessions');
    expect(Number(after[0].n)).toBe(Number(before[0].n) - 1);
  });

  it('keeps the session in MariaDB: a second app instance accepts the cookie', async () => {
    const response = await request(testApp.built.app).post('/api/session').set(csrf).send({ email: org.emails.multi, password: PASSWORD }).expect(200);
    const cookie = response.headers['set-cookie'] as unknown as string[];
    const otherDataSource = await openDataSource();
    const other = buildApp(otherDataSource);
    try {
      const me = await request(other.app).get('/api/session').set('Cookie', cookie).expect(200);
      expect(me.body.user.email).toBe(org.emails.multi);
      expect(me.body.user.roles.sort()).toEqual(['designer', 'reviewer']);
    } finally {
      await other.close();
      await otherDataSource.destroy();
    }
  });

  it('serves a signed-in request from the session alone, without reloading the account', async () => {
    const agent = await signedInAgent(testApp.built.app, org.emails.reviewer);
    // Changed behind the API's back: a request that reloaded the user would show the new name.
    await testApp.dataSource.query('UPDATE users SET displayName = ? WHERE id = ?', ['Changed directly', org.ids.reviewer]);
    const me = await agent.get('/api/session').expect(200);
    expect(me.body.user.displayName).not.toBe('Changed directly');
  });

  it('writes audit entries for sign-in, failed sign-in and sign-out', async () => {
    const agent = await signedInAgent(testApp.built.app, org.emails.designer);
    await agent.delete('/api/session').set(csrf).expect(204);
    await request(testApp.built.app).post('/api/session').set(csrf).send({ email: org.emails.designer, password: 'wrong-password' }).expect(401);
    const rows: { action: string; ip: string | null }[] = await testApp.dataSource.query(
      "SELECT action, ip FROM audit_entries WHERE (actorId = ? OR JSON_VALUE(detailJson, '$.email') = ?) ORDER BY id",
      [org.ids.designer, org.emails.designer],
    );
    const actions = rows.map((row) => row.action);
    expect(actions).toEqual(expect.arrayContaining(['session.sign-in', 'session.sign-out', 'session.sign-in-failed']));
    expect(rows.every((row) => row.ip !== null && row.ip.length > 0)).toBe(true);
  });
});
