import { execFile } from 'node:child_process';
import path from 'node:path';
import { promisify } from 'node:util';
import { describe, expect, it } from 'vitest';
import { dbEnv } from '../src/config.ts';
import { testDb } from './helpers.ts';

const execFileAsync = promisify(execFile);
const API_DIR = path.resolve(import.meta.dirname, '..');

describe('migrations and entities', () => {
  it('match: TypeORM migration:generate --check finds no schema drift after the migrations ran', async () => {
    const db = testDb();
    const { stdout } = await execFileAsync(
      process.execPath,
      ['--import', 'tsx', './node_modules/typeorm/cli.js', 'migration:generate', '--check', '-d', 'src/data-source.ts', 'src/migration/DriftCheck'],
      {
        cwd: API_DIR,
        timeout: 60_000,
        env: { ...process.env, ...dbEnv(db) },
      },
    );
    // The CLI exits 1 (execFile rejects) and prints the would-be migration when entities drifted.
    expect(stdout).toMatch(/No changes in database schema were found/);
  });
});
