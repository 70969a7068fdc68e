import { availableParallelism } from 'node:os';
import path from 'node:path';
import { z } from 'zod';

/**
 * Settings come only from the environment. Every key names its unit. Development defaults are safe
 * (loopback only, a throwaway session secret) and are reported so start-up can print which ones applied.
 */
const DEV_SESSION_SECRET = 'loopwright-development-session-secret-not-for-production';

const int = (min: number, max: number) => z.coerce.number().int().min(min).max(max);
const flag = z.enum(['true', 'false', '1', '0']).transform((value) => value === 'true' || value === '1');

const envSchema = z.object({
  NODE_ENV: z.enum(['development', 'test', 'production']).default('development'),
  PORT: int(0, 65_535).default(8080),
  LW_HOST: z.string().min(1).default('127.0.0.1'),
  LW_APP_DIST: z.string().min(1).default('../app/dist'),
  /** The content-addressed store of release file bytes (storage/fileStore.ts); default LW_DATA_DIR/files. */
  LW_FILE_STORE_DIR: z.string().min(1).optional(),
  LW_DB_HOST: z.string().min(1).default('127.0.0.1'),
  LW_DB_PORT: int(1, 65_535).default(3307),
  LW_DB_USER: z.string().min(1).default('loopwright'),
  LW_DB_PASSWORD: z.string().default('loopwright-dev'),
  LW_DB_NAME: z.string().regex(/^[A-Za-z0-9_]{1,64}$/).default('loopwright'),
  LW_DB_POOL_SIZE: int(1, 200).default(20),
  LW_DB_CONNECT_TIMEOUT_MS: int(100, 60_000).default(2_000),
  LW_SESSION_SECRET: z.string().min(32).default(DEV_SESSION_SECRET),
  LW_SESSION_MAX_AGE_S: int(60, 30 * 24 * 3600).default(12 * 3600),
  LW_COOKIE_SECURE: flag.default(false),
  LW_BODY_LIMIT_BYTES: int(1_024, 50_000_000).default(256 * 1024),
  LW_UPLOAD_LIMIT_BYTES: int(1_024, 50_000_000).default(256 * 1024),
  LW_SIGNIN_LIMIT_PER_WINDOW: int(1, 10_000).default(10),
  LW_SIGNIN_WINDOW_S: int(1, 24 * 3600).default(15 * 60),
  /** Refused review-link requests allowed per client address per window (anonymous requests only). */
  LW_REVIEW_LINK_LIMIT_PER_WINDOW: int(1, 100_000).default(20),
  LW_REVIEW_LINK_WINDOW_S: int(1, 24 * 3600).default(15 * 60),
  /** Worker threads for analyses and simulations; one core is left to the event loop and MariaDB. */
  LW_SIM_THREADS: int(1, 64).default(Math.max(1, availableParallelism() - 1)),
  LW_COMPUTE_TIMEOUT_S: int(1, 3600).default(60),
  LW_COMPUTE_MAX_QUEUE: int(1, 10_000).default(64),
  /**
   * Added to the nice value of each compute thread (0 keeps the server's own), so the scheduler hands
   * the CPU to the event loop thread whenever a request is waiting. 10, not 19: at 19 a release cut and
   * the demo seeding waited past LW_COMPUTE_TIMEOUT_S on a machine busy with other work.
   */
  LW_COMPUTE_NICE: int(0, 19).default(10),
  /**
   * Start every compute thread with the process and keep it (services/compute.ts ComputePool `warm`):
   * each analyses the warm-up specs as it starts, so a user's first analysis meets compiled code.
   * Default on, except under NODE_ENV=test, where a pool starts its threads on first use.
   */
  LW_COMPUTE_WARM: flag.optional(),
  /** Largest simulation one request may ask for: durationS × sampleRateHz loop samples. */
  LW_SIM_MAX_SAMPLES: int(1_000, 50_000_000).default(5_000_000),
  /** bcrypt cost factor: log2 of the rounds, so each step doubles the time per hash. */
  LW_BCRYPT_ROUNDS: int(4, 15).default(12),
  /** `loopback` trusts X-Forwarded-* only from 127.0.0.1/::1 (the balancer sets it so for its processes). */
  LW_TRUST_PROXY: z
    .enum(['true', 'false', '1', '0', 'loopback'])
    .default('false')
    .transform((value) => (value === 'loopback' ? ('loopback' as const) : value === 'true' || value === '1')),
  /** Serving processes; sessions, counters and locks live in MariaDB, so any of them serves any request. */
  LW_API_PROCESSES: int(1, 64).default(1),
  /**
   * `none`: the processes share PORT through node:cluster. `nginx`: each process listens on a loopback
   * port of its own and Debian's nginx, configured under LW_DATA_DIR, is the public PORT (round-robin).
   */
  LW_BALANCER: z.enum(['none', 'nginx']).default('none'),
  /** The server's own files (the balancer's generated configuration and logs), relative to the working directory. */
  LW_DATA_DIR: z.string().min(1).default('../../.data/server'),
  /** Set by the supervisor for each serving process; sent as the X-Loopwright-Process header. */
  LW_PROCESS_NAME: z.string().regex(/^[a-z][a-z0-9-]{0,31}$/).optional(),
});

export type Env = z.infer<typeof envSchema>;

