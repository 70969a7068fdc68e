/**
 * A project-local MariaDB server: its own option file, data directory, socket and port on 127.0.0.1,
 * never the system service. Used by `npm start`, `npm test`, the API's tests and the benchmarks.
 * Commands follow the MariaDB 10.11 manual pages of mariadb-install-db, mariadbd and mariadb-admin
 * (the --defaults-file option must come first on each command line).
 */
import { spawn, execFile } from 'node:child_process';
import { existsSync } from 'node:fs';
import fs from 'node:fs/promises';
import path from 'node:path';
import { promisify } from 'node:util';
import { findFreePort, isPortTaken } from './ports.ts';
import { StartupError } from './startup-error.ts';

const execFileAsync = promisify(execFile);

export interface MariaDbOptions {
  /** Folder that holds the option file, the data files, the socket and the log. */
  readonly dataDir: string;
  /** TCP port on 127.0.0.1; 0 or undefined picks a free one. */
  readonly port?: number;
  readonly database: string;
  readonly user: string;
  readonly password: string;
  /** Delete dataDir first (tests). */
  readonly fresh?: boolean;
  /** How long to wait for the server to answer, in seconds. */
  readonly readyTimeoutS?: number;
}

export interface MariaDbInstance {
  readonly host: string;
  readonly port: number;
  readonly socket: string;
  readonly database: string;
  readonly user: string;
  readonly password: string;
  /** Orderly shutdown; resolves when the server process has exited. */
  stop(): Promise<void>;
  /** SIGKILL, for fault tests: the data directory survives and restart() brings it back. */
  kill(): Promise<void>;
  restart(): Promise<void>;
}

const SAFE_NAME = /^[a-z][a-z0-9_]{0,31}$/;
const SAFE_PASSWORD = /^[A-Za-z0-9_.\-]{8,64}$/;

function findBinary(name: string): string {
  for (const dir of ['/usr/sbin', '/usr/bin', '/usr/local/sbin', '/usr/local/bin']) {
    const candidate = path.join(dir, name);
    if (existsSync(candidate)) return candidate;
  }
  throw new StartupError(`MariaDB program '${name}' not found: install Debian's mariadb-server (npm start and npm test do this when apt-get is available)`);
}

function optionFileText(dataDir: string, port: number): string {
  const runningAsRoot = typeof process.getuid === 'function' && process.getuid() === 0;
  return [
    '[mariadbd]',
    ...(runningAsRoot ? ['user=root'] : []),
    `datadir=${path.join(dataDir, 'data')}`,
    `socket=${socketPath(dataDir)}`,
    `pid-file=${path.join(dataDir, 'mariadbd.pid')}`,
    `log-error=${path.join(dataDir, 'mariadbd.err')}`,
    `port=${port}`,
    'bind-address=127.0.0.1',
    'skip-name-resolve',
    'character-set-server=utf8mb4',
    'collation-server=utf8mb4_unicode_ci',
    'innodb_buffer_pool_size=64M',
    'innodb_log_file_size=16M',
    'max_connections=300',
    '',
    '[client]',
    `socket=${socketPath(dataDir)}`,
    `port=${port}`,
    '',
  ].join('\n');
}

function socketPath(dataDir: string): string {
  return path.join(dataDir, 'mariadbd.sock');
}

async function prepareDataDir(dataDir: string, fresh: boolean): Promise<void> {
  if (fresh) await fs.rm(dataDir, { recursive: true, force: true });
  try {
    await fs.mkdir(dataDir, { recursive: true });
    await fs.access(dataDir, fs.constants.W_OK);
  } catch (err) {
    throw new StartupError(`the MariaDB data directory ${dataDir} is unusable: ${(err as Error).message}`);
  }
  if (socketPath(dataDir).length > 100) {
    throw new StartupError(`the MariaDB data directory path is too long for a Unix socket (${dataDir}); use a shorter folder`);
  }
}

/** The port recorded by a previous run, so a restart keeps the data where clients expect it. */
async function rememberedPort(dataDir: string): Promise<number | undefined> {
  try {
    const text = await fs.readFile(path.join(dataDir, 'my.cnf'), 'utf8');
    const match = /^port=(\d+)$/m.exec(text);
    return match ? Number(match[1]) : undefined;
  } catch {
    return undefined;
  }
}

async function livePid(dataDir: string): Promise<number | undefined> {
  try {
    const pid = Number((await fs.readFile(path.join(dataDir, 'mariadbd.pid'), 'utf8')).trim());
    if (!Number.isInteger(pid) || pid <= 0) return undefined;
    process.kill(pid, 0);
    return pid;
  } catch {
    return undefined;
  }
}

async function logTail(dataDir: string): Promise<string> {
  try {
    const lines = (await fs.readFile(path.join(dataDir, 'mariadbd.err'), 'utf8')).trim().split('\n');
    return lines.filter((l) => /ERROR|error/.test(l)).slice(-3).join(' | ') || lines.slice(-2).join(' | ');
  } catch {
    return 'no log written';
  }
}

async function waitForExit(pid: number, timeoutMs: number): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    try {
      process.kill(pid, 0);
    } catch {
      return;
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  process.kill(pid, 'SIGKILL');
}

async function ping(optionFile: string): Promise<boolean> {
  try {
    await execFileAsync(findBinary('mariadb-admin'), [`--defaults-file=${optionFile}`, '--protocol=socket', '--connect-timeout=1', 'ping'], { timeout: 3000 });
    return true;
  } catch {
    return false;
  }
}

