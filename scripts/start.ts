/**
 * `npm start`: Loopwright with its demo data on http://127.0.0.1:8080 (PORT overrides); with
 * LW_API_PROCESSES=N LW_BALANCER=nginx, N API processes behind Debian's nginx on that port.
 * Starts a project-local MariaDB (data kept in .data/dev between runs), migrates and seeds it
 * (seeding only an empty database), starts the local SMTP fake, builds the app and serves app and
 * API. Ctrl-C stops everything it started.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { dbEnv } from '../packages/api/src/config.ts';
import { startMariaDb } from './lib/mariadb.ts';
import { findFreePort, isPortTaken } from './lib/ports.ts';
import { ROOT, onShutdown, shutdown } from './lib/process.ts';
import { StartupError } from './lib/startup-error.ts';

const DEMO_ACCOUNTS = ['designer', 'reviewer', 'firmware', 'admin'].map((role) => `${role}@example.test`);
const DEMO_PASSWORD = 'loopwright-demo';

function log(message: string): void {
  process.stdout.write(`loopwright: ${message}\n`);
}

function portFromEnv(name: string, fallback: number): number {
  const raw = process.env[name];
  if (raw === undefined || raw === '') return fallback;
  const port = Number(raw);
  if (!Number.isInteger(port) || port < 1 || port > 65535) throw new StartupError(`${name}=${raw} is not a TCP port (1-65535)`);
  return port;
}

/** Runs a command to completion, its output shown, and fails with one line if it fails. */
function runStep(what: string, cwd: string, command: string, args: readonly string[], env: NodeJS.ProcessEnv): Promise<void> {
  return new Promise((resolve, reject) => {
    const child = spawn(command, args, { cwd: path.join(ROOT, cwd), stdio: ['ignore', 'inherit', 'inherit'], env });
    child.on('error', (err) => reject(new StartupError(`${what} could not start: ${err.message}`)));
    child.on('exit', (code) => (code === 0 ? resolve() : reject(new StartupError(`${what} failed (exit ${code})`))));
  });
}

/** Starts a long-running child that is stopped at shutdown; its early exit is reported. */
function startService(what: string, cwd: string, command: string, args: readonly string[], env: NodeJS.ProcessEnv): ChildProcess {
  const child = spawn(command, args, { cwd: path.join(ROOT, cwd), stdio: ['ignore', 'inherit', 'inherit'], env, detached: true });
  let stopping = false;
  child.on('exit', (code) => {
    if (stopping) return;
    process.stderr.write(`loopwright: error: ${what} stopped unexpectedly (exit ${code})\n`);
    void shutdown().then(() => process.exit(1));
  });
  onShutdown(
    () =>
      new Promise<void>((resolve) => {
        stopping = true;
        if (child.exitCode !== null || child.pid === undefined) return resolve();
        child.once('exit', () => resolve());
        process.kill(-child.pid, 'SIGTERM');
        setTimeout(() => { try { process.kill(-child.pid!, 'SIGKILL'); } catch { /* already gone */ } }, 5000).unref();
      }),
  );
  return child;
}

async function waitForHttp(url: string, timeoutS: number): Promise<void> {
  const deadline = Date.now() + timeoutS * 1000;
  while (Date.now() < deadline) {
    try {
      const response = await fetch(url);
      if (response.ok) return;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new StartupError(`${url} did not answer within ${timeoutS} s`);
}

async function main(): Promise<void> {
  const httpPort = portFromEnv('PORT', 8080);
  if (await isPortTaken(httpPort)) throw new StartupError(`port ${httpPort} on 127.0.0.1 is taken by another program; set PORT to a free port`);

  // LW_DATA_DIR lets the tests run a whole start on data of their own, never the developer's.
  const dataDir = path.resolve(process.env.LW_DATA_DIR ?? path.join(ROOT, '.data', 'dev'));
  const db = await startMariaDb({
    dataDir: path.join(dataDir, 'mariadb'),
    port: portFromEnv('LW_DB_PORT', 3417),
    database: 'loopwright',
    user: 'loopwright',
    password: process.env.LW_DB_PASSWORD ?? 'dev-only-password',
  });
  onShutdown(() => db.stop());
  log(`MariaDB on 127.0.0.1:${db.port} (data in ${path.relative(ROOT, dataDir) || dataDir}, kept between runs)`);

  const smtpPort = (await isPortTaken(1025)) ? await findFreePort() : 1025;
  const mailWebPort = (await isPortTaken(1080)) ? await findFreePort() : 1080;
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    NODE_ENV: process.env.NODE_ENV ?? 'development',
    PORT: String(httpPort),
    ...dbEnv(db),
    LW_SMTP_HOST: '127.0.0.1',
    LW_SMTP_PORT: String(smtpPort),
    LW_PUBLIC_URL: process.env.LW_PUBLIC_URL ?? `http://127.0.0.1:${httpPort}`,
    LW_APP_DIST: path.join(ROOT, 'packages', 'app', 'dist'),
    // The server's own files (the balancer's generated configuration) go beside the database's.
    LW_DATA_DIR: dataDir,
  };

  await runStep('database migrations and demo seed', 'packages/api', process.execPath, ['--import', 'tsx', 'src/prepare-db.ts'], env);
  startService('the SMTP fake (maildev)', '.', 'pnpm', ['exec', 'maildev', '--ip', '127.0.0.1', '--web-ip', '127.0.0.1', '-s', String(smtpPort), '-w', String(mailWebPort), '--silent'], env);
  log(`SMTP fake on 127.0.0.1:${smtpPort}; read the mail it caught at http://127.0.0.1:${mailWebPort}`);

  log('building the web app');
  await runStep('the app build (vite)', 'packages/app', 'pnpm', ['exec', 'vite', 'build', '--logLevel', 'warn'], env);

  startService('the API server', 'packages/api', process.execPath, ['--import', 'tsx', 'src/server.ts'], env);
  const url = `http://127.0.0.1:${httpPort}`;
  await waitForHttp(`${url}/api/health`, 60);

  const processes = env.LW_API_PROCESSES ?? '1';
  const layout = env.LW_BALANCER === 'nginx' ? `${processes} API process(es) behind nginx` : `${processes} API process(es)`;
  log(`Loopwright is running at ${url} (${layout})`);
  // The demo releases are made through the running server (its routes, its RTL verification), so
  // they can only be seeded now; the script leaves a database whose demo designs have releases alone.
  log('seeding the demo releases through the server (a minute or two on an idle machine: approval waits for the RTL verification)');
  await runStep('the demo releases', 'packages/api', process.execPath, ['--import', 'tsx', 'src/demo-releases.ts', url], env).catch((err: unknown) => {
    // The server itself is fine; say what failed and keep serving.
    process.stderr.write(`loopwright: error: ${err instanceof Error ? err.message : String(err)}; the server keeps running without them\n`);
  });
  log(`demo sign-ins (demo database only), password '${DEMO_PASSWORD}':`);
  for (const account of DEMO_ACCOUNTS) log(`  ${account}`);
  log('press Ctrl-C to stop');
}

main().catch(async (err: unknown) => {
  process.stderr.write(`loopwright: error: ${err instanceof StartupError ? err.message : String((err as Error).stack ?? err)}\n`);
  await shutdown();
  process.exit(1);
});
