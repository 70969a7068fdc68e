/**
 * A full disk under the file store during a cut, simulated: FileStore.put fails with ENOSPC, as
 * fs.write does on a full file system (write(2): ENOSPC "the device containing the file has no room
 * for the data"), after the release's first files were stored. The real thing, a size-limited tmpfs
 * under the real server, is tests/faults/disk.fault.test.ts. Either way: a clear 507 and nothing stored.
 */
import { afterAll, afterEach, beforeAll, expect, it, vi } from 'vitest';
import { FileStore } from '../../src/storage/fileStore.ts';
import { csrf } from '../helpers.ts';
import { designFromTemplate, startHandoff, type Handoff } from '../releases/handoff.ts';

let h: Handoff;

beforeAll(async () => {
  h = await startHandoff();
});

afterAll(async () => {
  await h.close();
});

afterEach(() => {
  vi.restoreAllMocks();
});

function noSpace(): NodeJS.ErrnoException {
  return Object.assign(new Error('ENOSPC: no space left on device, write'), { code: 'ENOSPC', errno: -28, syscall: 'write' });
}

it('answers a cut that meets a full disk with 507 storage_full, stores no release, and the next cut takes the number', async () => {
  const designId = await designFromTemplate(h.designer, 'mains-sync');
  const put = FileStore.prototype.put;
  let calls = 0;
  vi.spyOn(FileStore.prototype, 'put').mockImplementation(function (this: FileStore, bytes: Uint8Array) {
    calls += 1;
    return calls <= 2 ? put.call(this, bytes) : Promise.reject(noSpace());
  });
  const refused = await h.designer.post(`/api/designs/${designId}/releases`).set(csrf).expect(507);
  expect(refused.body.error.code).toBe('storage_full');
  expect(refused.body.error.message).toMatch(/disk for release files is full, so nothing was stored/);
  expect(JSON.stringify(refused.body)).not.toMatch(/ENOSPC|\/tmp|\.data/);
  const tried = calls;
  const rows = (await h.dataSource.query('SELECT COUNT(*) AS n FROM `releases` WHERE `designId` = ?', [designId])) as { n: number }[];
  expect(Number(rows[0]!.n)).toBe(0);

  vi.restoreAllMocks();
  const next = await h.designer.post(`/api/designs/${designId}/releases`).set(csrf).expect(201);
  expect(next.body.label).toBe('v1');
  // The files of a cut are written at once, so every one was tried (the first two stored), none left out.
  expect(tried).toBe(next.body.files.length);
});

it('tells a full disk apart from any other failure of the store (500 internal)', async () => {
  const designId = await designFromTemplate(h.designer, 'mains-sync');
  vi.spyOn(FileStore.prototype, 'put').mockRejectedValue(Object.assign(new Error('EIO: i/o error, write'), { code: 'EIO' }));
  const failed = await h.designer.post(`/api/designs/${designId}/releases`).set(csrf).expect(500);
  expect(failed.body.error.code).toBe('internal');
});