async function initialise(dataDir: string, optionFile: string): Promise<void> {
  if (existsSync(path.join(dataDir, 'data', 'mysql'))) return;
  try {
    await execFileAsync(findBinary('mariadb-install-db'), [`--defaults-file=${optionFile}`, '--skip-test-db', '--auth-root-authentication-method=socket'], { timeout: 120_000 });
  } catch (err) {
    throw new StartupError(`mariadb-install-db failed in ${dataDir}: ${String((err as { stderr?: string }).stderr ?? err).trim().split('\n').slice(-2).join(' ')}`);
  }
}

async function launch(dataDir: string, optionFile: string, port: number, readyTimeoutS: number): Promise<number> {
  if (await isPortTaken(port)) {
    throw new StartupError(`port ${port} on 127.0.0.1 is taken by another program; set LW_DB_PORT to a free port`);
  }
  const child = spawn(findBinary('mariadbd'), [`--defaults-file=${optionFile}`], { detached: true, stdio: 'ignore' });
  child.unref();
  let exited = false;
  child.once('exit', () => { exited = true; });
  const deadline = Date.now() + readyTimeoutS * 1000;
  while (Date.now() < deadline) {
    if (exited) throw new StartupError(`mariadbd exited at start-up (${await logTail(dataDir)})`);
    if (await ping(optionFile)) return child.pid ?? 0;
    await new Promise((r) => setTimeout(r, 150));
  }
  child.kill('SIGKILL');
  throw new StartupError(`mariadbd did not answer within ${readyTimeoutS} s (${await logTail(dataDir)})`);
}

function sqlString(value: string): string {
  return `'${value.replace(/\\/g, '\\\\').replace(/'/g, "\\'")}'`;
}

/** Names go into SQL text, so they are checked before anything starts. */
function checkCredentials(o: MariaDbOptions): void {
  if (!SAFE_NAME.test(o.database)) throw new StartupError(`database name '${o.database}' must match ${SAFE_NAME}`);
  if (!SAFE_NAME.test(o.user)) throw new StartupError(`database user '${o.user}' must match ${SAFE_NAME}`);
  if (!SAFE_PASSWORD.test(o.password)) throw new StartupError(`database password must match ${SAFE_PASSWORD}`);
}

async function createDatabase(optionFile: string, o: MariaDbOptions): Promise<void> {
  const statements = [
    `CREATE DATABASE IF NOT EXISTS \`${o.database}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`,
    ...['127.0.0.1', 'localhost'].flatMap((host) => [
      `CREATE USER IF NOT EXISTS ${sqlString(o.user)}@${sqlString(host)} IDENTIFIED BY ${sqlString(o.password)}`,
      `ALTER USER ${sqlString(o.user)}@${sqlString(host)} IDENTIFIED BY ${sqlString(o.password)}`,
      `GRANT ALL PRIVILEGES ON \`${o.database}\`.* TO ${sqlString(o.user)}@${sqlString(host)}`,
    ]),
    'FLUSH PRIVILEGES',
  ];
  try {
    await execFileAsync(findBinary('mariadb'), [`--defaults-file=${optionFile}`, '--protocol=socket', '-uroot', '-e', statements.join(';\n')], { timeout: 30_000 });
  } catch (err) {
    throw new StartupError(`could not create database '${o.database}': ${String((err as { stderr?: string }).stderr ?? err).trim()}`);
  }
}

/**
 * Starts (or re-attaches to) a project-local server and makes sure the database and the
 * application user exist. A data directory whose server is still running is reused as it is.
 */
export async function startMariaDb(o: MariaDbOptions): Promise<MariaDbInstance> {
  checkCredentials(o);
  const dataDir = path.resolve(o.dataDir);
  const readyTimeoutS = o.readyTimeoutS ?? 60;
  await prepareDataDir(dataDir, o.fresh ?? false);
  const optionFile = path.join(dataDir, 'my.cnf');
  const previousPort = await rememberedPort(dataDir);
  const running = await livePid(dataDir);
  const port = running && previousPort ? previousPort : o.port || previousPort || (await findFreePort());
  let pid: number;
  if (running && previousPort && (await ping(optionFile))) {
    pid = running;
  } else {
    if (running) await waitForExit(running, 10_000);
    await fs.writeFile(optionFile, optionFileText(dataDir, port));
    await initialise(dataDir, optionFile);
    pid = await launch(dataDir, optionFile, port, readyTimeoutS);
  }
  await createDatabase(optionFile, o);

  const instance: MariaDbInstance = {
    host: '127.0.0.1',
    port,
    socket: socketPath(dataDir),
    database: o.database,
    user: o.user,
    password: o.password,
    async stop() {
      const current = (await livePid(dataDir)) ?? pid;
      try {
        await execFileAsync(findBinary('mariadb-admin'), [`--defaults-file=${optionFile}`, '--protocol=socket', 'shutdown'], { timeout: 30_000 });
      } catch {
        // Already gone or not answering: make sure the process ends all the same.
      }
      await waitForExit(current, 20_000);
    },
    async kill() {
      const current = (await livePid(dataDir)) ?? pid;
      try {
        process.kill(current, 'SIGKILL');
      } catch {
        return;
      }
      await waitForExit(current, 5_000);
    },
    async restart() {
      pid = await launch(dataDir, optionFile, port, readyTimeoutS);
    },
  };
  return instance;
}
