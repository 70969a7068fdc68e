import type { RequestHandler } from 'express';
import { passwordChangeRequestSchema, signInRequestSchema, type CurrentSessionResponse, type SessionResponse, type SessionUser } from '@loopwright/contract';
import { unauthenticated } from '../errors.ts';
import type { Authenticator } from '../middleware/auth.ts';
import { route, type RouteSpec } from './table.ts';

export function sessionRoutes(auth: Authenticator, signInLimiter: RequestHandler): RouteSpec[] {
  return [
    route({
      method: 'get',
      path: '/session',
      // Public: "nobody is signed in" is an answer, not a failure, so the signed-out sign-in page
      // logs no 401 in the browser console on every load.
      access: 'public',
      summary: 'who am I ({user: null} when signed out)',
      handler: (ctx): CurrentSessionResponse => ({ user: ctx.signedIn ? ctx.user : null }),
    }),
    route({
      method: 'post',
      path: '/session',
      access: 'public',
      summary: 'sign in with e-mail and password (rate-limited)',
      before: [signInLimiter],
      body: signInRequestSchema,
      handler: async ({ req, res, services, actor, body }): Promise<SessionResponse> => {
        const user: SessionUser | null = await auth.signIn(req, res);
        if (!user) {
          // Filed under the named account's organisation, so its admins see attempts on their accounts.
          const named = await services.users.findByEmail(body.email);
          await services.audit.record(
            { ...actor, organizationId: named?.organizationId ?? null },
            { action: 'session.sign-in-failed', objectType: 'user', objectId: named?.id ?? null, detail: { email: body.email } },
          );
          throw unauthenticated('wrong e-mail or password, or the account is disabled');
        }
        await services.audit.record({ ...actor, id: user.id, email: user.email, organizationId: user.organizationId }, { action: 'session.sign-in', objectType: 'user', objectId: user.id });
        return { user };
      },
    }),
    route({
      method: 'delete',
      path: '/session',
      access: 'public',
      summary: 'sign out (ends the session; harmless when signed out)',
      handler: async ({ req, res, services, actor, signedIn }) => {
        if (signedIn) await services.audit.record(actor, { action: 'session.sign-out', objectType: 'user', objectId: actor.id });
        await auth.signOut(req, res);
      },
    }),
    route({
      method: 'put',
      path: '/session/password',
      access: 'signed-in',
      summary: 'change my password (ends my other sessions)',
      body: passwordChangeRequestSchema,
      handler: async ({ user, body, services, actor, req }) => {
        await services.users.changePassword(user.id, body.currentPassword, body.newPassword, req.sessionID, actor);
      },
    }),
  ];
}
