/**
 * `node --import tsx src/server.ts`: the Loopwright server. This process only supervises: it starts
 * LW_API_PROCESSES serving processes (src/serve.ts; nothing shared between them but MariaDB), each
 * with a larger young generation, and starts one again when it dies.
 *
 * - LW_BALANCER=none (default): the processes share PORT through node:cluster.
 * - LW_BALANCER=nginx: each process listens on a loopback port of its own, and Debian's nginx,
 *   configured under LW_DATA_DIR/balancer, is the public LW_HOST:PORT, round-robin, no stickiness.
 */
import cluster from 'node:cluster';
import { fork, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { CONFORMANCE_UPLOAD_LIMIT_BYTES } from '@loopwright/contract';
import { ConfigError, describeDefaults, loadConfig, type Config } from './config.ts';
import { nginxSlot } from './processes/nginx.ts';
import { listeningPort, Supervisor, type SlotSpec } from './processes/supervisor.ts';

const SERVE_ENTRY = path.join(path.dirname(fileURLToPath(import.meta.url)), 'serve.ts');

function log(message: string): void {
  process.stdout.write(`loopwright-api: ${message}\n`);
}

/**
 * Each request allocates many short-lived objects (HTTP, session, mysql2 packets); a larger semi-space
 * lets more of them die young. In the benchmark it cut the API's CPU per request by about a sixth.
 */
const SEMI_SPACE_MB = 64;
const SERVE_EXEC_ARGV = [...process.execArgv, `--max-semi-space-size=${SEMI_SPACE_MB}`];
/** A serving process waits up to a minute for MariaDB at start-up; allow that and its own start. */
const READY_TIMEOUT_MS = 120_000;

const processName = (i: number) => `api-${i + 1}`;

/** node:cluster workers sharing PORT. */
function clusterSlots(config: Config): SlotSpec[] {
  cluster.setupPrimary({ exec: SERVE_ENTRY, execArgv: SERVE_EXEC_ARGV });
  return Array.from({ length: config.processes }, (_, i) => ({
    name: processName(i),
    start: () => cluster.fork({ LW_PROCESS_NAME: processName(i) }).process,
    ready: async (child: ChildProcess) => void (await listeningPort(child, READY_TIMEOUT_MS)),
  }));
}

/**
 * Processes on loopback ports of their own for the balancer. Each first starts on port 0 (the system
 * picks a free one) and is started again on the port it got, which is the one nginx knows.
 */
function backendSlots(config: Config): { slots: SlotSpec[]; ports: number[] } {
  const ports: number[] = [];
  const slots = Array.from({ length: config.processes }, (_, i): SlotSpec => ({
    name: processName(i),
    start: () =>
      fork(SERVE_ENTRY, [], {
        execArgv: SERVE_EXEC_ARGV,
        env: {
          ...process.env,
          LW_PROCESS_NAME: processName(i),
          LW_HOST: '127.0.0.1',
          PORT: String(ports[i] ?? 0),
          // Only the balancer on this machine may say who the client is (rate limits, audit addresses).
          LW_TRUST_PROXY: process.env.LW_TRUST_PROXY ?? 'loopback',
        },
      }),
    ready: async (child) => {
      ports[i] = await listeningPort(child, READY_TIMEOUT_MS);
    },
  }));
  return { slots, ports };
}

async function main(): Promise<void> {
  const config = loadConfig();
  for (const line of describeDefaults(config)) log(line);
  const supervisor = new Supervisor(log, (message) => {
    log(`error: ${message}; stopping`);
    process.exit(1);
  });
  let stopping = false;
  const stop = () => {
    if (stopping) return;
    stopping = true;
    void supervisor.stop().then(() => process.exit(process.exitCode ?? 0));
  };
  process.once('SIGTERM', stop);
  process.once('SIGINT', stop);

  try {
    if (config.balancer === 'nginx') {
      const backends = backendSlots(config);
      log(`starting ${config.processes} API process${config.processes > 1 ? 'es' : ''} behind nginx`);
      await supervisor.add(backends.slots);
      const dir = path.resolve(process.cwd(), config.dataDir, 'balancer');
      const slot = await nginxSlot(
        {
          host: config.host,
          port: config.port,
          backendPorts: backends.ports,
          dir,
          maxBodyBytes: 2 * Math.max(config.bodyLimitBytes, config.uploadLimitBytes, CONFORMANCE_UPLOAD_LIMIT_BYTES),
          readTimeoutS: config.compute.timeoutS + 30,
        },
        READY_TIMEOUT_MS,
      );
      await supervisor.add([slot]);
      log(`nginx on http://${config.host}:${config.port} → ${backends.ports.map((p) => `127.0.0.1:${p}`).join(', ')} (configuration in ${dir})`);
    } else {
      if (config.processes > 1) log(`starting ${config.processes} API processes on one port`);
      await supervisor.add(clusterSlots(config));
    }
  } catch (err) {
    // A SIGTERM during start-up makes the starts give up; that stop then ends the server, with code 0.
    if (stopping) return;
    log(`error: ${(err as Error).message}; stopping`);
    await supervisor.stop();
    process.exit(1);
  }
}

main().catch((err: unknown) => {
  process.stderr.write(`loopwright-api: error: ${err instanceof ConfigError ? err.message : String((err as Error).stack ?? err)}\n`);
  process.exit(1);
});
