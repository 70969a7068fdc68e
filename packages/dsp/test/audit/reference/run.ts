/// <reference types="node" />
/**
 * Runs the audit's own SciPy script (reference/audit_reference.py, Debian python3-scipy) on one JSON
 * document. Fails with a clear message — never skips — when Python or SciPy is missing.
 */
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';

const SCRIPT = fileURLToPath(new URL('./audit_reference.py', import.meta.url));
const PYTHON = '/usr/bin/python3';

export function runAuditReference<T>(data: unknown): T {
  const r = spawnSync(PYTHON, [SCRIPT], { input: JSON.stringify(data), encoding: 'utf8', maxBuffer: 256 * 1024 * 1024 });
  if (r.error) throw new Error(`audit reference: cannot run ${PYTHON} (${r.error.message}); install python3-scipy`);
  if (r.status !== 0) throw new Error(`audit reference script failed (exit ${r.status}): ${r.stderr.trim()}`);
  return JSON.parse(r.stdout.replace(/\bNaN\b/g, 'null').replace(/-?Infinity\b/g, 'null')) as T;
}
