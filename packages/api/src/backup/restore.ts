/**
 * `loopwright restore FILE`: a backup (backupFile.ts) into an empty database and an empty file store.
 * Everything is checked before anything is written — the archive against `FILE.sha256`, every member
 * against backup.json — and after: the triggers are back, every append-only table holds every row it
 * had before the dump (the audit trail is complete), and every release file's bytes match the SHA-256
 * its row stores.
 */
import { createReadStream, existsSync } from 'node:fs';
import fs from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { Transform, type TransformCallback } from 'node:stream';
import { extract as extractTar } from 'tar';
import type { DataSource } from 'typeorm';
import type { Config } from '../config.ts';
import { createDataSource } from '../data-source.ts';
import { sha256Hex } from '../render/digest.ts';
import type { FileStore } from '../storage/fileStore.ts';
import { BackupRefused, databaseFacts } from './backup.ts';
import { APPEND_ONLY_TABLES, BACKUP_FOLDER, backupManifestSchema, DUMP_NAME, FILES_FOLDER, MANIFEST_NAME, parseChecksumLine, sha256OfFile, type BackupManifest } from './backupFile.ts';
import { runSql } from './mariadbPrograms.ts';

export interface RestoreSummary {
  readonly file: string;
  /** `matched`: FILE.sha256 was there and agreed; `absent`: there was none (the members were still checked). */
  readonly checksum: 'matched' | 'absent';
  readonly database: string;
  readonly releases: number;
  readonly releaseFiles: number;
  readonly auditEntries: number;
  readonly triggers: number;
  readonly storedFiles: number;
}

/**
 * Drops the DEFINER of each trigger, so the restoring account becomes the definer: creating a trigger
 * for another account needs the SET USER (SUPER) privilege (MariaDB 10.11 manual, CREATE TRIGGER),
 * which the application account does not hold. Works line by line; mariadb-dump writes each
 * statement's DEFINER clause as `/*!50017 DEFINER=`user`@`host`*\/` on the CREATE line.
 */
export function withoutDefiners(): Transform {
  let carry = '';
  const strip = (line: string) => line.replace(/\/\*!50017 DEFINER=`(?:[^`]|``)*`@`(?:[^`]|``)*`\s*\*\/\s?/g, '');
  return new Transform({
    transform(chunk: Buffer, _encoding, callback: TransformCallback) {
      const text = carry + chunk.toString('utf8');
      const end = text.lastIndexOf('\n');
      if (end < 0) {
        carry = text;
        return callback();
      }
      carry = text.slice(end + 1);
      callback(null, text.slice(0, end + 1).split('\n').map(strip).join('\n'));
    },
    flush(callback: TransformCallback) {
      callback(null, strip(carry));
    },
  });
}

async function checkChecksum(file: string): Promise<'matched' | 'absent'> {
  if (!existsSync(file)) throw new BackupRefused(`${file} does not exist`);
  const checksumFile = `${file}.sha256`;
  if (!existsSync(checksumFile)) return 'absent';
  const expected = parseChecksumLine(await fs.readFile(checksumFile, 'utf8'));
  if (!expected) throw new BackupRefused(`${checksumFile} is not a SHA-256 checksum line (sha256sum format)`);
  const { sha256 } = await sha256OfFile(file);
  if (sha256 !== expected) throw new BackupRefused(`${file} does not match ${checksumFile} (SHA-256 ${sha256}, expected ${expected}): the backup is damaged or is not the one the checksum was written for; nothing was restored`);
  return 'matched';
}

async function checkTargetsEmpty(dataSource: DataSource, db: Config['db'], store: FileStore): Promise<void> {
  const [row] = (await dataSource.query('SELECT COUNT(*) AS n FROM `information_schema`.`TABLES` WHERE `TABLE_SCHEMA` = DATABASE()')) as { n: string | number }[];
  const tables = Number(row?.n ?? 0);
  if (tables > 0) throw new BackupRefused(`database ${db.database} on ${db.host}:${db.port} is not empty (${tables} tables): restore only into an empty database; nothing was restored`);
  const entries = await fs.readdir(store.dir).catch((err: NodeJS.ErrnoException) => (err.code === 'ENOENT' ? [] : Promise.reject(err)));
  if (entries.length > 0) throw new BackupRefused(`the file store ${store.dir} is not empty: restore only into an empty data directory; nothing was restored`);
}

/** Every file under files/ is one backup.json lists, with that size, holding the bytes its name says; and none is missing. */
async function checkMembers(root: string, manifest: BackupManifest): Promise<void> {
  const dump = await sha256OfFile(path.join(root, DUMP_NAME)).catch(() => undefined);
  if (!dump || dump.sha256 !== manifest.database.dumpSha256 || dump.bytes !== manifest.database.dumpBytes) {
    throw new BackupRefused(`${DUMP_NAME} in the backup does not match backup.json (missing or altered); nothing was restored`);
  }
  const listed = new Map(manifest.files.map((f) => [f.sha256, f.bytes]));
  const shaDir = path.join(root, FILES_FOLDER, 'sha256');
  let found = 0;
  for (const prefix of await fs.readdir(shaDir).catch(() => [] as string[])) {
    for (const name of await fs.readdir(path.join(shaDir, prefix))) {
      const bytes = await fs.readFile(path.join(shaDir, prefix, name));
      if (listed.get(name) !== bytes.length || sha256Hex(bytes) !== name) throw new BackupRefused(`stored file ${name} in the backup does not match backup.json (altered or unlisted); nothing was restored`);
      found += 1;
    }
  }
  if (found !== listed.size) throw new BackupRefused(`the backup holds ${found} of the ${listed.size} stored files backup.json lists; nothing was restored`);
}

