/**
 * The files of a release (or the one named) with their bytes, each checked against its SHA-256: from
 * the file store, or from the row for releases cut before the store existed.
 */
import type { EntityManager } from 'typeorm';
import { sha256Hex } from '../render/digest.ts';
import { StoredFileError, type FileStore } from '../storage/fileStore.ts';
import type { FileRow } from './records.ts';
import { fileRowsWithContent } from './repository.ts';

export async function releaseFileBytes(manager: EntityManager, files: FileStore, releaseId: number, name?: string): Promise<(FileRow & { content: Buffer })[]> {
  const rows = await fileRowsWithContent(manager, releaseId, name);
  return Promise.all(
    rows.map(async (row) => {
      if (row.content === null) return { ...row, content: await files.get(row.sha256) };
      const content = Buffer.from(row.content);
      if (sha256Hex(content) !== row.sha256) throw new StoredFileError('corrupt', row.sha256, `stored file ${row.sha256} failed its SHA-256 check (its bytes in the database were altered)`);
      return { ...row, content };
    }),
  );
}
