import type { Request, RequestHandler, Response } from 'express';
import session from 'express-session';
import MySQLStoreFactory from 'express-mysql-session';
import { rateLimit, ipKeyGenerator } from 'express-rate-limit';
import { Passport } from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import type { DataSource } from 'typeorm';
import type { Config } from '../config.ts';
import type { SessionUser } from '@loopwright/contract';
import { AppError } from '../errors.ts';
import { MariaDbRateLimitStore } from '../services/rateLimitStore.ts';
import type { UserService } from '../services/users.ts';

export const SESSION_COOKIE = 'lw.sid';

const MySQLStore = MySQLStoreFactory(session);
type SessionStore = InstanceType<typeof MySQLStore>;

/**
 * Sessions live in MariaDB (express-mysql-session over TypeORM's own mysql2 pool), so any API process
 * can serve any request. The session keeps the SessionUser, so an authenticated request costs one
 * primary-key read of the session row and no user query; disabling or re-roling an account deletes its
 * session rows (services/sessions.ts), which is what makes the cached roles safe.
 */
export class Authenticator {
  readonly passport = new Passport();
  readonly store: SessionStore;
  readonly sessionMiddleware: RequestHandler;

  constructor(dataSource: DataSource, users: UserService, config: Config) {
    const pool = (dataSource.driver as unknown as { pool: unknown }).pool;
    this.store = new MySQLStore(
      {
        createDatabaseTable: false, // made by a migration
        clearExpired: true,
        checkExpirationInterval: 15 * 60 * 1000,
        expiration: config.session.maxAgeS * 1000,
        // Expiry is absolute (set at sign-in), which spares an UPDATE on every request.
        disableTouch: true,
      },
      pool as never,
    );
    this.sessionMiddleware = session({
      name: SESSION_COOKIE,
      secret: config.session.secret,
      store: this.store,
      resave: false,
      saveUninitialized: false,
      rolling: false,
      unset: 'destroy',
      cookie: {
        httpOnly: true,
        sameSite: 'lax',
        secure: config.session.cookieSecure,
        maxAge: config.session.maxAgeS * 1000,
        path: '/',
      },
    });
    this.passport.use(
      new LocalStrategy({ usernameField: 'email', passwordField: 'password', session: true }, (email, password, done) => {
        users.verifyCredentials(email, password).then((user) => done(null, user ?? false), done);
      }),
    );
    this.passport.serializeUser<SessionUser>((user, done) => done(null, { ...(user as SessionUser) }));
    this.passport.deserializeUser<SessionUser>((user, done) => done(null, user));
  }

  /** passport.session() reads the user out of the session; nothing else is loaded. */
  middleware(): RequestHandler[] {
    return [this.sessionMiddleware, this.passport.initialize(), this.passport.session()];
  }

  /** Checks the credentials with the local strategy and, if right, starts a fresh session. */
  signIn(req: Request, res: Response): Promise<SessionUser | null> {
    return new Promise((resolve, reject) => {
      this.passport.authenticate('local', { session: true }, (err: unknown, user: SessionUser | false) => {
        if (err) return reject(err);
        if (!user) return resolve(null);
        // req.logIn regenerates the session id first (passport ≥ 0.6), against session fixation.
        req.logIn(user, (loginErr) => (loginErr ? reject(loginErr) : resolve(user)));
      })(req, res, reject);
    });
  }

  signOut(req: Request, res: Response): Promise<void> {
    res.clearCookie(SESSION_COOKIE, { path: '/', httpOnly: true, sameSite: 'lax', secure: req.secure });
    if (!req.session) return Promise.resolve();
    return new Promise((resolve, reject) => req.session.destroy((err) => (err ? reject(err) : resolve())));
  }

  async close(): Promise<void> {
    // The pool belongs to TypeORM (endConnectionOnClose is off for a passed pool); this stops the timer.
    await this.store.close();
  }
}

/**
 * Sign-in attempts per client address and e-mail, counted in MariaDB so every process shares them;
 * successful sign-ins do not count.
 */
export function signInRateLimiter(dataSource: DataSource, config: Config): RequestHandler {
  return rateLimit({
    windowMs: config.signIn.windowS * 1000,
    limit: config.signIn.limitPerWindow,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    store: new MariaDbRateLimitStore(dataSource, 'sign-in'),
    keyGenerator: (req) => {
      const email = typeof req.body?.email === 'string' ? req.body.email.toLowerCase().slice(0, 254) : '';
      return `${ipKeyGenerator(req.ip ?? 'unknown')}|${email}`;
    },
    handler: (_req, _res, next, options) => {
      next(new AppError('rate_limited', `too many sign-in attempts; try again in ${Math.ceil(options.windowMs / 60_000)} minutes`, 429));
    },
  });
}

/**
 * Refused review-link requests (unknown, tampered, replayed … tokens) per client address, counted in
 * MariaDB like sign-in: guessing tokens is bounded, and so is what it writes to the audit trail.
 * Signed-in requests are not anonymous and are not counted; neither are requests that succeed.
 */
export function reviewLinkRateLimiter(dataSource: DataSource, config: Config): RequestHandler {
  return rateLimit({
    windowMs: config.reviewLinks.windowS * 1000,
    limit: config.reviewLinks.limitPerWindow,
    skipSuccessfulRequests: true,
    skip: (req) => req.user !== undefined,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    store: new MariaDbRateLimitStore(dataSource, 'review-link'),
    keyGenerator: (req) => ipKeyGenerator(req.ip ?? 'unknown'),
    handler: (_req, _res, next, options) => {
      next(new AppError('rate_limited', `too many refused review-link requests from this address; try again in ${Math.ceil(options.windowMs / 60_000)} minutes`, 429));
    },
  });
}
