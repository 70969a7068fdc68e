/**
 * The machine lost, the record kept: `npm run -s loopwright -- backup FILE` of a live server (two API
 * processes behind nginx) holding releases, a review, downloads and a conformance upload, then
 * `restore FILE` into a fresh MariaDB and an empty data directory. The restored record must be the
 * same: every audit entry (the trail complete and unaltered), every release with every file matching
 * the SHA-256 its row stores, the triggers that keep the audit trail append-only; and a server on it
 * serves the files. A damaged backup and a non-empty target are refused.
 */
import { spawn } from 'node:child_process';
import { createHash } from 'node:crypto';
import fs from 'node:fs/promises';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startMariaDb, type MariaDbInstance } from '../../scripts/lib/mariadb.ts';
import { findFreePort } from '../../scripts/lib/ports.ts';
import { afterProcess, api, apiSignIn, waitForVerdict } from '../e2e/harness/api.ts';
import { ROOT } from '../e2e/harness/paths.ts';
import { startServer, type ServerProcess } from '../e2e/harness/server.ts';
import { apiDbEnv, startStack, type Stack } from '../e2e/harness/stack.ts';
import { designIdOf, storeIsWhole } from './harness/probes.ts';
import { connect, type Sql } from './harness/sql.ts';

const SCRATCH = path.join(ROOT, '.data', `fault-backup-${process.pid}`);
let stack: Stack;
let fresh: MariaDbInstance | undefined;
let restoredServer: ServerProcess | undefined;

beforeAll(async () => {
  await fs.rm(SCRATCH, { recursive: true, force: true });
  await fs.mkdir(SCRATCH, { recursive: true });
  stack = await startStack({ app: false, dataDir: path.join(SCRATCH, 'live') });
});

afterAll(async () => {
  await restoredServer?.stop();
  await fresh?.stop();
  await stack?.stop();
  await fs.rm(SCRATCH, { recursive: true, force: true });
});

/** The README's command: `npm run -s loopwright -- ARGS`, with the server's settings in the environment. */
function loopwright(args: readonly string[], env: Record<string, string>): Promise<{ code: number | null; stdout: string; stderr: string }> {
  return new Promise((resolve) => {
    const child = spawn('npm', ['run', '-s', 'loopwright', '--', ...args], { cwd: ROOT, env: { ...process.env, ...env }, stdio: ['ignore', 'pipe', 'pipe'] });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (chunk: Buffer) => (stdout += chunk.toString()));
    child.stderr.on('data', (chunk: Buffer) => (stderr += chunk.toString()));
    const timer = setTimeout(() => child.kill('SIGKILL'), 120_000);
    child.once('exit', (code) => {
      clearTimeout(timer);
      resolve({ code, stdout, stderr });
    });
  });
}

