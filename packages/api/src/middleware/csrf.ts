import type { RequestHandler } from 'express';
import { CSRF_HEADER, CSRF_HEADER_VALUE } from '@loopwright/contract';
import { AppError } from '../errors.ts';

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

/**
 * CSRF defence for cookie-authenticated, state-changing requests: a custom header that a cross-site
 * form cannot set and a cross-site script cannot send without a CORS preflight (which this API never
 * grants), plus a same-origin check on the Origin header when the browser sends one. SameSite=Lax
 * cookies are a further layer. Routes whose authority is a secret token in the URL opt out.
 */
export const requireCsrfHeader: RequestHandler = (req, _res, next) => {
  if (SAFE_METHODS.has(req.method)) return next();
  if (req.get(CSRF_HEADER)?.toLowerCase() !== CSRF_HEADER_VALUE) {
    return next(new AppError('csrf_rejected', `state-changing requests must send the header ${CSRF_HEADER}: ${CSRF_HEADER_VALUE}`, 403));
  }
  // req.protocol and req.host honour X-Forwarded-Proto/-Host when LW_TRUST_PROXY is on, so a proxy
  // that terminates TLS or rewrites Host still matches.
  return next(originMismatch(req.get('origin'), req.protocol, req.host) ? new AppError('csrf_rejected', 'cross-origin request refused', 403) : undefined);
};

/**
 * True unless `origin` is the origin the request reached: the same scheme, host and port (RFC 6454
 * §4; a page on https://h is another origin than the API on http://h). Default ports compare equal
 * (URL drops them from both sides).
 */
export function originMismatch(origin: string | undefined, protocol: string, host: string | undefined): boolean {
  if (origin === undefined) return false;
  if (origin === 'null' || host === undefined) return true;
  try {
    return new URL(origin).origin !== new URL(`${protocol}://${host}`).origin;
  } catch {
    return true;
  }
}
