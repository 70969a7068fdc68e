/**
 * The backup file: a gzipped tar archive (node-tar) of one folder,
 *
 *   loopwright-backup/backup.json          what is inside, with the SHA-256 of every member
 *   loopwright-backup/database.sql         mariadb-dump of the database (schema, rows, triggers)
 *   loopwright-backup/files/sha256/xx/<h>  the release file store, as storage/fileStore.ts lays it out
 *
 * and beside it `FILE.sha256`, the archive's own SHA-256 in the format of sha256sum(1), so a copy can
 * be checked with `sha256sum -c` before anything is restored from it.
 */
import { createHash } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { z } from 'zod';

export const BACKUP_FOLDER = 'loopwright-backup';
export const MANIFEST_NAME = 'backup.json';
export const DUMP_NAME = 'database.sql';
export const FILES_FOLDER = 'files';

/**
 * Tables whose rows are only ever added (triggers refuse DELETE, migrations in src/migration and
 * src/releases/migration): every id up to the largest one read before the dump must be in a
 * restore, which is how restore proves the record — the audit trail above all — is complete.
 */
export const APPEND_ONLY_TABLES = ['audit_entries', 'releases', 'release_files', 'release_downloads'] as const;

/** Rows a restore does without: sign-in sessions and rate-limit counters (the tables are kept, empty). */
export const TRANSIENT_TABLES = ['sessions', 'rate_limit_hits'] as const;

const sha256Schema = z.string().regex(/^[0-9a-f]{64}$/);
const tallySchema = z.strictObject({ count: z.number().int().min(0), maxId: z.number().int().min(0) });

export const backupManifestSchema = z.strictObject({
  format: z.literal('loopwright-backup'),
  formatVersion: z.literal(1),
  createdAt: z.string(),
  database: z.strictObject({
    name: z.string(),
    dumpSha256: sha256Schema,
    dumpBytes: z.number().int().min(0),
    /** The migrations the database had (their names, in order). */
    migrations: z.array(z.string()),
    triggers: z.array(z.string()),
    /** Count and largest id of each append-only table, read just before the dump began. */
    appendOnly: z.record(z.enum(APPEND_ONLY_TABLES), tallySchema),
  }),
  files: z.array(z.strictObject({ sha256: sha256Schema, bytes: z.number().int().min(0) })),
});
export type BackupManifest = z.infer<typeof backupManifestSchema>;
export type Tally = z.infer<typeof tallySchema>;

export async function sha256OfFile(file: string): Promise<{ sha256: string; bytes: number }> {
  const hash = createHash('sha256');
  let bytes = 0;
  for await (const chunk of createReadStream(file)) {
    hash.update(chunk as Buffer);
    bytes += (chunk as Buffer).length;
  }
  return { sha256: hash.digest('hex'), bytes };
}

/** The line sha256sum(1) writes and `sha256sum -c` reads: the hash, two spaces, the file name. */
export function checksumLine(sha256: string, fileName: string): string {
  return `${sha256}  ${fileName}\n`;
}

export function parseChecksumLine(text: string): string | null {
  return /^([0-9a-f]{64}) [ *]/.exec(text.trim())?.[1] ?? null;
}
