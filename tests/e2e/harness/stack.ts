/**
 * The whole product for browser and fault tests: a fresh project-local MariaDB, the API's migrations
 * and demo seed (src/prepare-db.ts, as `npm start` runs them), the SMTP fake, and the real server
 * (src/server.ts) serving the built web app on a free loopback port — by default two API processes
 * behind Debian's nginx, round-robin, as the scale-out layout runs.
 */
import { spawn } from 'node:child_process';
import { existsSync } from 'node:fs';
import fs from 'node:fs/promises';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { startMariaDb, type MariaDbInstance } from '../../../scripts/lib/mariadb.ts';
import { findFreePort } from '../../../scripts/lib/ports.ts';
import { APP_DIST, ROOT } from './paths.ts';
import { startServer, type ServerProcess } from './server.ts';
import { startSmtpFake, type SmtpFake } from './smtpFake.ts';

export interface StackOptions {
  /** Holds `mariadb/` and the server's LW_DATA_DIR `server/`; removed when the stack stops. */
  readonly dataDir?: string;
  /** LW_API_PROCESSES (default 2). */
  readonly processes?: number;
  /** LW_BALANCER (default nginx). */
  readonly balancer?: 'nginx' | 'none';
  /** Serve the built web app (default true; the fault tests need only the API). */
  readonly app?: boolean;
  /** More settings for the server (they win over the stack's). */
  readonly env?: Readonly<Record<string, string>>;
  /** Also seed the demo releases through the running server, as `npm start` does (default false). */
  readonly demoReleases?: boolean;
}

export interface Stack {
  readonly baseUrl: string;
  readonly mail: SmtpFake;
  readonly db: MariaDbInstance;
  readonly dataDir: string;
  /** The server's settings (LW_DB_*, LW_SMTP_*, PORT, …), for tools run against the same stack. */
  readonly env: Readonly<Record<string, string>>;
  /** What the demo-release seed printed (empty without demoReleases). */
  readonly demoLog: string;
  server: ServerProcess;
  /** Stops the server (all its processes) and starts it again on the same port and data. */
  restartServer(): Promise<void>;
  /** Stops the SMTP fake (its port refuses connections) and, with `restartMail`, starts it again on the same port. */
  stopMail(): Promise<void>;
  restartMail(): Promise<void>;
  stop(): Promise<void>;
}

/** The API's settings module: free of side effects, loaded by path so this harness's type check skips the server's sources. */
interface ApiConfigModule {
  dbEnv(db: { host: string; port: number; user: string; password: string; database: string }): Record<string, string>;
}

const API_DIR = path.join(ROOT, 'packages', 'api');
const API_CONFIG = path.join(API_DIR, 'src', 'config.ts');

/** The LW_DB_* settings that point the API (or its terminal commands) at `db`: the API's own dbEnv. */
export async function apiDbEnv(db: MariaDbInstance): Promise<Record<string, string>> {
  const { dbEnv } = (await import(pathToFileURL(API_CONFIG).href)) as ApiConfigModule;
  return dbEnv(db);
}

/** Runs one of the API's start-up scripts (as `npm start` does) to completion; returns its output. */
function runApiScript(script: string, args: readonly string[], env: Record<string, string>): Promise<string> {
  return new Promise((resolve, reject) => {
    let output = '';
    const child = spawn(process.execPath, ['--import', 'tsx', script, ...args], { cwd: API_DIR, env: { ...process.env, ...env }, stdio: ['ignore', 'pipe', 'pipe'] });
    child.stdout.on('data', (chunk: Buffer) => (output += chunk.toString()));
    child.stderr.on('data', (chunk: Buffer) => (output += chunk.toString()));
    child.once('exit', (code) => (code === 0 ? resolve(output) : reject(new Error(`${script} failed (exit ${code}):\n${output}`))));
  });
}

export async function startStack(options: StackOptions = {}): Promise<Stack> {
  const withApp = options.app ?? true;
  if (withApp && !existsSync(path.join(APP_DIST, 'index.html'))) throw new Error(`no built app at ${APP_DIST}: run vite build first`);
  const processes = options.processes ?? 2;
  const balancer = options.balancer ?? 'nginx';
  const dataDir = options.dataDir ?? path.join(ROOT, '.data', `e2e-${process.pid}`);
  await fs.rm(dataDir, { recursive: true, force: true });
  const stops: (() => Promise<void>)[] = [];
  const stopAll = async () => {
    for (const stop of stops.reverse()) await stop().catch(() => {});
    stops.length = 0;
  };
  try {
    const db = await startMariaDb({ dataDir: path.join(dataDir, 'mariadb'), fresh: true, database: 'loopwright_e2e', user: 'loopwright', password: 'e2e-only-password' });
    stops.push(() => db.stop());
    let mail = await startSmtpFake();
    const mailPort = mail.port;
    stops.push(() => mail.stop());

    const port = await findFreePort();
    const baseUrl = `http://127.0.0.1:${port}`;
    const env: Record<string, string> = {
      NODE_ENV: 'test',
      PORT: String(port),
      ...(await apiDbEnv(db)),
      LW_DATA_DIR: path.join(dataDir, 'server'),
      LW_APP_DIST: withApp ? APP_DIST : path.join(dataDir, 'no-app'),
      LW_API_PROCESSES: String(processes),
      LW_BALANCER: balancer,
      LW_BCRYPT_ROUNDS: '4',
      LW_SMTP_HOST: '127.0.0.1',
      LW_SMTP_PORT: String(mailPort),
      LW_PUBLIC_URL: baseUrl,
      LW_OUTBOX_INTERVAL_MS: '500',
      // Every process verifies the reference RTL of new releases in the background, as in production.
      LW_VERIFY_INTERVAL_MS: '500',
      LW_SIGNIN_LIMIT_PER_WINDOW: '1000',
      ...options.env,
    };
    await runApiScript('src/prepare-db.ts', [], env);
    let server = await startServer(env, { expectedProcesses: processes });
    // `server`, not `stack.server`: a start-up that fails below must still stop it (stack is not made yet).
    stops.push(() => server.stop());
    const demoLog = options.demoReleases ? await runApiScript('src/demo-releases.ts', [baseUrl], env) : '';

    const stack: Stack = {
      baseUrl,
      get mail() {
        return mail;
      },
      db,
      dataDir,
      env,
      demoLog,
      server,
      async restartServer() {
        await stack.server.stop();
        server = await startServer(env, { expectedProcesses: processes });
        stack.server = server;
      },
      async stopMail() {
        await mail.stop();
      },
      async restartMail() {
        mail = await startSmtpFake(mailPort);
      },
      async stop() {
        await stopAll();
        await fs.rm(dataDir, { recursive: true, force: true });
      },
    };
    return stack;
  } catch (err) {
    // Leave nothing running when start-up fails half-way.
    await stopAll();
    throw err;
  }
}
