import fs from 'node:fs/promises';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { useTestApp } from './helpers.ts';

const testApp = useTestApp();

describe('README', () => {
  it('lists every route of the route table with its method', async () => {
    const readme = await fs.readFile(path.resolve(import.meta.dirname, '../README.md'), 'utf8');
    const missing = testApp.built.routes.filter((r) => !readme.includes(`| ${r.method.toUpperCase()} | \`/api${r.path}\` |`)).map((r) => `${r.method.toUpperCase()} /api${r.path}`);
    expect(missing).toEqual([]);
  });

  it('documents every environment variable the configuration reads', async () => {
    const readme = await fs.readFile(path.resolve(import.meta.dirname, '../README.md'), 'utf8');
    const config = await fs.readFile(path.resolve(import.meta.dirname, '../src/config.ts'), 'utf8');
    const keys = [...config.matchAll(/^\s+((?:LW_|NODE_ENV|PORT)[A-Z_]*):/gm)].map((m) => m[1]);
    expect(keys.length).toBeGreaterThan(10);
    expect(keys.filter((key) => !readme.includes(`\`${key}\``))).toEqual([]);
  });
});
