import fs from 'node:fs/promises';
import path from 'node:path';
import { ifFmDemodSpec, mainsSyncSpec, parseLoopSpec, ultrasonicSinglePoleSpec } from '@loopwright/dsp';
import request from 'supertest';
import type { DataSource } from 'typeorm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startMariaDb, type MariaDbInstance } from '../../../scripts/lib/mariadb.ts';
import { runMigrations } from '../src/data-source.ts';
import { DEMO_PASSWORD, seedDemo } from '../src/seed.ts';
import { buildApp, csrf, openDataSource, testConfig } from './helpers.ts';

describe('seedDemo on the shared test database (which holds data)', () => {
  it('inserts nothing when the database is not empty', async () => {
    const dataSource = await openDataSource();
    try {
      await dataSource.query('INSERT INTO organizations (name) VALUES (?)', ['Someone else']);
      const [before] = await dataSource.query('SELECT COUNT(*) AS n FROM projects');
      const result = await seedDemo(dataSource, 4);
      expect(result.seeded).toBe(false);
      const [after] = await dataSource.query('SELECT COUNT(*) AS n FROM projects');
      expect(Number(after.n)).toBe(Number(before.n));
    } finally {
      await dataSource.destroy();
    }
  });
});

describe('seedDemo on an empty database', () => {
  const dataDir = path.resolve(import.meta.dirname, `../../../.data/test-seed-${process.pid}`);
  let db: MariaDbInstance;
  let dataSource: DataSource;

  beforeAll(async () => {
    db = await startMariaDb({ dataDir, fresh: true, database: 'loopwright_seed', user: 'loopwright', password: 'seed-test-password' });
    dataSource = await openDataSource(testConfig({}, { host: db.host, port: db.port, user: db.user, password: db.password, database: db.database }));
    await runMigrations(dataSource);
  });

  afterAll(async () => {
    await dataSource?.destroy();
    await db?.stop();
    await fs.rm(dataDir, { recursive: true, force: true });
  });

  it('creates the demo organisation, its three projects with a valid design each, and one account per role', async () => {
    expect((await seedDemo(dataSource, 4)).seeded).toBe(true);
    const [org] = await dataSource.query('SELECT name FROM organizations');
    expect(org.name).toBe('Harrow Cove Instruments');
    const designs: { specJson: string }[] = await dataSource.query('SELECT d.specJson FROM designs d JOIN projects p ON p.id = d.projectId ORDER BY p.id');
    const specs = designs.map((d) => JSON.parse(d.specJson));
    expect(specs).toEqual([mainsSyncSpec, ultrasonicSinglePoleSpec, ifFmDemodSpec]);
    expect(specs.every((spec) => parseLoopSpec(spec).ok)).toBe(true);

    const app = buildApp(dataSource, testConfig({}, { host: db.host, port: db.port, user: db.user, password: db.password, database: db.database }));
    try {
      for (const role of ['designer', 'reviewer', 'firmware', 'admin']) {
        const response = await request(app.app).post('/api/session').set(csrf).send({ email: `${role}@example.test`, password: DEMO_PASSWORD }).expect(200);
        expect(response.body.user.roles).toEqual([role]);
      }
    } finally {
      await app.close();
    }
    expect((await seedDemo(dataSource, 4)).seeded).toBe(false);
  });
});
