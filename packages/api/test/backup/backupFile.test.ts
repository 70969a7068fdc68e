/**
 * The pieces of a backup that are ours rather than MariaDB's or node-tar's: the checksum line and the
 * DEFINER filter a restore runs the dump through. The whole backup and restore, on the real stack with
 * a second MariaDB, is tests/faults/backup.fault.test.ts.
 */
import { spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Readable } from 'node:stream';
import { text } from 'node:stream/consumers';
import { describe, expect, it } from 'vitest';
import { checksumLine, parseChecksumLine } from '../../src/backup/backupFile.ts';
import { withoutDefiners } from '../../src/backup/restore.ts';

/** A trigger as mariadb-dump 10.11 writes it (copied from a dump of our schema). */
const TRIGGER = "/*!50003 CREATE*/ /*!50017 DEFINER=`loopwright`@`127.0.0.1`*/ /*!50003 TRIGGER `audit_entries_no_update` BEFORE UPDATE ON `audit_entries` FOR EACH ROW SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'audit_entries is append-only' */;;";

describe('the checksum beside a backup', () => {
  it('is what sha256sum -c checks (GNU coreutils)', () => {
    const dir = mkdtempSync(join(tmpdir(), 'lw-sum-'));
    try {
      writeFileSync(join(dir, 'b.tgz'), 'backup bytes');
      // A wrong hash first: coreutils must refuse it, so the check below can fail.
      writeFileSync(join(dir, 'b.tgz.sha256'), checksumLine('0'.repeat(64), 'b.tgz'));
      expect(spawnSync('sha256sum', ['-c', 'b.tgz.sha256'], { cwd: dir, encoding: 'utf8' }).status).toBe(1);
      writeFileSync(join(dir, 'b.tgz.sha256'), checksumLine(createHash('sha256').update('backup bytes').digest('hex'), 'b.tgz'));
      expect(spawnSync('sha256sum', ['-c', 'b.tgz.sha256'], { cwd: dir, encoding: 'utf8' }).stdout.trim()).toBe('b.tgz: OK');
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it('reads a sha256sum line, text or binary mode, and nothing else', () => {
    const sha = 'a'.repeat(64);
    expect(parseChecksumLine(`${sha}  b.tgz\n`)).toBe(sha);
    expect(parseChecksumLine(`${sha} *b.tgz`)).toBe(sha);
    expect(parseChecksumLine(`${'a'.repeat(63)}  b.tgz`)).toBeNull();
    expect(parseChecksumLine('not a checksum')).toBeNull();
  });
});

describe('the DEFINER filter of restore', () => {
  it('drops only the DEFINER clause of a trigger, whatever the chunks', async () => {
    const dump = `-- header\nINSERT INTO \`audit_entries\` VALUES (1,'DEFINER=\`x\`@\`y\`');\n${TRIGGER}\nDELIMITER ;\n`;
    const expected = dump.replace('/*!50017 DEFINER=`loopwright`@`127.0.0.1`*/ ', '');
    expect(expected).not.toBe(dump);
    for (const size of [1, 7, 64, dump.length]) {
      const chunks = Array.from({ length: Math.ceil(dump.length / size) }, (_, i) => Buffer.from(dump.slice(i * size, (i + 1) * size)));
      expect(await text(Readable.from(chunks).pipe(withoutDefiners()))).toBe(expected);
    }
  });
});
