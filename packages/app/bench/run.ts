/** `TSX_TSCONFIG_PATH=packages/api/tsconfig.json pnpm exec tsx packages/app/bench/run.ts`: print the app figures. */
import { runAppBench } from './bench.ts';

process.stdout.write(`${JSON.stringify(await runAppBench(), null, 2)}\n`);
