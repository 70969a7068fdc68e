/**
 * Settings of the hand-off half (mail, review links, outbox), from the environment with units in
 * the keys, validated once at start-up like the rest of the API's configuration.
 */
import { z } from 'zod';

const int = (min: number, max: number) => z.coerce.number().int().min(min).max(max);

const handoffEnvSchema = z.object({
  LW_SMTP_HOST: z.string().min(1).default('127.0.0.1'),
  LW_SMTP_PORT: int(1, 65_535).default(1025),
  /** Plain SMTP on loopback (the development fake) needs no STARTTLS; real relays should use it. */
  LW_SMTP_IGNORE_TLS: z.enum(['true', 'false']).default('true').transform((v) => v === 'true'),
  LW_SMTP_TIMEOUT_MS: int(100, 120_000).default(5_000),
  LW_MAIL_FROM: z.string().min(3).default('Loopwright <loopwright@example.test>'),
  /** Base of the links in e-mails: `${LW_PUBLIC_URL}/review/<token>`. */
  LW_PUBLIC_URL: z.url().default('http://127.0.0.1:8080').transform((u) => u.replace(/\/+$/, '')),
  LW_REVIEW_LINK_TTL_S: int(60, 90 * 24 * 3600).default(7 * 24 * 3600),
  /** Outbox retry timer period; 0 disables the timer (tests call the retry function themselves). */
  LW_OUTBOX_INTERVAL_MS: int(0, 3_600_000).optional(),
  /** Delay before a failed mail is tried again; it doubles with each failure, up to an hour. */
  LW_OUTBOX_FIRST_RETRY_S: int(1, 3600).default(30),
  /** How often each API process looks for a release whose reference RTL awaits verification; 0 disables the timer. */
  LW_VERIFY_INTERVAL_MS: int(0, 3_600_000).optional(),
  /** A running verification whose process has not reported for this long is taken over by another. */
  LW_VERIFY_LEASE_S: int(30, 24 * 3600).default(900),
  /** Longest run of one simulator (compile and all samples), and of the two yosys flows. */
  LW_VERIFY_SIMULATOR_TIMEOUT_S: int(5, 3600).default(300),
  LW_VERIFY_ESTIMATE_TIMEOUT_S: int(5, 3600).default(600),
  /** The PATH in which verification looks for ghdl, iverilog, vvp and yosys (default: the server's own). */
  LW_VERIFY_PATH: z.string().optional(),
  NODE_ENV: z.string().optional(),
});

/**
 * 30 s, except under NODE_ENV=test: test files share one database, and a timer in one test process
 * would send (or fail) the mail another test is watching.
 */
const defaultOutboxIntervalMs = (nodeEnv: string | undefined) => (nodeEnv === 'test' ? 0 : 30_000);

export interface HandoffConfig {
  readonly smtp: { readonly host: string; readonly port: number; readonly ignoreTls: boolean; readonly timeoutMs: number };
  readonly mailFrom: string;
  readonly publicUrl: string;
  readonly reviewLinkTtlS: number;
  readonly outboxIntervalMs: number;
  readonly outboxFirstRetryS: number;
  readonly verification: {
    readonly intervalMs: number;
    readonly leaseS: number;
    readonly simulatorTimeoutMs: number;
    readonly estimateTimeoutMs: number;
    /** Environment of the simulators and yosys; undefined: the server's. */
    readonly toolEnv: NodeJS.ProcessEnv | undefined;
  };
}

export function loadHandoffConfig(source: NodeJS.ProcessEnv = process.env): HandoffConfig {
  const parsed = handoffEnvSchema.safeParse(source);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((issue) => `${issue.path.join('.')}: ${issue.message}`);
    throw new Error(`Invalid environment:\n  ${lines.join('\n  ')}`);
  }
  const env = parsed.data;
  return {
    smtp: { host: env.LW_SMTP_HOST, port: env.LW_SMTP_PORT, ignoreTls: env.LW_SMTP_IGNORE_TLS, timeoutMs: env.LW_SMTP_TIMEOUT_MS },
    mailFrom: env.LW_MAIL_FROM,
    publicUrl: env.LW_PUBLIC_URL,
    reviewLinkTtlS: env.LW_REVIEW_LINK_TTL_S,
    outboxIntervalMs: env.LW_OUTBOX_INTERVAL_MS ?? defaultOutboxIntervalMs(env.NODE_ENV),
    outboxFirstRetryS: env.LW_OUTBOX_FIRST_RETRY_S,
    verification: {
      // 2 s, except under NODE_ENV=test, where a file's own calls run the job it is watching.
      intervalMs: env.LW_VERIFY_INTERVAL_MS ?? (env.NODE_ENV === 'test' ? 0 : 2_000),
      leaseS: env.LW_VERIFY_LEASE_S,
      simulatorTimeoutMs: env.LW_VERIFY_SIMULATOR_TIMEOUT_S * 1000,
      estimateTimeoutMs: env.LW_VERIFY_ESTIMATE_TIMEOUT_S * 1000,
      toolEnv: env.LW_VERIFY_PATH === undefined ? undefined : { ...source, PATH: env.LW_VERIFY_PATH },
    },
  };
}
