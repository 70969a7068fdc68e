/// <reference types="node" />
/**
 * Run a committed SciPy reference script with Debian's /usr/bin/python3 + python3-scipy (REFERENCES.md)
 * on one JSON document: the dsp tests' (reference/scipy_reference.py) and the audit's
 * (audit/reference/audit_reference.py), which share reference/loop_formulas.py. Fails — never skips —
 * with a clear message when Python or SciPy is missing.
 */
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';

const PYTHON = '/usr/bin/python3';

/** Run `script` (a path) on `data`; NaN and ±Infinity in its answer become null. */
export function runPythonReference<T>(label: string, script: string, data: unknown): T {
  const r = spawnSync(PYTHON, [script], { input: JSON.stringify(data), encoding: 'utf8', maxBuffer: 256 * 1024 * 1024 });
  if (r.error) throw new Error(`${label}: cannot run ${PYTHON} (${r.error.message}); install python3-scipy (Debian)`);
  if (r.status !== 0) {
    const missing = /No module named '?(numpy|scipy)/.test(r.stderr);
    throw new Error(
      missing
        ? `${label}: python3-scipy is missing (apt-get install python3-scipy): ${r.stderr.trim()}`
        : `${label} script failed (exit ${r.status}): ${r.stderr.trim()}`,
    );
  }
  return JSON.parse(r.stdout.replace(/\bNaN\b/g, 'null').replace(/-?Infinity\b/g, 'null')) as T;
}

export function runScipyReference<T>(data: unknown): T {
  return runPythonReference('SciPy reference', fileURLToPath(new URL('./scipy_reference.py', import.meta.url)), data);
}
