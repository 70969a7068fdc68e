/**
 * Runs one package's benchmark function and prints its result as JSON on stdout. The root bench
 * starts it in the package's own folder so tsx reads that package's tsconfig (the API's TypeORM
 * entities need its decorator settings).
 */
import path from 'node:path';
import { pathToFileURL } from 'node:url';

const [modulePath, exportName] = process.argv.slice(2);
if (!modulePath || !exportName) throw new Error('usage: run-bench.ts MODULE EXPORT');
const mod = (await import(pathToFileURL(path.resolve(modulePath)).href)) as Record<string, unknown>;
const fn = mod[exportName];
if (typeof fn !== 'function') throw new Error(`${modulePath} does not export ${exportName}`);
const result: unknown = await (fn as () => Promise<unknown>)();
process.stdout.write(`${JSON.stringify(result)}\n`);
process.exit(0);