export interface Config {
  readonly env: Env['NODE_ENV'];
  readonly port: number;
  readonly host: string;
  readonly appDistDir: string;
  /** Absolute: LW_FILE_STORE_DIR, else LW_DATA_DIR/files, resolved against the working directory. */
  readonly fileStoreDir: string;
  readonly db: {
    readonly host: string;
    readonly port: number;
    readonly user: string;
    readonly password: string;
    readonly database: string;
    readonly poolSize: number;
    readonly connectTimeoutMs: number;
  };
  readonly session: {
    readonly secret: string;
    readonly maxAgeS: number;
    readonly cookieSecure: boolean;
  };
  readonly bodyLimitBytes: number;
  readonly uploadLimitBytes: number;
  readonly signIn: { readonly limitPerWindow: number; readonly windowS: number };
  readonly reviewLinks: { readonly limitPerWindow: number; readonly windowS: number };
  readonly compute: {
    readonly threads: number;
    readonly timeoutS: number;
    readonly maxQueue: number;
    readonly niceIncrement: number;
    /** Threads start with the process, warm up, and stay (LW_COMPUTE_WARM). */
    readonly warm: boolean;
    readonly maxSimulationSamples: number;
  };
  readonly bcryptRounds: number;
  /** true, false, or 'loopback': trust X-Forwarded-* only from a proxy on this machine (the balancer). */
  readonly trustProxy: boolean | 'loopback';
  readonly processes: number;
  readonly balancer: 'none' | 'nginx';
  readonly dataDir: string;
  readonly processName: string | undefined;
  /** Keys that fell back to their development default, with the value used (printed at start-up). */
  readonly defaultsUsed: readonly (readonly [key: string, value: string])[];
}

export class ConfigError extends Error {}

/** Where a MariaDB listens and whom to sign in as: what a started instance reports. */
export interface DbAddress {
  readonly host: string;
  readonly port: number;
  readonly user: string;
  readonly password: string;
  readonly database: string;
}

/** The LW_DB_* settings that point loadConfig at one MariaDB (tests, benchmarks and the browser-test stack). */
export function dbEnv(db: DbAddress): Record<string, string> {
  return {
    LW_DB_HOST: db.host,
    LW_DB_PORT: String(db.port),
    LW_DB_USER: db.user,
    LW_DB_PASSWORD: db.password,
    LW_DB_NAME: db.database,
  };
}

export function loadConfig(source: NodeJS.ProcessEnv = process.env): Config {
  const parsed = envSchema.safeParse(source);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((issue) => `${issue.path.join('.')}: ${issue.message}`);
    throw new ConfigError(`Invalid environment:\n  ${lines.join('\n  ')}`);
  }
  const env = parsed.data;
  if (env.NODE_ENV === 'production' && env.LW_SESSION_SECRET === DEV_SESSION_SECRET) {
    throw new ConfigError('LW_SESSION_SECRET must be set in production (at least 32 characters)');
  }
  const defaultsUsed = Object.keys(envSchema.shape)
    .filter((key) => source[key] === undefined)
    .map((key) => [key, String(env[key as keyof Env])] as const);
  return {
    env: env.NODE_ENV,
    port: env.PORT,
    host: env.LW_HOST,
    appDistDir: env.LW_APP_DIST,
    fileStoreDir: path.resolve(env.LW_FILE_STORE_DIR ?? path.join(env.LW_DATA_DIR, 'files')),
    db: {
      host: env.LW_DB_HOST,
      port: env.LW_DB_PORT,
      user: env.LW_DB_USER,
      password: env.LW_DB_PASSWORD,
      database: env.LW_DB_NAME,
      poolSize: env.LW_DB_POOL_SIZE,
      connectTimeoutMs: env.LW_DB_CONNECT_TIMEOUT_MS,
    },
    session: {
      secret: env.LW_SESSION_SECRET,
      maxAgeS: env.LW_SESSION_MAX_AGE_S,
      cookieSecure: env.LW_COOKIE_SECURE,
    },
    bodyLimitBytes: env.LW_BODY_LIMIT_BYTES,
    uploadLimitBytes: env.LW_UPLOAD_LIMIT_BYTES,
    signIn: { limitPerWindow: env.LW_SIGNIN_LIMIT_PER_WINDOW, windowS: env.LW_SIGNIN_WINDOW_S },
    reviewLinks: { limitPerWindow: env.LW_REVIEW_LINK_LIMIT_PER_WINDOW, windowS: env.LW_REVIEW_LINK_WINDOW_S },
    compute: {
      threads: env.LW_SIM_THREADS,
      timeoutS: env.LW_COMPUTE_TIMEOUT_S,
      maxQueue: env.LW_COMPUTE_MAX_QUEUE,
      niceIncrement: env.LW_COMPUTE_NICE,
      warm: env.LW_COMPUTE_WARM ?? env.NODE_ENV !== 'test',
      maxSimulationSamples: env.LW_SIM_MAX_SAMPLES,
    },
    bcryptRounds: env.LW_BCRYPT_ROUNDS,
    trustProxy: env.LW_TRUST_PROXY,
    processes: env.LW_API_PROCESSES,
    balancer: env.LW_BALANCER,
    dataDir: env.LW_DATA_DIR,
    processName: env.LW_PROCESS_NAME,
    defaultsUsed,
  };
}

/** A start-up line per defaulted key; the password and secret are named, never printed. */
export function describeDefaults(config: Config): string[] {
  const secretKeys = new Set(['LW_DB_PASSWORD', 'LW_SESSION_SECRET']);
  return config.defaultsUsed.map(([key, value]) =>
    secretKeys.has(key) ? `${key}: development default in use (set it for any shared deployment)` : `${key}=${value} (development default)`,
  );
}
