/**
 * `loopwright backup FILE`: the database (mariadb-dump, one consistent snapshot) and the release file
 * store in one archive (backupFile.ts), with a checksum beside it. The server may keep running: the
 * dump is a snapshot, and the store is copied after it, which holds every file the snapshot names
 * because a file is written before the row that names it and never changes (storage/fileStore.ts).
 */
import { existsSync } from 'node:fs';
import fs from 'node:fs/promises';
import path from 'node:path';
import { create as createTar } from 'tar';
import type { DataSource } from 'typeorm';
import type { Config } from '../config.ts';
import { createDataSource } from '../data-source.ts';
import type { FileStore } from '../storage/fileStore.ts';
import {
  APPEND_ONLY_TABLES,
  BACKUP_FOLDER,
  checksumLine,
  DUMP_NAME,
  FILES_FOLDER,
  MANIFEST_NAME,
  sha256OfFile,
  TRANSIENT_TABLES,
  type BackupManifest,
  type Tally,
} from './backupFile.ts';
import { dumpDatabase } from './mariadbPrograms.ts';

/** A backup or restore refused for a reason the operator can fix (exit code 2 on the terminal). */
export class BackupRefused extends Error {
  override readonly name = 'BackupRefused';
}

export interface BackupSummary {
  readonly file: string;
  readonly sha256: string;
  readonly bytes: number;
  readonly checksumFile: string;
  readonly database: string;
  readonly releases: number;
  readonly auditEntries: number;
  readonly storedFiles: number;
}

type DatabaseFacts = Pick<BackupManifest['database'], 'migrations' | 'triggers' | 'appendOnly'>;

/** What a restore must find again: the migrations, the triggers, and each append-only table's count and largest id. */
export async function databaseFacts(dataSource: DataSource): Promise<DatabaseFacts> {
  const migrations = (await dataSource.query('SELECT `name` FROM `migrations` ORDER BY `id`')) as { name: string }[];
  const triggers = (await dataSource.query('SELECT `TRIGGER_NAME` AS `name` FROM `information_schema`.`TRIGGERS` WHERE `TRIGGER_SCHEMA` = DATABASE() ORDER BY `TRIGGER_NAME`')) as { name: string }[];
  const appendOnly = {} as Record<(typeof APPEND_ONLY_TABLES)[number], Tally>;
  for (const table of APPEND_ONLY_TABLES) {
    const [row] = (await dataSource.query(`SELECT COUNT(*) AS \`count\`, COALESCE(MAX(\`id\`), 0) AS \`maxId\` FROM \`${table}\``)) as { count: string | number; maxId: string | number }[];
    appendOnly[table] = { count: Number(row?.count ?? 0), maxId: Number(row?.maxId ?? 0) };
  }
  return { migrations: migrations.map((m) => m.name), triggers: triggers.map((t) => t.name), appendOnly };
}

export async function createBackup(db: Config['db'], store: FileStore, file: string): Promise<BackupSummary> {
  if (existsSync(file)) throw new BackupRefused(`${file} already exists; a backup never overwrites a file (choose a new name)`);
  // Staged beside FILE, so the finished archive is renamed into place (never a half-written FILE).
  const staging = await fs.mkdtemp(path.join(path.dirname(file), `.${path.basename(file)}.partial-`));
  try {
    const root = path.join(staging, BACKUP_FOLDER);
    await fs.mkdir(root);
    const dataSource = createDataSource({ ...db, poolSize: 1 });
    await dataSource.initialize();
    let facts: DatabaseFacts;
    try {
      facts = await databaseFacts(dataSource);
    } finally {
      await dataSource.destroy();
    }
    const dumpFile = path.join(root, DUMP_NAME);
    await dumpDatabase(db, dumpFile, TRANSIENT_TABLES);
    const dump = await sha256OfFile(dumpFile);

    const files: BackupManifest['files'] = [];
    for (const sha256 of (await store.list()).sort()) {
      const bytes = await store.get(sha256); // checked against its name: a damaged file fails the backup
      const target = path.join(root, FILES_FOLDER, 'sha256', sha256.slice(0, 2), sha256);
      await fs.mkdir(path.dirname(target), { recursive: true });
      await fs.writeFile(target, bytes);
      files.push({ sha256, bytes: bytes.length });
    }
    const manifest: BackupManifest = {
      format: 'loopwright-backup',
      formatVersion: 1,
      createdAt: new Date().toISOString(),
      database: { name: db.database, dumpSha256: dump.sha256, dumpBytes: dump.bytes, ...facts },
      files,
    };
    await fs.writeFile(path.join(root, MANIFEST_NAME), `${JSON.stringify(manifest, null, 2)}\n`);

    const archive = path.join(staging, 'backup.tar.gz');
    await createTar({ gzip: true, file: archive, cwd: staging, portable: true }, [BACKUP_FOLDER]);
    const { sha256, bytes } = await sha256OfFile(archive);
    await fs.rename(archive, file);
    const checksumFile = `${file}.sha256`;
    await fs.writeFile(checksumFile, checksumLine(sha256, path.basename(file)));
    return {
      file,
      sha256,
      bytes,
      checksumFile,
      database: db.database,
      releases: facts.appendOnly.releases.count,
      auditEntries: facts.appendOnly.audit_entries.count,
      storedFiles: files.length,
    };
  } finally {
    await fs.rm(staging, { recursive: true, force: true });
  }
}
