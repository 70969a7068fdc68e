/**
 * MariaDB killed (SIGKILL) in the middle of a release cut, on the real stack: two API processes behind
 * nginx. The cut has stored its files (the file store comes first) and is stopped at a chosen step by
 * a lock the test holds: its transaction has already written the release row and its file rows (a
 * dirty read shows them) and waits to write the audit entry when the database dies. The request must
 * fail with a clear 503, InnoDB's crash recovery must leave no trace of the half-made release, the file
 * store must hold nothing half-written, and the next cut after the restart must take the number the
 * lost one would have had.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { api, apiSignIn } from '../e2e/harness/api.ts';
import { ROOT } from '../e2e/harness/paths.ts';
import { startStack, type Stack } from '../e2e/harness/stack.ts';
import { connect, waitForStatement, type Sql } from './harness/sql.ts';
import { designIdOf, healthyEverywhere, storeIsWhole } from './harness/probes.ts';

let stack: Stack;
let cookie: string;
let designId: number;

beforeAll(async () => {
  stack = await startStack({ app: false, dataDir: path.join(ROOT, '.data', `fault-db-${process.pid}`), env: { LW_DB_CONNECT_TIMEOUT_MS: '1000' } });
  cookie = (await apiSignIn(stack.baseUrl, 'designer@example.test')).cookie;
  designId = await designIdOf(stack.baseUrl, cookie, 'Mains sync PI loop');
});

afterAll(async () => {
  await stack?.stop();
});

/** The design's release numbers and file rows. */
async function releasesStored(sql: Sql): Promise<{ numbers: number[]; fileRows: number }> {
  const releases = await sql.query<{ number: number }>('SELECT `number` FROM `releases` WHERE `designId` = ? ORDER BY `number`', [designId]);
  const [files] = await sql.query<{ n: number }>('SELECT COUNT(*) AS n FROM `release_files` f JOIN `releases` r ON r.`id` = f.`releaseId` WHERE r.`designId` = ?', [designId]);
  return { numbers: releases.map((r) => Number(r.number)), fileRows: Number(files!.n) };
}

async function stored(sql: Sql): Promise<{ numbers: number[]; fileRows: number; cutEntries: number }> {
  const [cuts] = await sql.query<{ n: number }>("SELECT COUNT(*) AS n FROM `audit_entries` WHERE `action` = 'release.cut'");
  return { ...(await releasesStored(sql)), cutEntries: Number(cuts!.n) };
}

/** No request of this test may wait longer than this for its answer. */
const ANSWER_TIMEOUT_MS = 60_000;

describe('MariaDB killed during a release cut', () => {
  it('answers 503, leaves no release row, file or number half-made, and the next cut after the restart takes the next number', async () => {
    const v1 = await api<{ number: number; files: { sha256: string }[] }>(stack.baseUrl, `/api/designs/${designId}/releases`, { method: 'POST', cookie });
    expect(v1.status).toBe(201);
    expect(v1.body.number).toBe(1);
    const fileCount = v1.body.files.length;

    const look = await connect(stack.db);
    const before = await stored(look);
    expect(before).toEqual({ numbers: [1], fileRows: fileCount, cutEntries: 1 });

    // Stop the next cut just before its audit entry: LOCK TABLES makes its INSERT wait.
    const lock = await connect(stack.db);
    await lock.query('LOCK TABLES `audit_entries` WRITE');
    const cut = api<{ error: { code: string; message: string } }>(stack.baseUrl, `/api/designs/${designId}/releases`, { method: 'POST', cookie, signal: AbortSignal.timeout(ANSWER_TIMEOUT_MS) });
    await waitForStatement(look, /^INSERT INTO `audit_entries`/);
    // The half-made release exists inside the open transaction: number 2 and its files, not committed.
    await look.query('SET SESSION TRANSACTION ISOLATION LEVEL READ UNCOMMITTED');
    const dirty = await releasesStored(look);
    expect(dirty.numbers).toEqual([1, 2]);
    expect(dirty.fileRows).toBe(2 * fileCount);

    await stack.db.kill();
    const answer = await cut;
    expect(answer.status).toBe(503);
    expect(answer.body.error.code).toBe('database_unavailable');
    expect(answer.body.error.message).toMatch(/database is not reachable/);
    expect(answer.headers.get('retry-after')).toBe('5');
    await lock.close();
    await look.close();

    await stack.db.restart();
    await healthyEverywhere(stack.baseUrl, 2);
    const after = await connect(stack.db);
    try {
      expect(await stored(after)).toEqual(before);
      // The file store holds v1's files, every file whole, nothing half-written. The lost cut rendered
      // the same bytes as v1 but for its manifest.json, which names its release and cut time: that one
      // file may lie whole in the store, and no row refers to it (the release rows are as before).
      const storeDir = path.join(stack.dataDir, 'server', 'files');
      const held = await storeIsWhole(storeDir);
      const v1Sums = [...new Set(v1.body.files.map((f) => f.sha256))].sort();
      expect(v1Sums.filter((sha) => !held.includes(sha))).toEqual([]);
      expect(held.filter((sha) => !v1Sums.includes(sha)).length).toBeLessThanOrEqual(1);
      const next = await api<{ number: number; label: string; files: unknown[] }>(stack.baseUrl, `/api/designs/${designId}/releases`, { method: 'POST', cookie });
      expect(next.status).toBe(201);
      expect(next.body.label).toBe('v2');
      expect(next.body.files).toHaveLength(fileCount);
      expect(await stored(after)).toEqual({ numbers: [1, 2], fileRows: 2 * fileCount, cutEntries: 2 });
    } finally {
      await after.close();
    }
  });
});
