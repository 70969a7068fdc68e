/**
 * Anonymous review-link requests that are refused are rate-limited per client address, with the
 * counters in MariaDB (like sign-in), so guessing tokens cannot flood the audit trail. Each request
 * here comes from its own documentation address (RFC 5737) through a trusted proxy header, so the
 * other test files' requests from 127.0.0.1 never share its bucket.
 */
import { randomBytes } from 'node:crypto';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { buildApp, openDataSource, testConfig, useTestApp } from '../helpers.ts';

const LIMIT = 5;
const config = testConfig({ LW_TRUST_PROXY: 'true', LW_REVIEW_LINK_LIMIT_PER_WINDOW: String(LIMIT), LW_REVIEW_LINK_WINDOW_S: '600' });
const t = useTestApp(config);

const randomToken = () => `${randomBytes(9).toString('base64url')}.${randomBytes(32).toString('base64url')}`;
const address = `203.0.113.${1 + (process.pid % 250)}`;

async function unknownRefusals(): Promise<number> {
  const rows = (await t.dataSource.query(
    "SELECT COUNT(*) AS n FROM `audit_entries` WHERE `action` = 'review-link.refused' AND `ip` = ?",
    [address],
  )) as { n: string | number }[];
  return Number(rows[0]?.n ?? 0);
}

describe('review-link requests with random tokens', () => {
  it(`are answered 429 after ${LIMIT} refusals per address, and stop writing audit rows`, async () => {
    await t.dataSource.query('DELETE FROM `rate_limit_hits` WHERE `bucket` LIKE ?', [`%${address}%`]);
    const before = await unknownRefusals();
    const statuses: number[] = [];
    for (let i = 0; i < LIMIT + 10; i++) {
      const call = i % 2 === 0 ? request(t.built.app).get(`/api/review-links/${randomToken()}`) : request(t.built.app).post(`/api/review-links/${randomToken()}`).send({ decision: 'approve', manifestSha256: '0'.repeat(64) });
      statuses.push((await call.set('X-Forwarded-For', address)).status);
    }
    expect(statuses.slice(0, LIMIT)).toEqual(Array(LIMIT).fill(403));
    expect(statuses.slice(LIMIT)).toEqual(Array(10).fill(429));
    expect((await unknownRefusals()) - before).toBe(LIMIT);
  });

  it('share their count across API processes (two apps on one database)', async () => {
    const second = await openDataSource(config);
    const otherApp = buildApp(second, config);
    try {
      const other = '198.51.100.7';
      await t.dataSource.query('DELETE FROM `rate_limit_hits` WHERE `bucket` LIKE ?', [`%${other}%`]);
      for (let i = 0; i < LIMIT; i++) {
        const app = i % 2 === 0 ? t.built.app : otherApp.app;
        await request(app).get(`/api/review-links/${randomToken()}`).set('X-Forwarded-For', other).expect(403);
      }
      const res = await request(otherApp.app).get(`/api/review-links/${randomToken()}`).set('X-Forwarded-For', other).expect(429);
      expect(res.body.error.code).toBe('rate_limited');
    } finally {
      await otherApp.close();
      await second.destroy();
    }
  });
});
