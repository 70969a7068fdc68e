import express, { type Express, type Router } from 'express';
import helmet from 'helmet';
import type { DataSource } from 'typeorm';
import type { Config } from './config.ts';
import { Authenticator, reviewLinkRateLimiter, signInRateLimiter } from './middleware/auth.ts';
import { apiNotFound, errorHandler } from './middleware/errors.ts';
import { apiRoutes } from './routes/index.ts';
import { jsonBody, mountRoutes, type RouteSpec } from './routes/table.ts';
import { createServices, type Services } from './services/index.ts';

/** Response header naming the serving process (LW_PROCESS_NAME, set by the supervisor). */
export const PROCESS_HEADER = 'X-Loopwright-Process';

export interface AppOptions {
  readonly config: Config;
  /** An initialised DataSource (see data-source.ts). */
  readonly dataSource: DataSource;
  /** Routes of other modules, mounted under /api with the same table rules. */
  readonly extraRoutes?: readonly RouteSpec[];
  readonly log?: (message: string, err?: unknown) => void;
}

export interface BuiltApp {
  readonly app: Express;
  readonly services: Services;
  readonly routes: readonly RouteSpec[];
  /** The router holding every /api route (the route-table test walks it). */
  readonly apiRouter: Router;
  close(): Promise<void>;
}

function defaultLog(message: string, err?: unknown): void {
  const detail = err instanceof Error ? ` — ${err.name}: ${err.message}` : '';
  process.stderr.write(`loopwright-api: ${message}${detail}\n`);
}

/** Builds the Express app; listening is server.ts's job, so tests drive it with supertest. */
export function createApp(options: AppOptions): BuiltApp {
  const { config, dataSource } = options;
  const log = options.log ?? defaultLog;
  const services = createServices(dataSource, config);
  const auth = new Authenticator(dataSource, services.users, config);
  const limiters = { signIn: signInRateLimiter(dataSource, config), reviewLink: reviewLinkRateLimiter(dataSource, config) };
  const routes = apiRoutes(auth, limiters, options.extraRoutes);

  const app = express();
  app.set('trust proxy', config.trustProxy);
  app.set('query parser', 'simple');
  app.disable('x-powered-by');
  // API answers are no-store, so an ETag (a SHA-1 of every body) would be computed for nothing.
  app.set('etag', false);
  if (config.processName !== undefined) {
    // Names the serving process on every answer, so it is visible which process behind the balancer served what.
    const name = config.processName;
    app.use((_req, res, next) => {
      res.set(PROCESS_HEADER, name);
      next();
    });
  }
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          // Helmet's default asks browsers to fetch every subresource over HTTPS, which breaks a team
          // server reached over plain HTTP; ask for it only when the deployment says it has HTTPS.
          upgradeInsecureRequests: config.session.cookieSecure ? [] : null,
          // The editor's worker compiles the bit-true kernel (packages/dsp, WebAssembly); this allows
          // compiling WebAssembly only, not eval of script text.
          scriptSrc: ["'self'", "'wasm-unsafe-eval'"],
        },
      },
    }),
  );

  const apiRouter = express.Router();
  mountRoutes(apiRouter, routes, services, { uploadLimitBytes: config.uploadLimitBytes });
  app.use('/api', (_req, res, next) => {
    res.set('Cache-Control', 'no-store');
    next();
  });
  app.use('/api', jsonBody(config.bodyLimitBytes), ...auth.middleware(), apiRouter);
  app.use('/api', apiNotFound);
  app.use(errorHandler(log));

  return {
    app,
    services,
    routes,
    apiRouter,
    async close() {
      await auth.close();
      await services.compute.close();
      services.handoff.close();
    },
  };
}
