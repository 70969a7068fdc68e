/// <reference types="node" />
/**
 * Run the committed SciPy reference script (test/reference/scipy_reference.py) with Debian's
 * /usr/bin/python3 + python3-scipy (REFERENCES.md) on one JSON document. Fails — never skips — with a
 * clear message when Python or SciPy is missing.
 */
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';

const SCRIPT = fileURLToPath(new URL('./scipy_reference.py', import.meta.url));
const PYTHON = '/usr/bin/python3';

export function runScipyReference<T>(data: unknown): T {
  const r = spawnSync(PYTHON, [SCRIPT], { input: JSON.stringify(data), encoding: 'utf8', maxBuffer: 256 * 1024 * 1024 });
  if (r.error) throw new Error(`SciPy reference: cannot run ${PYTHON} (${r.error.message}); install python3-scipy (Debian)`);
  if (r.status !== 0) {
    const missing = /No module named '?(numpy|scipy)/.test(r.stderr);
    throw new Error(
      missing
        ? `SciPy reference: python3-scipy is missing (apt-get install python3-scipy): ${r.stderr.trim()}`
        : `SciPy reference script failed (exit ${r.status}): ${r.stderr.trim()}`,
    );
  }
  return JSON.parse(r.stdout) as T;
}
