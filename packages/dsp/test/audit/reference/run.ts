/** Runs the audit's own SciPy script (reference/audit_reference.py, Debian python3-scipy) on one JSON document. */
import { fileURLToPath } from 'node:url';
import { runPythonReference } from '../../reference/scipy.ts';

export function runAuditReference<T>(data: unknown): T {
  return runPythonReference('audit reference', fileURLToPath(new URL('./audit_reference.py', import.meta.url)), data);
}
