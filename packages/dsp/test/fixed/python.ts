/// <reference types="node" />
/**
 * Run a snippet of Python (Debian's /usr/bin/python3 with numpy/scipy, the project's reference library,
 * REFERENCES.md) on a JSON input and parse its JSON output. The snippet reads `data` and sets `out`.
 */
import { execFileSync } from 'node:child_process';

export function python<T>(snippet: string, data: unknown): T {
  const program = `import json, sys\ndata = json.load(sys.stdin)\n${snippet}\nprint(json.dumps(out))\n`;
  const stdout = execFileSync('/usr/bin/python3', ['-c', program], { input: JSON.stringify(data), encoding: 'utf8' });
  return JSON.parse(stdout) as T;
}
