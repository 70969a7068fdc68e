/**
 * Serve the built app with a fresh demo database for looking at it by hand:
 * `pnpm exec tsx tests/e2e/serve.ts` (after building packages/app); Ctrl-C stops it.
 */
import { startStack } from './harness/stack.ts';

const stack = await startStack();
process.stdout.write(`Loopwright (e2e stack) at ${stack.baseUrl}; SMTP fake on port ${stack.mail.port}\n`);
const stop = () => void stack.stop().finally(() => process.exit(0));
process.once('SIGINT', stop);
process.once('SIGTERM', stop);