async function readManifest(root: string): Promise<BackupManifest> {
  let raw: unknown;
  try {
    raw = JSON.parse(await fs.readFile(path.join(root, MANIFEST_NAME), 'utf8'));
  } catch {
    throw new BackupRefused(`not a Loopwright backup: no readable ${BACKUP_FOLDER}/${MANIFEST_NAME} in it`);
  }
  const parsed = backupManifestSchema.safeParse(raw);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw new BackupRefused(`not a Loopwright backup this version reads: ${MANIFEST_NAME} field ${issue?.path.join('.') || '(document)'}: ${issue?.message ?? 'invalid'}`);
  }
  return parsed.data;
}

/** After loading: the record is whole, or the restore says exactly what is not. */
async function checkRestored(dataSource: DataSource, store: FileStore, manifest: BackupManifest): Promise<{ facts: Awaited<ReturnType<typeof databaseFacts>> }> {
  const now = await databaseFacts(dataSource);
  const missingTriggers = manifest.database.triggers.filter((t) => !now.triggers.includes(t));
  if (missingTriggers.length > 0) throw new Error(`the restored database lacks the triggers ${missingTriggers.join(', ')}`);
  for (const table of APPEND_ONLY_TABLES) {
    const before = manifest.database.appendOnly[table];
    const [row] = (await dataSource.query(`SELECT COUNT(*) AS n FROM \`${table}\` WHERE \`id\` <= ?`, [before.maxId])) as { n: string | number }[];
    if (Number(row?.n ?? 0) !== before.count) throw new Error(`the restored ${table} holds ${Number(row?.n ?? 0)} of the ${before.count} rows it had up to id ${before.maxId}`);
  }
  const rows = (await dataSource.query('SELECT `id`, `sha256`, `content` IS NULL AS `inStore` FROM `release_files` ORDER BY `id`')) as { id: number; sha256: string; inStore: number | string }[];
  for (const row of rows) {
    if (Number(row.inStore) === 1) {
      await store.get(row.sha256); // StoredFileError when missing or not those bytes
      continue;
    }
    const [own] = (await dataSource.query('SELECT `content` FROM `release_files` WHERE `id` = ?', [row.id])) as { content: Buffer }[];
    if (!own || sha256Hex(Buffer.from(own.content)) !== row.sha256) throw new Error(`release file row ${row.id} does not match its stored SHA-256`);
  }
  return { facts: now };
}

export async function restoreBackup(db: Config['db'], store: FileStore, file: string): Promise<RestoreSummary> {
  const checksum = await checkChecksum(file);
  const dataSource = createDataSource({ ...db, poolSize: 1 });
  await dataSource.initialize();
  const staging = await fs.mkdtemp(path.join(os.tmpdir(), 'lw-restore-'));
  try {
    await checkTargetsEmpty(dataSource, db, store);
    // node-tar refuses absolute paths and `..` in member names unless told otherwise (preservePaths).
    await extractTar({ file, cwd: staging, strict: true }).catch((err: Error) => {
      throw new BackupRefused(`${file} is not a readable backup archive (${err.message}); nothing was restored`);
    });
    const root = path.join(staging, BACKUP_FOLDER);
    const manifest = await readManifest(root);
    await checkMembers(root, manifest);

    let restored: Awaited<ReturnType<typeof checkRestored>>;
    try {
      await runSql(db, createReadStream(path.join(root, DUMP_NAME)).pipe(withoutDefiners()));
      for (const f of manifest.files) {
        const bytes = await fs.readFile(path.join(root, FILES_FOLDER, 'sha256', f.sha256.slice(0, 2), f.sha256));
        if ((await store.put(bytes)) !== f.sha256) throw new Error(`stored file ${f.sha256} changed while it was restored`);
      }
      restored = await checkRestored(dataSource, store, manifest);
    } catch (err) {
      throw new Error(
        `the restore failed after it began writing (${(err as Error).message}); the database ${db.database} and the file store ${store.dir} may hold part of the backup: empty both before trying again`,
        { cause: err },
      );
    }
    return {
      file,
      checksum,
      database: db.database,
      releases: restored.facts.appendOnly.releases.count,
      releaseFiles: restored.facts.appendOnly.release_files.count,
      auditEntries: restored.facts.appendOnly.audit_entries.count,
      triggers: restored.facts.triggers.length,
      storedFiles: manifest.files.length,
    };
  } finally {
    await dataSource.destroy();
    await fs.rm(staging, { recursive: true, force: true });
  }
}
