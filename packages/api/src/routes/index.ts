import type { RequestHandler } from 'express';
import type { Authenticator } from '../middleware/auth.ts';
import { analysisRoutes } from './analysis.ts';
import { auditRoutes } from './audit.ts';
import { designRoutes } from './designs.ts';
import { healthRoutes } from './health.ts';
import { projectRoutes } from './projects.ts';
import { sessionRoutes } from './session.ts';
import type { RouteSpec } from './table.ts';
import { userRoutes } from './users.ts';
import { releaseRoutes } from '../releases/routes.ts';

/** Rate limiters of the public routes (counters in MariaDB). */
export interface RouteLimiters {
  readonly signIn: RequestHandler;
  readonly reviewLink: RequestHandler;
}

/** Every API route, in one table (path relative to /api). Other modules add theirs here. */
export function apiRoutes(auth: Authenticator, limiters: RouteLimiters, extra: readonly RouteSpec[] = []): RouteSpec[] {
  return [...healthRoutes, ...sessionRoutes(auth, limiters.signIn), ...userRoutes, ...projectRoutes, ...designRoutes, ...analysisRoutes, ...auditRoutes, ...releaseRoutes(limiters.reviewLink), ...extra];
}
