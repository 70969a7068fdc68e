/**
 * The dependency check of `npm test` (scripts/lib/dependency-check.ts) on a copy of this repository:
 * it passes on the copy as it is, and fails naming the package and the dependency when one is planted
 * that nothing uses, or when a Vue file, a vitest config or a tsx script imports a package its own
 * package.json does not declare. csv-parse is the planted name: installed (the API declares it), so
 * only the declaration decides.
 */
import { execFileSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import fs from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runDependencyCheck } from '../../scripts/lib/dependency-check.ts';
import { ROOT } from '../../scripts/lib/process.ts';

const PLANTED = 'csv-parse';
let copy = '';
const originals = new Map<string, string>();

/** The repository's files (committed or new, not ignored) in a temporary folder, sharing node_modules. */
async function copyRepository(): Promise<string> {
  const dir = await fs.mkdtemp(path.join(os.tmpdir(), 'loopwright-deps-'));
  const files = execFileSync('git', ['ls-files', '-z', '--cached', '--others', '--exclude-standard'], { cwd: ROOT, encoding: 'utf8' })
    .split('\0')
    .filter((f) => f !== '' && existsSync(path.join(ROOT, f)));
  for (const file of files) {
    await fs.mkdir(path.dirname(path.join(dir, file)), { recursive: true });
    await fs.copyFile(path.join(ROOT, file), path.join(dir, file));
  }
  for (const pkg of ['.', ...(await fs.readdir(path.join(ROOT, 'packages'))).map((p) => path.join('packages', p))]) {
    const modules = path.join(ROOT, pkg, 'node_modules');
    if (existsSync(modules)) await fs.symlink(modules, path.join(dir, pkg, 'node_modules'), 'dir');
  }
  return dir;
}

async function plant(file: string, change: (text: string) => string): Promise<void> {
  const full = path.join(copy, file);
  const text = await fs.readFile(full, 'utf8');
  if (!originals.has(file)) originals.set(file, text);
  const changed = change(text);
  expect(changed).not.toBe(text);
  await fs.writeFile(full, changed);
}

async function restore(): Promise<void> {
  for (const [file, text] of originals) await fs.writeFile(path.join(copy, file), text);
  originals.clear();
}

describe('the dependency check (Knip over the workspace)', () => {
  beforeAll(async () => {
    copy = await copyRepository();
  });
  afterAll(async () => {
    if (copy) await fs.rm(copy, { recursive: true, force: true });
  });

  it('passes on the repository as it is', () => {
    const run = runDependencyCheck(copy);
    expect(run.issues).toEqual([]);
    expect(run.status).toBe(0);
  });

  it('fails naming a dependency that a package declares and nothing imports', async () => {
    await plant('packages/dsp/package.json', (text) => text.replace('"dependencies": {', `"dependencies": {\n    "${PLANTED}": "7.0.3",`));
    try {
      const run = runDependencyCheck(copy);
      expect(run.issues).toEqual([{ file: 'packages/dsp/package.json', kind: 'dependencies', name: PLANTED }]);
      expect(run.status).toBe(1);
    } finally {
      await restore();
    }
  });

  it('fails naming each undeclared import: in a Vue file, a vitest config and a script run by tsx', async () => {
    const importLine = `import '${PLANTED}/sync';\n`;
    await plant('packages/app/src/App.vue', (text) => text.replace('<script setup lang="ts">\n', `<script setup lang="ts">\n${importLine}`));
    await plant('packages/dsp/vitest.config.ts', (text) => importLine + text);
    await plant('scripts/bench.ts', (text) => text.replace("import { spawn } from 'node:child_process';\n", `import { spawn } from 'node:child_process';\n${importLine}`));
    try {
      const run = runDependencyCheck(copy);
      expect([...run.issues].sort((a, b) => a.file.localeCompare(b.file))).toEqual([
        { file: 'packages/app/src/App.vue', kind: 'unlisted', name: PLANTED },
        { file: 'packages/dsp/vitest.config.ts', kind: 'unlisted', name: PLANTED },
        { file: 'scripts/bench.ts', kind: 'unlisted', name: PLANTED },
      ]);
      expect(run.status).toBe(1);
    } finally {
      await restore();
    }
  });
});
