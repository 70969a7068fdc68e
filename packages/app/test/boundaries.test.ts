import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

const APP = path.resolve(import.meta.dirname, '..');
const API = path.resolve(APP, '../api');

function sourceFiles(dir: string): string[] {
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((entry) => {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) return entry.name === 'node_modules' ? [] : sourceFiles(full);
    return /\.(ts|vue|mjs)$/.test(entry.name) ? [full] : [];
  });
}

/** Module specifiers of static and dynamic imports and re-exports. */
function specifiers(text: string): string[] {
  const found = [...text.matchAll(/(?:\bfrom\s*|\bimport\s*\(\s*|^\s*import\s+)['"]([^'"]+)['"]/gm)].map((m) => m[1]!);
  return [...found, ...[...text.matchAll(/new URL\(\s*['"]([^'"]+)['"]/g)].map((m) => m[1]!)];
}

/** The API package is the server: the app reaches it over HTTP only, and shares types through @loopwright/contract. */
function reachesApi(file: string, spec: string): boolean {
  if (spec === '@loopwright/api' || spec.startsWith('@loopwright/api/')) return true;
  if (!spec.startsWith('.')) return false;
  const target = path.resolve(path.dirname(file), spec);
  return target === API || target.startsWith(`${API}${path.sep}`);
}

describe('the app package', () => {
  it('never imports the API package, by name or by path', () => {
    const files = ['src', 'test', 'bench'].flatMap((d) => sourceFiles(path.join(APP, d)));
    expect(files.length).toBeGreaterThan(50);
    const offending = files.flatMap((file) => specifiers(fs.readFileSync(file, 'utf8')).filter((s) => reachesApi(file, s)).map((s) => `${path.relative(APP, file)}: ${s}`));
    expect(offending).toEqual([]);
  });

  it('depends on the contract package by name and not on the API package', () => {
    const pkg = JSON.parse(fs.readFileSync(path.join(APP, 'package.json'), 'utf8')) as Record<string, Record<string, string> | undefined>;
    const deps = { ...pkg['dependencies'], ...pkg['devDependencies'] };
    expect(deps['@loopwright/contract']).toBe('workspace:*');
    expect(Object.keys(deps)).not.toContain('@loopwright/api');
  });

  it('recognises an import of the API by relative path (the check above can fail)', () => {
    const file = path.join(APP, 'src/api/types.ts');
    expect(reachesApi(file, '../../../api/src/contract.ts')).toBe(true);
    expect(reachesApi(file, '@loopwright/api')).toBe(true);
    expect(reachesApi(file, '@loopwright/contract')).toBe(false);
    expect(reachesApi(file, './client.ts')).toBe(false);
  });
});
