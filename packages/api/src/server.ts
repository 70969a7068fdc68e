/**
 * `node --import tsx src/server.ts`: serves the API and the built web app (LW_APP_DIST) with an SPA
 * fallback for every non-/api path. Waits for MariaDB at start-up instead of failing; afterwards a
 * database outage is answered with 503 and the pool reconnects by itself. With LW_API_PROCESSES > 1
 * it forks that many processes sharing the port (node:cluster); they share nothing but MariaDB.
 */
import cluster from 'node:cluster';
import path from 'node:path';
import { createApp } from './app.ts';
import { ConfigError, describeDefaults, loadConfig, type Config } from './config.ts';
import { createDataSource } from './data-source.ts';
import { serveWebApp } from './web/static.ts';

function log(message: string): void {
  process.stdout.write(`loopwright-api: ${message}\n`);
}

async function initialiseWithRetry(config: Config) {
  for (let attempt = 1; ; attempt += 1) {
    const dataSource = createDataSource(config.db);
    try {
      return await dataSource.initialize();
    } catch (err) {
      if (attempt >= 60) throw err;
      log(`database ${config.db.host}:${config.db.port} not reachable yet (${(err as Error).message}); retrying`);
      await new Promise((resolve) => setTimeout(resolve, 1000));
    }
  }
}

/** The primary only forks and re-forks; each worker serves. */
function superviseWorkers(count: number): void {
  let stopping = false;
  for (let i = 0; i < count; i += 1) cluster.fork();
  cluster.on('exit', (worker, code, signal) => {
    if (stopping) return;
    log(`API process ${worker.process.pid} exited (${signal ?? code}); starting another`);
    cluster.fork();
  });
  const stop = () => {
    stopping = true;
    for (const worker of Object.values(cluster.workers ?? {})) worker?.process.kill('SIGTERM');
    setTimeout(() => process.exit(0), 6000).unref();
    cluster.on('exit', () => {
      if (Object.keys(cluster.workers ?? {}).length === 0) process.exit(0);
    });
  };
  process.once('SIGTERM', stop);
  process.once('SIGINT', stop);
}

async function main(): Promise<void> {
  const config = loadConfig();
  if (cluster.isPrimary && config.processes > 1) {
    for (const line of describeDefaults(config)) log(line);
    log(`starting ${config.processes} API processes`);
    superviseWorkers(config.processes);
    return;
  }
  if (cluster.isPrimary) for (const line of describeDefaults(config)) log(line);
  const dataSource = await initialiseWithRetry(config);
  const built = createApp({ config, dataSource });

  const appDist = path.resolve(process.cwd(), config.appDistDir);
  if (!serveWebApp(built.app, appDist)) {
    log(`no built web app at ${appDist} (build packages/app or set LW_APP_DIST); serving the API only`);
  }

  const server = built.app.listen(config.port, config.host, () => log(`listening on http://${config.host}:${config.port}`));
  const stop = () => {
    server.close(() => {
      void built.close().then(() => dataSource.destroy()).finally(() => process.exit(0));
    });
    setTimeout(() => process.exit(0), 5000).unref();
  };
  process.once('SIGTERM', stop);
  process.once('SIGINT', stop);
}

main().catch((err: unknown) => {
  process.stderr.write(`loopwright-api: error: ${err instanceof ConfigError ? err.message : String((err as Error).stack ?? err)}\n`);
  process.exit(1);
});
