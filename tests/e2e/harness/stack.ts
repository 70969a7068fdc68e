/**
 * The whole product for browser tests: a fresh project-local MariaDB, the API's migrations and demo
 * seed, the SMTP fake, and the API app serving the built web app (as the API's server does) on a
 * free loopback port.
 */
import { existsSync } from 'node:fs';
import fs from 'node:fs/promises';
import path from 'node:path';
import type { Server } from 'node:http';
import { createRequire } from 'node:module';
import { pathToFileURL } from 'node:url';
import { startMariaDb, type MariaDbInstance } from '../../../scripts/lib/mariadb.ts';
import { findFreePort } from '../../../scripts/lib/ports.ts';
import { APP_DIST, ROOT } from './paths.ts';
import { startSmtpFake, type SmtpFake } from './smtpFake.ts';

export interface Stack {
  readonly baseUrl: string;
  readonly mail: SmtpFake;
  stop(): Promise<void>;
}

const requireFromApi = createRequire(path.join(ROOT, 'packages', 'api', 'package.json'));

/**
 * The slice of the API package this harness calls. Loaded by path at run time so the app's tooling
 * type-check does not pull in the server's sources (they have their own tsconfig and checks).
 */
interface ApiModule {
  loadConfig(env: NodeJS.ProcessEnv): { db: unknown };
  createDataSource(db: unknown): { initialize(): Promise<unknown>; destroy(): Promise<void> };
  runMigrations(dataSource: unknown): Promise<unknown>;
  seedDemo(dataSource: unknown, bcryptRounds: number): Promise<unknown>;
  createApp(options: { config: unknown; dataSource: unknown; log: () => void }): { app: ExpressApp; close(): Promise<void> };
}

interface ExpressApp {
  use(handler: unknown): void;
  get(pattern: RegExp, handler: (req: unknown, res: { set(k: string, v: string): { sendFile(p: string): void } }) => void): void;
  listen(port: number, host: string, cb: () => void): Server;
}

interface ExpressModule {
  static(root: string, options: { index: false }): unknown;
}

/** The API's settings module: free of side effects, so it loads before process.env is set. */
interface ApiConfigModule {
  dbEnv(db: { host: string; port: number; user: string; password: string; database: string }): Record<string, string>;
}

const API_CONFIG = path.join(ROOT, 'packages', 'api', 'src', 'config.ts');
const API_INDEX = path.join(ROOT, 'packages', 'api', 'src', 'index.ts');

export async function startStack(options: { dataDir?: string } = {}): Promise<Stack> {
  if (!existsSync(path.join(APP_DIST, 'index.html'))) throw new Error(`no built app at ${APP_DIST}: run vite build first`);
  const dataDir = options.dataDir ?? path.join(ROOT, '.data', `e2e-${process.pid}`);
  const db = await startMariaDb({ dataDir, fresh: true, database: 'loopwright_e2e', user: 'loopwright', password: 'e2e-only-password' });
  let mail: SmtpFake;
  try {
    mail = await startSmtpFake();
  } catch (err) {
    await db.stop();
    throw err;
  }
  try {
    return await startApi(db, mail, dataDir);
  } catch (err) {
    // Leave nothing running when start-up fails half-way.
    await mail.stop();
    await db.stop();
    throw err;
  }
}

async function startApi(db: MariaDbInstance, mail: SmtpFake, dataDir: string): Promise<Stack> {
  const port = await findFreePort();
  const baseUrl = `http://127.0.0.1:${port}`;
  const { dbEnv } = (await import(pathToFileURL(API_CONFIG).href)) as ApiConfigModule;
  const env: Record<string, string> = {
    NODE_ENV: 'test',
    ...dbEnv(db),
    LW_BCRYPT_ROUNDS: '4',
    LW_SMTP_HOST: '127.0.0.1',
    LW_SMTP_PORT: String(mail.port),
    LW_PUBLIC_URL: baseUrl,
    LW_OUTBOX_INTERVAL_MS: '500',
    LW_SIGNIN_LIMIT_PER_WINDOW: '1000',
  };
  // The API reads its settings from process.env; put back what was there when the stack stops
  // (the benchmark runs in one process with others).
  const saved = Object.fromEntries(Object.keys(env).map((k) => [k, process.env[k]]));
  Object.assign(process.env, env);
  const api = (await import(pathToFileURL(API_INDEX).href)) as ApiModule;
  const config = api.loadConfig(process.env);
  const dataSource = api.createDataSource(config.db);
  await dataSource.initialize();
  await api.runMigrations(dataSource);
  await api.seedDemo(dataSource, 4);
  const built = api.createApp({ config, dataSource, log: () => {} });
  const express = requireFromApi('express') as ExpressModule;
  built.app.use(express.static(APP_DIST, { index: false }));
  built.app.get(/^(?!\/api(\/|$)).*/, (_req, res) => {
    res.set('Cache-Control', 'no-cache').sendFile(path.join(APP_DIST, 'index.html'));
  });
  const server = await new Promise<Server>((resolve) => {
    const s = built.app.listen(port, '127.0.0.1', () => resolve(s));
  });
  return {
    baseUrl,
    mail,
    async stop() {
      await new Promise<void>((resolve) => server.close(() => resolve()));
      await built.close();
      await dataSource.destroy();
      await mail.stop();
      await db.stop();
      await fs.rm(dataDir, { recursive: true, force: true });
      for (const [key, value] of Object.entries(saved)) {
        if (value === undefined) delete process.env[key];
        else process.env[key] = value;
      }
    },
  };
}
