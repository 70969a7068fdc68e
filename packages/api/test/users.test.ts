import request from 'supertest';
import { beforeAll, describe, expect, it } from 'vitest';
import { buildApp, createTestOrg, csrf, openDataSource, PASSWORD, signedInAgent, useTestApp, type Agent, type TestOrg } from './helpers.ts';

const testApp = useTestApp();
let org: TestOrg;
let admin: Agent;

beforeAll(async () => {
  org = await createTestOrg(testApp.dataSource);
  admin = await signedInAgent(testApp.built.app, org.emails.admin);
});

let counter = 0;
async function newAccount(roles: string[] = ['designer']) {
  counter += 1;
  const email = `person-${counter}-${org.organizationId}@example.test`;
  const response = await admin.post('/api/users').set(csrf).send({ email, displayName: `Person ${counter}`, password: 'first-password-1', roles }).expect(201);
  return { id: response.body.id as number, email, password: 'first-password-1', record: response.body };
}

describe('admin account management', () => {
  it('creates an account with several roles and stores only a bcrypt hash', async () => {
    const account = await newAccount(['designer', 'reviewer']);
    expect(account.record).toMatchObject({ email: account.email, roles: ['designer', 'reviewer'], disabled: false });
    expect(account.record.passwordHash).toBeUndefined();
    const [row] = await testApp.dataSource.query('SELECT passwordHash FROM users WHERE id = ?', [account.id]);
    // bcrypt modular-crypt format: $2a$/$2b$, two-digit cost, 53 characters of salt and hash (OpenBSD bcrypt).
    expect(row.passwordHash).toMatch(/^\$2[ab]\$\d\d\$[./A-Za-z0-9]{53}$/);
    expect(row.passwordHash).not.toContain('first-password-1');
  });

  it('refuses a second account with the same e-mail with 409 naming email', async () => {
    const account = await newAccount();
    const response = await admin.post('/api/users').set(csrf).send({ email: account.email.toUpperCase(), displayName: 'Twin', password: 'another-password', roles: ['firmware'] }).expect(409);
    expect(response.body.error).toMatchObject({ code: 'conflict', field: 'email' });
  });

  it('refuses an unknown role naming the field', async () => {
    const response = await admin.post('/api/users').set(csrf).send({ email: 'x-role@example.test', displayName: 'X', password: 'long-enough-pw', roles: ['superuser'] }).expect(400);
    expect(response.body.error.field).toBe('roles.0');
  });

  it('disables an account: it cannot sign in and its open session ends at once', async () => {
    const account = await newAccount();
    const session = await signedInAgent(testApp.built.app, account.email, account.password);
    await session.get('/api/projects').expect(200);

    await admin.patch(`/api/users/${account.id}`).set(csrf).send({ disabled: true }).expect(200);

    const after = await session.get('/api/projects').expect(401);
    expect(after.body.error.code).toBe('unauthenticated');
    const signIn = await request(testApp.built.app).post('/api/session').set(csrf).send({ email: account.email, password: account.password }).expect(401);
    expect(signIn.body.error.code).toBe('unauthenticated');

    await admin.patch(`/api/users/${account.id}`).set(csrf).send({ disabled: false }).expect(200);
    await signedInAgent(testApp.built.app, account.email, account.password);
  });

  it('re-roling an account ends its sessions so the new roles apply at the next sign-in', async () => {
    const account = await newAccount(['designer']);
    const session = await signedInAgent(testApp.built.app, account.email, account.password);
    await session.post('/api/projects').set(csrf).send({ name: 'Allowed while designer' }).expect(201);
    await admin.patch(`/api/users/${account.id}`).set(csrf).send({ roles: ['firmware'] }).expect(200);
    expect((await session.get('/api/session').expect(200)).body.user).toBeNull();
    const again = await signedInAgent(testApp.built.app, account.email, account.password);
    await again.post('/api/projects').set(csrf).send({ name: 'Refused as firmware' }).expect(403);
  });

  it('does not let an admin disable their own account', async () => {
    const response = await admin.patch(`/api/users/${org.ids.admin}`).set(csrf).send({ disabled: true }).expect(400);
    expect(response.body.error.field).toBe('disabled');
  });

  it('records account changes in the audit trail, readable by admins', async () => {
    const account = await newAccount();
    await admin.patch(`/api/users/${account.id}`).set(csrf).send({ roles: ['reviewer'] }).expect(200);
    const response = await admin.get(`/api/audit?objectType=user&objectId=${account.id}`).expect(200);
    const entries = response.body.entries as { action: string; actorId: number; ip: string; at: string }[];
    expect(entries.map((e) => e.action)).toEqual(['user.update', 'user.create']);
    expect(entries.every((e) => e.actorId === org.ids.admin && e.ip.length > 0 && !Number.isNaN(Date.parse(e.at)))).toBe(true);
    // Each entry names its object as a reader does (the account's e-mail), not "user 42".
    expect(response.body.entries.map((e: { objectLabel: string | null }) => e.objectLabel)).toEqual([account.email, account.email]);
  });

  it('pages the audit trail: beforeId gives the next older page, none repeated, none skipped', async () => {
    const all = (await admin.get('/api/audit?limit=500').expect(200)).body.entries as { id: number }[];
    expect(all.length).toBeGreaterThan(4);
    const first = (await admin.get('/api/audit?limit=2').expect(200)).body.entries as { id: number }[];
    const second = (await admin.get(`/api/audit?limit=2&beforeId=${first[1]!.id}`).expect(200)).body.entries as { id: number }[];
    expect([...first, ...second].map((e) => e.id)).toEqual(all.slice(0, 4).map((e) => e.id));
  });

  it('keeps the audit trail append-only even for direct SQL', async () => {
    await expect(testApp.dataSource.query('UPDATE audit_entries SET action = ? LIMIT 1', ['tampered'])).rejects.toThrow(/append-only/);
    await expect(testApp.dataSource.query('DELETE FROM audit_entries LIMIT 1')).rejects.toThrow(/append-only/);
  });
});