/** A record worth keeping: two releases, one reviewed and approved from its link, downloaded and checked by firmware. */
async function makeRecord(): Promise<void> {
  const designer = (await apiSignIn(stack.baseUrl, 'designer@example.test')).cookie;
  const mains = await designIdOf(stack.baseUrl, designer, 'Mains sync PI loop');
  const carrier = await designIdOf(stack.baseUrl, designer, 'Carrier tracker');
  const v1 = await api<{ id: number; manifestSha256: string; files: { name: string }[] }>(stack.baseUrl, `/api/designs/${mains}/releases`, { method: 'POST', cookie: designer });
  expect(v1.status).toBe(201);
  expect((await api(stack.baseUrl, `/api/designs/${carrier}/releases`, { method: 'POST', cookie: designer })).status).toBe(201);
  const reviewers = await api<{ reviewers: { id: number; email: string }[] }>(stack.baseUrl, '/api/reviewers', { cookie: designer });
  const reviewerId = reviewers.body.reviewers.find((r) => r.email === 'reviewer@example.test')!.id;
  expect((await api(stack.baseUrl, `/api/releases/${v1.body.id}/reviews`, { cookie: designer, json: { reviewerIds: [reviewerId], approvalsRequired: 1 } })).status).toBe(200);
  const mail = await stack.mail.waitFor((m) => m.subject === 'Review requested: Inverter mains sync / Mains sync PI loop v1');
  const token = /\/review\/([^\s"'<>]+)/.exec(mail.text)![1]!;
  // Approval waits for the server's verification of the release's reference RTL.
  expect((await waitForVerdict(stack.baseUrl, designer, v1.body.id)).verdict).toBe('passed');
  expect((await api(stack.baseUrl, `/api/review-links/${token}`, { json: { decision: 'approve', manifestSha256: v1.body.manifestSha256, comment: 'Checked against the bench plan.' } })).status).toBe(200);
  const firmware = (await apiSignIn(stack.baseUrl, 'firmware@example.test')).cookie;
  expect((await api(stack.baseUrl, `/api/releases/${v1.body.id}/bundle`, { cookie: firmware })).status).toBe(200);
  const vectorsName = v1.body.files.find((f) => f.name.endsWith('_vectors.csv'))!.name;
  const vectors = await api(stack.baseUrl, `/api/releases/${v1.body.id}/files/${vectorsName}`, { cookie: firmware });
  const form = new FormData();
  form.append('file', new Blob([new Uint8Array(vectors.bytes)], { type: 'text/csv' }), 'capture.csv');
  expect((await api(stack.baseUrl, `/api/releases/${v1.body.id}/conformance`, { cookie: firmware, form })).status).toBe(201);
}

// Every column of every row.
const AUDIT = 'SELECT * FROM `audit_entries` ORDER BY `id`';
const RELEASES = 'SELECT * FROM `releases` ORDER BY `id`';
const FILES = 'SELECT * FROM `release_files` ORDER BY `id`';
const REVIEWS = 'SELECT * FROM `release_reviews` ORDER BY `id`';
const DOWNLOADS = 'SELECT * FROM `release_downloads` ORDER BY `id`';
const TRIGGERS = 'SELECT `TRIGGER_NAME` AS name FROM `information_schema`.`TRIGGERS` WHERE `TRIGGER_SCHEMA` = DATABASE() ORDER BY `TRIGGER_NAME`';

async function snapshot(sql: Sql) {
  return {
    audit: await sql.query(AUDIT),
    releases: await sql.query(RELEASES),
    files: await sql.query(FILES),
    reviews: await sql.query(REVIEWS),
    downloads: await sql.query(DOWNLOADS),
    triggers: await sql.query(TRIGGERS),
  };
}

describe('backup and restore', () => {
  it('restores a backup of a live server into a fresh MariaDB: the same audit trail, every file matching its SHA-256, the triggers kept', async () => {
    await makeRecord();
    const liveEnv = { ...(await apiDbEnv(stack.db)), LW_DATA_DIR: path.join(stack.dataDir, 'server') };
    const file = path.join(SCRATCH, 'loopwright.backup.tgz');
    const backup = await loopwright(['backup', file], liveEnv);
    expect(backup.stderr).toBe('');
    expect(backup.code).toBe(0);
    const summary = JSON.parse(backup.stdout) as { sha256: string; releases: number; storedFiles: number; auditEntries: number };
    expect(summary.releases).toBe(2);
    // The checksum beside the backup is the archive's SHA-256, in sha256sum's format.
    const archiveSha = createHash('sha256').update(await fs.readFile(file)).digest('hex');
    expect(summary.sha256).toBe(archiveSha);
    expect(await fs.readFile(`${file}.sha256`, 'utf8')).toBe(`${archiveSha}  loopwright.backup.tgz\n`);
    // A second backup to the same name is refused rather than overwriting the first.
    const again = await loopwright(['backup', file], liveEnv);
    expect(again.code).toBe(2);
    expect(again.stderr).toMatch(/already exists; a backup never overwrites/);

    const live = await connect(stack.db);
    const before = await snapshot(live);
    await live.close();
    expect(before.audit.length).toBe(summary.auditEntries);
    expect(before.triggers.length).toBeGreaterThanOrEqual(8);

    // Elsewhere: a fresh MariaDB and an empty data directory.
    fresh = await startMariaDb({ dataDir: path.join(SCRATCH, 'mariadb-restored'), fresh: true, database: 'loopwright_restored', user: 'loopwright', password: 'restore-only-password' });
    const restoredDataDir = path.join(SCRATCH, 'data-restored');
    const freshEnv = { ...(await apiDbEnv(fresh)), LW_DATA_DIR: restoredDataDir };
    const restore = await loopwright(['restore', file], freshEnv);
    expect(restore.stderr).toBe('');
    expect(restore.code).toBe(0);
    expect(JSON.parse(restore.stdout)).toMatchObject({ checksum: 'matched', releases: 2, auditEntries: summary.auditEntries, storedFiles: summary.storedFiles });

    const restored = await connect(fresh);
    try {
      const after = await snapshot(restored);
      // Every audit entry, column for column; every release, file, review and download row; every trigger.
      expect(after).toEqual(before);
      // Every release file's bytes, read from the restored store, match the SHA-256 its row stores.
      const stored = await storeIsWhole(path.join(restoredDataDir, 'files'));
      for (const row of after.files as { sha256: string }[]) expect(stored).toContain(row.sha256);
      // The audit trail is still append-only, and releases still cannot be deleted.
      await expect(restored.query("UPDATE `audit_entries` SET `action` = 'edited' WHERE `id` = 1")).rejects.toThrow(/append-only/);
      await expect(restored.query('DELETE FROM `audit_entries`')).rejects.toThrow(/append-only/);
      await expect(restored.query('DELETE FROM `releases`')).rejects.toThrow(/kept for the record/);
    } finally {
      await restored.close();
    }

    // A server on the restored data serves the releases, whichever process answers.
    const port = await findFreePort();
    restoredServer = await startServer({ ...stack.env, ...freshEnv, PORT: String(port), LW_PUBLIC_URL: `http://127.0.0.1:${port}` }, { expectedProcesses: 2 });
    const firmware = (await apiSignIn(restoredServer.baseUrl, 'firmware@example.test')).cookie;
    const releases = await api<{ releases: { id: number; label: string }[] }>(restoredServer.baseUrl, '/api/releases', { cookie: firmware });
    expect(releases.body.releases.map((r) => r.label)).toEqual(['v1']);
    const record = await api<{ files: { name: string; sha256: string }[] }>(restoredServer.baseUrl, `/api/releases/${releases.body.releases[0]!.id}`, { cookie: firmware });
    for (const f of record.body.files) {
      const download = await api(restoredServer.baseUrl, `/api/releases/${releases.body.releases[0]!.id}/files/${f.name}`, { cookie: firmware });
      expect(download.status).toBe(200);
      expect(createHash('sha256').update(download.bytes).digest('hex')).toBe(f.sha256);
      await afterProcess(restoredServer.baseUrl, download.process!);
    }

    // Restoring over data is refused, and so is a damaged copy (checked before anything is written).
    const over = await loopwright(['restore', file], freshEnv);
    expect(over.code).toBe(2);
    expect(over.stderr).toMatch(/database loopwright_restored on 127\.0\.0\.1:\d+ is not empty \(\d+ tables\): restore only into an empty database/);
    const damaged = path.join(SCRATCH, 'damaged.tgz');
    const bytes = await fs.readFile(file);
    const middle = Math.floor(bytes.length / 2);
    bytes[middle] = bytes[middle]! ^ 0xff;
    await fs.writeFile(damaged, bytes);
    await fs.copyFile(`${file}.sha256`, `${damaged}.sha256`);
    const refused = await loopwright(['restore', damaged], { ...freshEnv, LW_DATA_DIR: path.join(SCRATCH, 'never') });
    expect(refused.code).toBe(2);
    expect(refused.stderr).toMatch(/damaged\.tgz does not match .*damaged\.tgz\.sha256 .*nothing was restored/);
  });
});
