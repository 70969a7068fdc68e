/**
 * The content-addressed store of release file bytes (LW_FILE_STORE_DIR). A release's files can be
 * megabytes each (a 65,536-entry sine table in three languages), more than a MariaDB row should carry
 * (max_allowed_packet), so the rows of release_files hold name, size and SHA-256 and the bytes live
 * here, one file per distinct content:
 *
 *   <dir>/sha256/<first two hex digits>/<sha256>     the bytes
 *   <dir>/tmp/                                        files being written
 *
 * A write goes to a temporary file, is fsynced, renamed into place and the folder fsynced, so a crash
 * leaves either the whole file or none under its name. Every read checks the bytes against the name.
 * The same bytes always land on the same path, so writing twice is harmless, and a file once written
 * never changes. Nothing here knows about releases; backup and restore copy the folder.
 */
import { createHash, randomBytes } from 'node:crypto';
import { constants } from 'node:fs';
import { mkdir, open, readdir, readFile, rename, rm, stat } from 'node:fs/promises';
import { join } from 'node:path';

const SHA256_HEX = /^[0-9a-f]{64}$/;

export class StoredFileError extends Error {
  override readonly name = 'StoredFileError';
  constructor(
    readonly kind: 'missing' | 'corrupt' | 'bad-key',
    readonly sha256: string,
    message: string,
  ) {
    super(message);
  }
}

const sha256Of = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');

async function readdirOrEmpty(path: string): Promise<string[]> {
  try {
    return await readdir(path);
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'ENOENT') return [];
    throw err;
  }
}

async function fsyncPath(path: string, flags: number): Promise<void> {
  const handle = await open(path, flags);
  try {
    await handle.sync();
  } finally {
    await handle.close();
  }
}

export class FileStore {
  constructor(readonly dir: string) {}

  /** Where the bytes of `sha256` are (or would be) stored. */
  pathOf(sha256: string): string {
    if (!SHA256_HEX.test(sha256)) throw new StoredFileError('bad-key', sha256, `"${sha256.slice(0, 80)}" is not a SHA-256 in lower-case hex`);
    return join(this.dir, 'sha256', sha256.slice(0, 2), sha256);
  }

  /** Stores `bytes` under their SHA-256 (atomically; a no-op when already there) and returns it. */
  async put(bytes: Uint8Array): Promise<string> {
    const sha256 = sha256Of(bytes);
    const target = this.pathOf(sha256);
    if (await this.has(sha256)) return sha256;
    const tmpDir = join(this.dir, 'tmp');
    const folder = join(this.dir, 'sha256', sha256.slice(0, 2));
    await Promise.all([mkdir(tmpDir, { recursive: true }), mkdir(folder, { recursive: true })]);
    const tmp = join(tmpDir, `${sha256}.${randomBytes(6).toString('hex')}`);
    try {
      const handle = await open(tmp, 'wx', 0o644);
      try {
        await handle.writeFile(bytes);
        await handle.sync();
      } finally {
        await handle.close();
      }
      await rename(tmp, target);
    } catch (err) {
      await rm(tmp, { force: true });
      throw err;
    }
    // The rename is durable only once the folder that holds the new name is.
    await fsyncPath(folder, constants.O_RDONLY | constants.O_DIRECTORY);
    return sha256;
  }

  async has(sha256: string): Promise<boolean> {
    try {
      return (await stat(this.pathOf(sha256))).isFile();
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === 'ENOENT') return false;
      throw err;
    }
  }

  /** The SHA-256 of every stored file (backup copies them all), in no particular order; [] for an empty or absent store. */
  async list(): Promise<string[]> {
    const found: string[] = [];
    for (const prefix of await readdirOrEmpty(join(this.dir, 'sha256'))) {
      for (const name of await readdirOrEmpty(join(this.dir, 'sha256', prefix))) if (SHA256_HEX.test(name) && name.startsWith(prefix)) found.push(name);
    }
    return found;
  }

  /** The bytes stored under `sha256`, checked against it; StoredFileError when missing or altered. */
  async get(sha256: string): Promise<Buffer> {
    let bytes: Buffer;
    try {
      bytes = await readFile(this.pathOf(sha256));
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === 'ENOENT') throw new StoredFileError('missing', sha256, `stored file ${sha256} is missing from the file store`);
      throw err;
    }
    if (sha256Of(bytes) !== sha256) throw new StoredFileError('corrupt', sha256, `stored file ${sha256} failed its SHA-256 check (its bytes were altered on disk)`);
    return bytes;
  }
}
