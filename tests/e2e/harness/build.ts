import { spawnSync } from 'node:child_process';
import { APP_DIR } from './paths.ts';

/** Build the web app with vite, as the product serves it. */
export function buildApp(): void {
  const result = spawnSync('pnpm', ['exec', 'vite', 'build', '--logLevel', 'warn'], { cwd: APP_DIR, stdio: 'inherit' });
  if (result.status !== 0) throw new Error(`vite build failed (exit ${result.status})`);
}
