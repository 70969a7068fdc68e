import { randomUUID } from 'node:crypto';
import bcrypt from 'bcryptjs';
import request from 'supertest';
import type { DataSource } from 'typeorm';
import { afterAll, beforeAll, inject } from 'vitest';
import { createApp, type BuiltApp } from '../src/app.ts';
import { dbEnv, loadConfig, type Config } from '../src/config.ts';
import { CSRF_HEADER, CSRF_HEADER_VALUE, ROLES, type Role } from '@loopwright/contract';
import { createDataSource } from '../src/data-source.ts';
import { Organization, User } from '../src/entities/index.ts';
import type { TestDb } from './db.ts';

export const PASSWORD = 'correct-horse-battery';

export function testDb(): TestDb {
  return inject('lwDb');
}

export function testConfig(overrides: Record<string, string> = {}, db: TestDb = testDb()): Config {
  return loadConfig({
    NODE_ENV: 'test',
    ...dbEnv(db),
    LW_BCRYPT_ROUNDS: '4',
    LW_DB_POOL_SIZE: '5',
    LW_FILE_STORE_DIR: inject('lwFileStoreDir'),
    // Test files share 127.0.0.1 and one database; the limit itself is tested with addresses of its own.
    LW_REVIEW_LINK_LIMIT_PER_WINDOW: '100000',
    ...overrides,
  });
}

export async function openDataSource(config: Config = testConfig()): Promise<DataSource> {
  const dataSource = createDataSource(config.db);
  await dataSource.initialize();
  return dataSource;
}

export function buildApp(dataSource: DataSource, config: Config = testConfig()): BuiltApp {
  return createApp({ config, dataSource, log: () => {} });
}

export interface TestApp {
  readonly dataSource: DataSource;
  readonly built: BuiltApp;
}

/**
 * Opens a data source and builds the app before the tests of the enclosing file or describe block,
 * and closes both after them. The fields are set once the hooks ran: read them inside hooks and tests.
 */
export function useTestApp(config: Config = testConfig()): TestApp {
  const testApp = {} as { dataSource: DataSource; built: BuiltApp };
  beforeAll(async () => {
    testApp.dataSource = await openDataSource(config);
    testApp.built = buildApp(testApp.dataSource, config);
  });
  afterAll(async () => {
    await testApp.built?.close();
    await testApp.dataSource?.destroy();
  });
  return testApp;
}

export interface TestOrg {
  organizationId: number;
  /** One account per role plus a "multi" account holding designer and reviewer. */
  emails: Record<Role | 'multi', string>;
  ids: Record<Role | 'multi', number>;
  /** Display names, as mails and pages show them. */
  names: Record<Role | 'multi', string>;
}

/** A fresh organisation with its own accounts, so test files never see each other's data. */
export async function createTestOrg(dataSource: DataSource): Promise<TestOrg> {
  const tag = randomUUID().slice(0, 8);
  const org = await dataSource.getRepository(Organization).save({ name: `Test org ${tag}` });
  const passwordHash = bcrypt.hashSync(PASSWORD, 4);
  const emails = {} as TestOrg['emails'];
  const ids = {} as TestOrg['ids'];
  const names = {} as TestOrg['names'];
  const accounts: [Role | 'multi', Role[]][] = [...ROLES.map((role): [Role, Role[]] => [role, [role]]), ['multi', ['designer', 'reviewer']]];
  for (const [key, roles] of accounts) {
    const email = `${key}-${tag}@example.test`;
    const user = await dataSource.getRepository(User).save({ organizationId: org.id, email, displayName: `${key} ${tag}`, passwordHash, roles, disabled: false });
    emails[key] = email;
    ids[key] = user.id;
    names[key] = user.displayName;
  }
  return { organizationId: org.id, emails, ids, names };
}

export type Agent = ReturnType<typeof request.agent>;

/** A supertest agent (keeps cookies) signed in as the given account. */
export async function signedInAgent(app: BuiltApp['app'], email: string, password = PASSWORD): Promise<Agent> {
  const agent = request.agent(app);
  await agent.post('/api/session').set(CSRF_HEADER, CSRF_HEADER_VALUE).send({ email, password }).expect(200);
  return agent;
}

export const csrf = { [CSRF_HEADER]: CSRF_HEADER_VALUE } as const;

/** A fresh organisation whose designer is signed in and owns one new project. */
export async function designerWithProject(testApp: TestApp, projectName: string): Promise<{ org: TestOrg; designer: Agent; projectId: number }> {
  const org = await createTestOrg(testApp.dataSource);
  const designer = await signedInAgent(testApp.built.app, org.emails.designer);
  const projectId: number = (await designer.post('/api/projects').set(csrf).send({ name: projectName }).expect(201)).body.id;
  return { org, designer, projectId };
}
