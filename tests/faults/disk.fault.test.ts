/**
 * The disk under the release file store full during a cut, for real: LW_FILE_STORE_DIR is a 32 MiB
 * tmpfs (mount(8), tmpfs(5) "size"; room for a release with its 65,536-sample vectors, about 6 MB), filled up by the test before the cut, under the real server (two
 * API processes behind nginx). The cut must fail with a clear 507, leave no release row and no
 * half-written file in the store (a file under a SHA-256 name always holds exactly those bytes, and no
 * temporary file is left), and succeed once there is room again. The same with a simulated ENOSPC, in
 * process: packages/api/test/storage/storage-full.test.ts.
 *
 * Mounting needs root (or password-less sudo), as npm test's package installation does.
 */
import { execFileSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import fs from 'node:fs/promises';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { api, apiSignIn } from '../e2e/harness/api.ts';
import { ROOT } from '../e2e/harness/paths.ts';
import { startStack, type Stack } from '../e2e/harness/stack.ts';
import { designIdOf, storeIsWhole } from './harness/probes.ts';
import { connect } from './harness/sql.ts';

const STORE = path.join(ROOT, '.data', `fault-disk-store-${process.pid}`);
const FILLER = path.join(STORE, 'filler');
let stack: Stack | undefined;
let mounted = false;
let cookie: string;

function privileged(command: string, args: readonly string[]): void {
  const asRoot = typeof process.getuid === 'function' && process.getuid() === 0;
  if (asRoot) execFileSync(command, args, { stdio: 'pipe' });
  else execFileSync('sudo', ['-n', command, ...args], { stdio: 'pipe' });
}

beforeAll(async () => {
  await fs.mkdir(STORE, { recursive: true });
  try {
    privileged('mount', ['-t', 'tmpfs', '-o', 'size=32m,mode=0755', 'tmpfs', STORE]);
  } catch (err) {
    throw new Error(`could not mount a 32 MiB tmpfs for the file store (needs root or password-less sudo): ${String((err as { stderr?: Buffer }).stderr ?? err).trim()}`);
  }
  mounted = true;
  stack = await startStack({ app: false, dataDir: path.join(ROOT, '.data', `fault-disk-${process.pid}`), env: { LW_FILE_STORE_DIR: STORE } });
  cookie = (await apiSignIn(stack.baseUrl, 'designer@example.test')).cookie;
});

afterAll(async () => {
  await stack?.stop();
  if (mounted) privileged('umount', [STORE]);
  await fs.rm(STORE, { recursive: true, force: true });
});

/** Writes to the filler file until the file system refuses: ENOSPC, as a full disk says. */
async function fillUp(): Promise<void> {
  const handle = await fs.open(FILLER, 'w');
  const chunk = Buffer.alloc(16 * 1024, 0x55);
  try {
    for (;;) await handle.write(chunk);
  } catch (err) {
    expect((err as NodeJS.ErrnoException).code).toBe('ENOSPC');
  } finally {
    await handle.close();
  }
}

describe('the disk under the file store full during a cut', () => {
  it('answers 507 storage_full, keeps no release and no half-written file, and cuts again once there is room', async () => {
    const mains = await designIdOf(stack!.baseUrl, cookie, 'Mains sync PI loop');
    const carrier = await designIdOf(stack!.baseUrl, cookie, 'Carrier tracker');
    const v1 = await api<{ id: number; files: { name: string; sha256: string }[] }>(stack!.baseUrl, `/api/designs/${mains}/releases`, { method: 'POST', cookie });
    expect(v1.status).toBe(201);

    await fillUp();
    const refused = await api<{ error: { code: string; message: string } }>(stack!.baseUrl, `/api/designs/${carrier}/releases`, { method: 'POST', cookie });
    expect(refused.status).toBe(507);
    expect(refused.body.error.code).toBe('storage_full');
    expect(refused.body.error.message).toMatch(/disk for release files is full, so nothing was stored/);

    const stored = await storeIsWhole(STORE);
    for (const f of v1.body.files) expect(stored).toContain(f.sha256);
    const sql = await connect(stack!.db);
    try {
      const rows = await sql.query<{ n: number }>('SELECT COUNT(*) AS n FROM `releases` WHERE `designId` = ?', [carrier]);
      expect(Number(rows[0]!.n)).toBe(0);
    } finally {
      await sql.close();
    }
    // What was stored before stays readable while the disk is full.
    const manifest = await api(stack!.baseUrl, `/api/releases/${v1.body.id}/files/manifest.json`, { cookie });
    expect(manifest.status).toBe(200);
    expect(createHash('sha256').update(manifest.bytes).digest('hex')).toBe(v1.body.files.find((f) => f.name === 'manifest.json')!.sha256);

    await fs.rm(FILLER);
    const after = await api<{ label: string; files: { name: string; sha256: string }[] }>(stack!.baseUrl, `/api/designs/${carrier}/releases`, { method: 'POST', cookie });
    expect(after.status).toBe(201);
    expect(after.body.label).toBe('v1');
    const whole = await storeIsWhole(STORE);
    for (const f of after.body.files) expect(whole).toContain(f.sha256);
  });
});
