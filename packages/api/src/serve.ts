/**
 * One serving process: the API and the built web app (LW_APP_DIST, with an SPA fallback for every
 * non-/api path) on LW_HOST:PORT. src/server.ts starts these and supervises them; run alone
 * (`node --import tsx src/serve.ts`) it is a single process with nobody to restart it.
 *
 * Waits for MariaDB at start-up instead of failing; afterwards a database outage is answered with 503
 * and the pool reconnects by itself. Once it listens it tells its supervisor which port it got (the
 * balancer's processes start on port 0 and keep that port when they are restarted).
 */
import path from 'node:path';
import { createApp } from './app.ts';
import { ConfigError, loadConfig, type Config } from './config.ts';
import { createDataSource } from './data-source.ts';
import { LISTENING_MESSAGE, type ListeningMessage } from './processes/messages.ts';
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

async function main(): Promise<void> {
  const config = loadConfig();
  const dataSource = await initialiseWithRetry(config);
  const built = createApp({ config, dataSource });
  const name = config.processName ?? 'api';

  const appDist = path.resolve(process.cwd(), config.appDistDir);
  if (!serveWebApp(built.app, appDist)) {
    log(`no built web app at ${appDist} (build packages/app or set LW_APP_DIST); serving the API only`);
  }

  const server = built.app.listen(config.port, config.host, () => {
    const address = server.address();
    const port = typeof address === 'object' && address ? address.port : config.port;
    log(`${name} (pid ${process.pid}) listening on http://${config.host}:${port}`);
    const message: ListeningMessage = { type: LISTENING_MESSAGE, port };
    process.send?.(message);
  });
  let stopping = false;
  const stop = () => {
    if (stopping) return;
    stopping = true;
    server.close(() => {
      void built.close().then(() => dataSource.destroy()).finally(() => process.exit(0));
    });
    setTimeout(() => process.exit(0), 5000).unref();
  };
  process.once('SIGTERM', stop);
  process.once('SIGINT', stop);
  // A supervisor that died without stopping us (SIGKILL) leaves no one to restart or stop this
  // process: end with it rather than serve on unsupervised.
  process.once('disconnect', stop);
}

main().catch((err: unknown) => {
  process.stderr.write(`loopwright-api: error: ${err instanceof ConfigError ? err.message : String((err as Error).stack ?? err)}\n`);
  process.exit(1);
});
