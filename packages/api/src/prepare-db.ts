/**
 * `node --import tsx src/prepare-db.ts`: migrate the database named by LW_DB_* and seed the demo
 * scenario if it is empty. Used by `npm start`.
 */
import { describeDefaults, loadConfig } from './config.ts';
import { createDataSource, runMigrations } from './data-source.ts';
import { DEMO_ACCOUNTS, DEMO_PASSWORD, seedDemo } from './seed.ts';

const config = loadConfig();
for (const line of describeDefaults(config).filter((l) => l.startsWith('LW_DB'))) process.stdout.write(`loopwright-api: ${line}\n`);
const dataSource = createDataSource(config.db);
await dataSource.initialize();
try {
  await runMigrations(dataSource);
  const result = await seedDemo(dataSource, config.bcryptRounds);
  if (result.seeded) {
    process.stdout.write(`loopwright-api: demo data seeded; accounts ${DEMO_ACCOUNTS.map((a) => a.email).join(', ')} (password '${DEMO_PASSWORD}')\n`);
  } else {
    process.stdout.write(`loopwright-api: demo seed skipped (${result.reason})\n`);
  }
} finally {
  await dataSource.destroy();
}
