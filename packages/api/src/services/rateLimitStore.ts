import type { ClientRateLimitInfo, IncrementResponse, Options, Store } from 'express-rate-limit';
import type { DataSource } from 'typeorm';

/**
 * An express-rate-limit store in MariaDB, so every API process behind a load balancer counts the same
 * attempts (DESIGN.md, "Scale": no in-memory counters). Fixed windows; the database clock decides.
 */
const SWEEP_INTERVAL_MS = 60 * 60 * 1000;

export class MariaDbRateLimitStore implements Store {
  windowMs = 60_000;
  readonly localKeys = false;

  constructor(
    private readonly dataSource: DataSource,
    readonly prefix: string,
  ) {}

  init(options: Options): void {
    this.windowMs = options.windowMs;
    // Buckets of addresses that never came back would pile up; sweep the long-expired ones.
    setInterval(() => {
      // A failed sweep (database away) is simply retried at the next one.
      this.dataSource.query('DELETE FROM rate_limit_hits WHERE resetAt < UTC_TIMESTAMP(3) - INTERVAL 1 DAY').catch(() => {});
    }, SWEEP_INTERVAL_MS).unref();
  }

  private bucket(key: string): string {
    return `${this.prefix}:${key}`.slice(0, 191);
  }

  async get(key: string): Promise<ClientRateLimitInfo | undefined> {
    const rows: { hits: number; resetAt: Date }[] = await this.dataSource.query(
      'SELECT hits, resetAt FROM rate_limit_hits WHERE bucket = ? AND resetAt > UTC_TIMESTAMP(3)',
      [this.bucket(key)],
    );
    const row = rows[0];
    return row ? { totalHits: Number(row.hits), resetTime: new Date(row.resetAt) } : undefined;
  }

  async increment(key: string): Promise<IncrementResponse> {
    const bucket = this.bucket(key);
    const windowUs = Math.round(this.windowMs * 1000);
    // hits is assigned before resetAt, so both IF()s still see the old resetAt (MariaDB evaluates left to right).
    await this.dataSource.query(
      'INSERT INTO rate_limit_hits (bucket, hits, resetAt) VALUES (?, 1, UTC_TIMESTAMP(3) + INTERVAL ? MICROSECOND) ' +
        'ON DUPLICATE KEY UPDATE hits = IF(resetAt <= UTC_TIMESTAMP(3), 1, hits + 1), ' +
        'resetAt = IF(resetAt <= UTC_TIMESTAMP(3), VALUES(resetAt), resetAt)',
      [bucket, windowUs],
    );
    const info = await this.get(key);
    return info ?? { totalHits: 1, resetTime: new Date(Date.now() + this.windowMs) };
  }

  async decrement(key: string): Promise<void> {
    await this.dataSource.query('UPDATE rate_limit_hits SET hits = GREATEST(hits, 1) - 1 WHERE bucket = ?', [this.bucket(key)]);
  }

  async resetKey(key: string): Promise<void> {
    await this.dataSource.query('DELETE FROM rate_limit_hits WHERE bucket = ?', [this.bucket(key)]);
  }
}
