import express, { type Request, type RequestHandler, type Response, type Router } from 'express';
import multer from 'multer';
import { plainMessages } from '@loopwright/dsp';
import { z } from 'zod';
import type { Role, SessionUser } from '@loopwright/contract';
import { EncodedJson } from '../encodedJson.ts';
import { AppError, forbidden, issuesError, unauthenticated } from '../errors.ts';
import { requireCsrfHeader } from '../middleware/csrf.ts';
import type { AuditActor } from '../services/audit.ts';
import type { Services } from '../services/index.ts';

export type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';

/** 'public': anyone; 'signed-in': any account; a list: an account holding at least one of the roles. */
export type Access = 'public' | 'signed-in' | readonly Role[];

export interface RouteContext<P, Q, B> {
  readonly params: P;
  readonly query: Q;
  readonly body: B;
  /** The signed-in user; reading it on a public route without a session throws 401. */
  readonly user: SessionUser;
  readonly signedIn: boolean;
  readonly actor: AuditActor;
  readonly file: Express.Multer.File | undefined;
  readonly services: Services;
  readonly req: Request;
  readonly res: Response;
}

/** An upload the multipart parser refused, with who sent it and to which path. */
export interface UploadRefusal {
  readonly services: Services;
  readonly user: SessionUser | undefined;
  readonly actor: AuditActor;
  readonly params: Readonly<Record<string, string | string[] | undefined>>;
  readonly error: unknown;
}

export interface RouteSpec<P extends z.ZodType = z.ZodType, Q extends z.ZodType = z.ZodType, B extends z.ZodType = z.ZodType> {
  readonly method: Method;
  /** Relative to /api. */
  readonly path: string;
  readonly access: Access;
  readonly summary: string;
  readonly params?: P;
  readonly query?: Q;
  readonly body?: B;
  /**
   * Multipart upload of one file in this field (memory storage, size-limited; limitBytes overrides the
   * default). `onRefused` is told of an upload the multipart parser refuses (too large, a wrong field)
   * before the error answers the request, so a route can keep a record of it.
   */
  readonly upload?: { readonly field: string; readonly limitBytes?: number; readonly onRefused?: (refusal: UploadRefusal) => Promise<void> };
  /** 'token': the URL carries a secret token that is the authority, so the CSRF header is not required. */
  readonly csrf?: 'header' | 'token';
  /** Extra middleware run after the access check and before validation (e.g. a rate limiter). */
  readonly before?: readonly RequestHandler[];
  /** Status of a successful reply that has a body (default 200; 204 when the handler returns nothing). */
  readonly status?: number;
  readonly handler: (ctx: RouteContext<z.output<P>, z.output<Q>, z.output<B>>) => unknown;
}

/** Identity with inference: declare a route and keep its handler's types. */
export function route<P extends z.ZodType = z.ZodUndefined, Q extends z.ZodType = z.ZodUndefined, B extends z.ZodType = z.ZodUndefined>(
  spec: RouteSpec<P, Q, B>,
): RouteSpec {
  return spec as unknown as RouteSpec;
}

export function accessAllows(access: Access, user: SessionUser | undefined): 'ok' | 'unauthenticated' | 'forbidden' {
  if (access === 'public') return 'ok';
  if (!user) return 'unauthenticated';
  if (access === 'signed-in') return 'ok';
  return access.some((role) => user.roles.includes(role)) ? 'ok' : 'forbidden';
}

function checkAccess(access: Access): RequestHandler {
  return (req, _res, next) => {
    const verdict = accessAllows(access, req.user);
    if (verdict === 'unauthenticated') return next(unauthenticated());
    if (verdict === 'forbidden') return next(forbidden(`this needs one of the roles: ${(access as readonly Role[]).join(', ')}`));
    return next();
  };
}

/** One request-schema issue as `{ field, message }`: "spec.filter.tau1S: expected number" (an unknown key is the field it names). */
function requestIssue(i: z.core.$ZodIssue, prefix: string): { field: string; message: string } {
  const where = [prefix, ...i.path.map(String)].filter((part) => part !== '').join('.');
  const unknown = i.code === 'unrecognized_keys';
  const text = unknown ? `unknown field(s): ${i.keys.join(', ')}` : i.message;
  const field = unknown ? [where, i.keys[0] ?? ''].filter((part) => part !== '').join('.') : where;
  return { field, message: where ? `${where}: ${text}` : text };
}

