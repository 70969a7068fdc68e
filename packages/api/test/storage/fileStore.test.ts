/**
 * The content-addressed file store: bytes under their SHA-256, written atomically (temp file, fsync,
 * rename) and checked against the hash on every read.
 */
import { createHash } from 'node:crypto';
import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { FileStore, StoredFileError } from '../../src/storage/fileStore.ts';

const dirs: string[] = [];
function store(): FileStore {
  const dir = mkdtempSync(join(tmpdir(), 'lw-store-'));
  dirs.push(dir);
  return new FileStore(dir);
}
afterEach(() => {
  for (const d of dirs.splice(0)) rmSync(d, { recursive: true, force: true });
});

const sha256 = (b: Buffer) => createHash('sha256').update(b).digest('hex');

describe('FileStore', () => {
  it('lists what it stores, skipping what is not a stored file, and lists nothing for a store never written', async () => {
    const s = store();
    expect(await new FileStore(join(s.dir, 'never-written')).list()).toEqual([]);
    const keys = [await s.put(Buffer.from('a')), await s.put(Buffer.from('b')), await s.put(Buffer.from('a'))];
    writeFileSync(join(s.dir, 'sha256', keys[0]!.slice(0, 2), 'notes.txt'), 'not a stored file');
    expect((await s.list()).sort()).toEqual([...new Set(keys)].sort());
  });

  it('stores bytes under their SHA-256 and reads them back', async () => {
    const s = store();
    const bytes = Buffer.from('constant SINE : sine_table := (0, 201, 402);\n');
    const key = await s.put(bytes);
    expect(key).toBe(sha256(bytes)); // NIST FIPS 180-4 SHA-256, as node:crypto computes it
    expect(Buffer.compare(await s.get(key), bytes)).toBe(0);
    expect(s.pathOf(key)).toMatch(new RegExp(`${key.slice(0, 2)}[/\\\\]${key}$`));
    expect(readFileSync(s.pathOf(key)).equals(bytes)).toBe(true);
  });

  it('is idempotent and leaves no temporary file behind', async () => {
    const s = store();
    const bytes = Buffer.alloc(100_000, 7);
    const [a, b] = await Promise.all([s.put(bytes), s.put(bytes)]);
    expect(a).toBe(b);
    expect(readdirSync(join(s.dir, 'tmp'))).toEqual([]);
  });

  it('refuses a stored file whose bytes no longer match their hash, and a missing one', async () => {
    const s = store();
    const key = await s.put(Buffer.from('abc'));
    writeFileSync(s.pathOf(key), 'abd');
    await expect(s.get(key)).rejects.toThrow(StoredFileError);
    await expect(s.get(key)).rejects.toThrow(/failed its SHA-256 check/);
    await expect(s.get('0'.repeat(64))).rejects.toThrow(/is missing from the file store/);
    await expect(s.get('../../etc/passwd')).rejects.toThrow(/not a SHA-256/);
  });
});
