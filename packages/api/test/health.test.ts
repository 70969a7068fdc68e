import fs from 'node:fs/promises';
import path from 'node:path';
import request from 'supertest';
import type { DataSource } from 'typeorm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startMariaDb, type MariaDbInstance } from '../../../scripts/lib/mariadb.ts';
import type { BuiltApp } from '../src/app.ts';
import { runMigrations } from '../src/data-source.ts';
import { buildApp, createTestOrg, csrf, openDataSource, PASSWORD, testConfig, useTestApp, type TestOrg } from './helpers.ts';

describe('GET /api/health with the database up', () => {
  const testApp = useTestApp();

  it('reports ok and the database up', async () => {
    const response = await request(testApp.built.app).get('/api/health').expect(200);
    expect(response.body).toMatchObject({ status: 'ok', database: 'up' });
    expect(response.body.databaseLatencyMs).toBeGreaterThanOrEqual(0);
  });
});

/**
 * Fault test on a MariaDB of its own (killing the shared one would break the other test files):
 * SIGKILL the server under a running app, expect 503 with a JSON message, restart it, expect recovery
 * without rebuilding the app or its DataSource.
 */
describe('the database killed while the API runs', () => {
  const dataDir = path.resolve(import.meta.dirname, `../../../.data/test-fault-${process.pid}`);
  let db: MariaDbInstance;
  let dataSource: DataSource;
  let built: BuiltApp;
  let org: TestOrg;
  let cookie: string[];

  beforeAll(async () => {
    db = await startMariaDb({ dataDir, fresh: true, database: 'loopwright_fault', user: 'loopwright', password: 'fault-test-password' });
    const config = testConfig({ LW_DB_CONNECT_TIMEOUT_MS: '1000' }, { host: db.host, port: db.port, user: db.user, password: db.password, database: db.database });
    dataSource = await openDataSource(config);
    await runMigrations(dataSource);
    built = buildApp(dataSource, config);
    org = await createTestOrg(dataSource);
    const signIn = await request(built.app).post('/api/session').set(csrf).send({ email: org.emails.designer, password: PASSWORD }).expect(200);
    cookie = signIn.headers['set-cookie'] as unknown as string[];
  });

  afterAll(async () => {
    await built?.close();
    await dataSource?.destroy();
    await db?.stop();
    await fs.rm(dataDir, { recursive: true, force: true });
  });

  it('answers 503 with a clear JSON error while down and recovers when the server is back', async () => {
    await request(built.app).get('/api/projects').set('Cookie', cookie).expect(200);
    await db.kill();

    const health = await request(built.app).get('/api/health').expect(503);
    expect(health.body).toMatchObject({ status: 'degraded', database: 'down' });

    const projects = await request(built.app).get('/api/projects').set('Cookie', cookie).expect(503);
    expect(projects.headers['content-type']).toMatch(/application\/json/);
    expect(projects.body.error.code).toBe('database_unavailable');
    expect(projects.body.error.message).toMatch(/database/);
    expect(JSON.stringify(projects.body)).not.toMatch(/ECONNREFUSED|SELECT|at .*\.js/);

    const signIn = await request(built.app).post('/api/session').set(csrf).send({ email: org.emails.reviewer, password: PASSWORD }).expect(503);
    expect(signIn.body.error.code).toBe('database_unavailable');

    await db.restart();
    // The pool opens new connections on demand; the first request after the restart may still meet a
    // dead pooled connection, so allow a few attempts (no restart of the app, no new DataSource).
    let status = 0;
    for (let attempt = 0; attempt < 20 && status !== 200; attempt += 1) {
      status = (await request(built.app).get('/api/health')).status;
      if (status !== 200) await new Promise((resolve) => setTimeout(resolve, 250));
    }
    expect(status).toBe(200);
    const after = await request(built.app).get('/api/projects').set('Cookie', cookie).expect(200);
    expect(after.body.projects).toEqual([]);
  });
});
