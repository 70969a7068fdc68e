#!/usr/bin/env node
// Entry point of the README's commands (npm start, npm test, npm run bench, npm run loopwright).
// It must run on a fresh Debian 12 machine that has only Node.js and npm, so it is plain JavaScript
// with no dependencies: it installs pnpm, the workspace's packages and the Debian packages the
// command needs, then hands over to the TypeScript script of that command.
// Everything it says goes to stderr, so `npm run -s loopwright` and `npm run -s bench -- --json`
// keep stdout for their JSON.
import { spawn, spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const PNPM_VERSION = '12.4.2';

/** Debian packages each command needs (gcc ships with the machine; listed so a slimmer one gets it). */
const DEBIAN_PACKAGES = {
  // The server verifies every release's reference RTL (GHDL, Icarus) and estimates it (yosys).
  start: ['mariadb-server', 'nginx-light', 'ghdl', 'iverilog', 'yosys'],
  test: ['mariadb-server', 'nginx-light', 'chromium', 'ghdl', 'iverilog', 'verilator', 'yosys', 'python3-scipy', 'gcc'],
  bench: ['mariadb-server', 'nginx-light', 'chromium', 'gcc', 'ghdl', 'iverilog', 'yosys', 'python3-scipy'],
  // verify and estimate use whichever of ghdl, iverilog and yosys are installed; nothing is forced.
  loopwright: [],
};

/** Debian packages single terminal commands need besides their command's (`npm run loopwright -- backup …`). */
const VERB_PACKAGES = {
  backup: ['mariadb-client'],
  restore: ['mariadb-client'],
};

/** The tsconfig tsx compiles a command with, when not the nearest one (the API's TypeORM entities need its decorator settings). */
const TSCONFIGS = {
  loopwright: 'packages/api/tsconfig.json',
};

/** The TypeScript entry of each command, run under tsx. */
const ENTRIES = {
  start: 'scripts/start.ts',
  test: 'scripts/test.ts',
  bench: 'scripts/bench.ts',
  loopwright: 'packages/api/src/cli/main.ts',
};

function say(message) {
  process.stderr.write(`loopwright: ${message}\n`);
}

function fail(message) {
  say(`error: ${message}`);
  process.exit(1);
}

function run(cmd, args, options = {}) {
  return spawnSync(cmd, args, { cwd: ROOT, stdio: ['ignore', 'pipe', 'pipe'], encoding: 'utf8', ...options });
}

function lastLine(text) {
  return String(text ?? '').trim().split('\n').filter(Boolean).slice(-1)[0] ?? '';
}

function ensurePnpm() {
  const probe = run('pnpm', ['--version']);
  if (probe.status === 0 && probe.stdout.trim() === PNPM_VERSION) return;
  say(`installing pnpm ${PNPM_VERSION} from the npm registry`);
  const result = run('npm', ['install', '--global', `pnpm@${PNPM_VERSION}`], { stdio: ['ignore', 2, 2] });
  if (result.status !== 0) fail(`npm could not install pnpm@${PNPM_VERSION} (exit ${result.status})`);
}

/** A digest of everything that decides what pnpm installs; unchanged digest = nothing to do. */
function installDigest() {
  const hash = createHash('sha256');
  for (const file of ['pnpm-lock.yaml', 'pnpm-workspace.yaml', 'package.json', 'packages/dsp/package.json', 'packages/contract/package.json', 'packages/api/package.json', 'packages/app/package.json']) {
    const full = path.join(ROOT, file);
    hash.update(file).update(existsSync(full) ? readFileSync(full) : '');
  }
  return hash.digest('hex');
}

function ensureDependencies() {
  const stamp = path.join(ROOT, 'node_modules', '.loopwright-install');
  const digest = installDigest();
  if (existsSync(stamp) && readFileSync(stamp, 'utf8') === digest) return;
  say('installing the workspace packages with pnpm');
  const args = ['install', '--prefer-offline', ...(existsSync(path.join(ROOT, 'pnpm-lock.yaml')) ? ['--frozen-lockfile'] : [])];
  const result = run('pnpm', args, { stdio: ['ignore', 2, 2] });
  if (result.status !== 0) fail(`pnpm install failed (exit ${result.status}); see the lines above`);
  writeFileSync(stamp, installDigest());
}

function missingDebianPackages(packages) {
  return packages.filter((name) => {
    const probe = run('dpkg-query', ['-W', '-f=${Status}', name]);
    return probe.status !== 0 || !probe.stdout.includes('install ok installed');
  });
}

function ensureDebianPackages(packages) {
  const missing = missingDebianPackages(packages);
  if (missing.length === 0) return;
  const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;
  const prefix = isRoot ? [] : ['sudo', '-n'];
  if (!isRoot && run('sudo', ['-n', 'true']).status !== 0) {
    fail(`Debian packages missing: ${missing.join(', ')}; run as root or install them with apt-get`);
  }
  say(`installing Debian packages: ${missing.join(', ')}`);
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  const [cmd, ...rest] = [...prefix, 'apt-get'];
  const update = run(cmd, [...rest, 'update', '-qq'], { env });
  if (update.status !== 0) fail(`apt-get update failed: ${lastLine(update.stderr) || `exit ${update.status}`}`);
  const install = run(cmd, [...rest, 'install', '-y', '-qq', '--no-install-recommends', ...missing], { env });
  if (install.status !== 0) {
    fail(`apt-get could not install ${missing.join(', ')}: ${lastLine(install.stderr) || `exit ${install.status}`}`);
  }
}

function main() {
  const [command, ...args] = process.argv.slice(2);
  if (!command || !(command in ENTRIES)) fail(`unknown command '${command ?? ''}'; use start, test, bench or loopwright`);
  ensurePnpm();
  ensureDependencies();
  ensureDebianPackages([...DEBIAN_PACKAGES[command], ...(command === 'loopwright' ? (VERB_PACKAGES[args[0]] ?? []) : [])]);
  const tsconfig = TSCONFIGS[command] ? { TSX_TSCONFIG_PATH: path.join(ROOT, TSCONFIGS[command]) } : {};
  const child = spawn(process.execPath, ['--import', 'tsx', ENTRIES[command], ...args], {
    cwd: ROOT,
    stdio: 'inherit',
    env: { ...process.env, INIT_CWD: process.env.INIT_CWD ?? process.cwd(), ...tsconfig },
  });
  // Ctrl-C reaches the child too (same process group); pass signals on and wait for it to clean up.
  // The child's handlers are idempotent, so a second copy of the same signal does no harm.
  for (const signal of ['SIGINT', 'SIGTERM', 'SIGHUP']) process.on(signal, () => child.kill(signal));
  child.on('exit', (code, signal) => process.exit(code ?? (signal ? 130 : 1)));
}

main();