/** The first five issues of a request schema, through the one issues-to-error mapping (errors.ts). */
export function zodToAppError(error: z.ZodError, prefix: string): AppError {
  return issuesError(error.issues.slice(0, 5).map((i) => requestIssue(i, prefix)), '');
}

function parsePart(schema: z.ZodType | undefined, value: unknown, prefix: string): unknown {
  if (!schema) return undefined;
  const parsed = schema.safeParse(value, { error: plainMessages });
  if (!parsed.success) throw zodToAppError(parsed.error, prefix);
  return parsed.data;
}

const EMPTY = z.strictObject({});

function actorOf(req: Request): AuditActor {
  return { id: req.user?.id ?? null, email: req.user?.email ?? null, ip: req.ip ?? null, organizationId: req.user?.organizationId ?? null };
}

function run(spec: RouteSpec, services: Services): RequestHandler {
  return async (req, res) => {
    // req.is() is null for a request without a body and false for a body of another type.
    if (spec.body && !spec.upload && req.is(['application/json', 'application/*+json']) === false) {
      throw new AppError('unsupported_media_type', 'send the body as application/json', 415);
    }
    // Path parameters and query strings are validated even when a route declares none, so
    // `?foo=1` on a route without a query is a 400 naming foo, not silently ignored.
    const params = parsePart(spec.params ?? EMPTY, { ...req.params }, '');
    const query = parsePart(spec.query ?? EMPTY, { ...req.query }, '');
    const body = spec.body ? parsePart(spec.body, req.body ?? {}, '') : undefined;
    const ctx: RouteContext<unknown, unknown, unknown> = {
      params,
      query,
      body,
      get user(): SessionUser {
        if (!req.user) throw unauthenticated();
        return req.user;
      },
      signedIn: req.user !== undefined,
      actor: actorOf(req),
      file: req.file,
      services,
      req,
      res,
    };
    const result = await spec.handler(ctx);
    if (res.headersSent) return;
    if (result === undefined) res.status(204).end();
    // The header res.json would set, then the bytes as they are (encodedJson.ts).
    else if (result instanceof EncodedJson) res.status(spec.status ?? 200).set('Content-Type', 'application/json; charset=utf-8').send(result.bytes);
    else res.status(spec.status ?? 200).json(result);
  };
}

export interface RouterOptions {
  readonly uploadLimitBytes: number;
}

/** Mounts a table of routes: CSRF check, access check, extra middleware, upload, validation, handler. */
export function mountRoutes(router: Router, routes: readonly RouteSpec[], services: Services, options: RouterOptions): void {
  const uploader = (fileSize: number) => multer({ storage: multer.memoryStorage(), limits: { fileSize, files: 1, fields: 10, parts: 11 } });
  const upload = uploader(options.uploadLimitBytes);
  for (const spec of routes) {
    const chain: RequestHandler[] = [];
    if (spec.csrf !== 'token') chain.push(requireCsrfHeader);
    chain.push(checkAccess(spec.access), ...(spec.before ?? []));
    if (spec.upload) {
      const single = (spec.upload.limitBytes === undefined ? upload : uploader(spec.upload.limitBytes)).single(spec.upload.field);
      const onRefused = spec.upload.onRefused;
      chain.push(
        onRefused
          ? (req, res, next) =>
              single(req, res, (err?: unknown) => {
                if (!err) return next();
                // The record is best effort: the refusal answers the request whether or not it was written.
                onRefused({ services, user: req.user, actor: actorOf(req), params: { ...req.params }, error: err }).then(
                  () => next(err),
                  () => next(err),
                );
              })
          : single,
      );
    }
    chain.push(run(spec, services));
    router[spec.method](spec.path, ...chain);
  }
}

export function jsonBody(limitBytes: number): RequestHandler {
  return express.json({ limit: limitBytes, strict: true, type: ['application/json', 'application/*+json'] });
}