describe('password change', () => {
  it('checks the current password, then the new one works, the old one not, and other sessions end', async () => {
    const account = await newAccount();
    const other = await signedInAgent(testApp.built.app, account.email, account.password);
    const me = await signedInAgent(testApp.built.app, account.email, account.password);

    const wrong = await me.put('/api/session/password').set(csrf).send({ currentPassword: 'not-it-at-all', newPassword: 'second-password-2' }).expect(400);
    expect(wrong.body.error.field).toBe('currentPassword');
    const tooShort = await me.put('/api/session/password').set(csrf).send({ currentPassword: account.password, newPassword: 'short' }).expect(400);
    expect(tooShort.body.error.field).toBe('newPassword');

    await me.put('/api/session/password').set(csrf).send({ currentPassword: account.password, newPassword: 'second-password-2' }).expect(204);
    await me.get('/api/session').expect(200);
    expect((await other.get('/api/session').expect(200)).body.user).toBeNull();
    await request(testApp.built.app).post('/api/session').set(csrf).send({ email: account.email, password: account.password }).expect(401);
    await signedInAgent(testApp.built.app, account.email, 'second-password-2');
  });
});

describe('sign-in rate limit', () => {
  it('answers 429 JSON after too many failed attempts for one address and e-mail, even with the right password', async () => {
    const account = await newAccount();
    const statuses: number[] = [];
    for (let attempt = 0; attempt < 10; attempt += 1) {
      statuses.push((await request(testApp.built.app).post('/api/session').set(csrf).send({ email: account.email, password: 'wrong-password' })).status);
    }
    expect(statuses).toEqual(Array(10).fill(401));
    const limited = await request(testApp.built.app).post('/api/session').set(csrf).send({ email: account.email, password: account.password }).expect(429);
    expect(limited.body.error.code).toBe('rate_limited');
    // Another account from the same address is not locked out by someone guessing this one.
    await signedInAgent(testApp.built.app, org.emails.reviewer, PASSWORD);
  });

  it('counts attempts in MariaDB, so a second API process sees the same count', async () => {
    const account = await newAccount();
    for (let attempt = 0; attempt < 10; attempt += 1) {
      await request(testApp.built.app).post('/api/session').set(csrf).send({ email: account.email, password: 'wrong-password' }).expect(401);
    }
    const otherDataSource = await openDataSource();
    const other = buildApp(otherDataSource);
    try {
      await request(other.app).post('/api/session').set(csrf).send({ email: account.email, password: account.password }).expect(429);
    } finally {
      await other.close();
      await otherDataSource.destroy();
    }
  });
});

describe('audit trail per organisation', () => {
  it("shows an admin their organisation's entries, including failed sign-ins on its accounts, and not another's", async () => {
    const other = await createTestOrg(testApp.dataSource);
    const otherAdmin = await signedInAgent(testApp.built.app, other.emails.admin);
    await request(testApp.built.app).post('/api/session').set(csrf).send({ email: org.emails.firmware, password: 'not-the-password' }).expect(401);
    const mine = (await admin.get('/api/audit?limit=500').expect(200)).body.entries as { action: string; objectId: string | null; detail: { email?: string } | null }[];
    expect(mine.some((e) => e.action === 'session.sign-in-failed' && e.detail?.email === org.emails.firmware && e.objectId === String(org.ids.firmware))).toBe(true);
    const theirs = (await otherAdmin.get('/api/audit?limit=500').expect(200)).body.entries as { actorEmail: string | null; detail: { email?: string } | null }[];
    expect(theirs.length).toBeGreaterThan(0);
    const mineEmails = new Set<string>(Object.values(org.emails));
    expect(theirs.filter((e) => mineEmails.has(e.actorEmail ?? '') || mineEmails.has(e.detail?.email ?? ''))).toEqual([]);
  });
});
