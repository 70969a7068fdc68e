/// <reference types="node" />
import fs from 'node:fs/promises';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

const SRC = path.resolve(import.meta.dirname, '../src');

/** Every module index.ts pulls in, following relative imports (the browser bundles all of them). */
async function importClosure(file: string, seen = new Set<string>()): Promise<{ files: Set<string>; packages: Set<string> }> {
  const packages = new Set<string>();
  seen.add(file);
  const text = await fs.readFile(file, 'utf8');
  for (const match of text.matchAll(/^\s*(?:import|export)\s[^'"]*?from\s+'([^']+)'/gm)) {
    const spec = match[1]!;
    if (spec.startsWith('.')) {
      const next = path.resolve(path.dirname(file), spec);
      if (!seen.has(next)) for (const p of (await importClosure(next, seen)).packages) packages.add(p);
    } else {
      packages.add(spec);
    }
  }
  return { files: seen, packages };
}

describe('the contract package', () => {
  it('imports only browser-safe packages (zod and the dsp library), so the app can bundle it', async () => {
    const { files, packages } = await importClosure(path.join(SRC, 'index.ts'));
    expect(files.size).toBeGreaterThan(1);
    expect([...packages].sort()).toEqual(['@loopwright/dsp', 'zod']);
  });

  it('reaches every module of src/ from index.ts, so nothing is defined here that the package does not export', async () => {
    const { files } = await importClosure(path.join(SRC, 'index.ts'));
    const all = (await fs.readdir(SRC)).filter((f) => f.endsWith('.ts')).map((f) => path.join(SRC, f));
    expect([...files].sort()).toEqual(all.sort());
  });
});
