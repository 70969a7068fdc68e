import path from 'node:path';
import { fileURLToPath } from 'node:url';

export const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../..');
export const APP_DIR = path.join(ROOT, 'packages', 'app');
export const APP_DIST = path.join(APP_DIR, 'dist');
export const SCREENSHOTS = path.join(ROOT, 'test-results', 'screenshots');
