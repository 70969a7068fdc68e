import { spawnSync } from 'node:child_process';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { ROOT } from '../../scripts/lib/process.ts';

describe('the bootstrap behind the README commands', () => {
  it('names an unknown command in one line on stderr and exits non-zero', () => {
    const run = spawnSync(process.execPath, [path.join(ROOT, 'scripts/bootstrap.mjs'), 'deploy'], { encoding: 'utf8' });
    expect(run.status).toBe(1);
    expect(run.stdout).toBe('');
    expect(run.stderr.trim()).toBe("loopwright: error: unknown command 'deploy'; use start, test, bench or loopwright");
  });

  it('keeps stdout clean for the terminal commands when nothing needs installing', () => {
    const run = spawnSync(process.execPath, [path.join(ROOT, 'scripts/bootstrap.mjs'), 'loopwright', 'design', '/nonexistent/spec.json'], { encoding: 'utf8', cwd: ROOT });
    expect(run.stdout).toBe('');
    expect(run.status).not.toBe(0);
    expect(run.stderr).toMatch(/spec\.json/);
  });
});
