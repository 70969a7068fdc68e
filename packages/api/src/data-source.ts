import 'reflect-metadata';
import { DataSource } from 'typeorm';
import { loadConfig, type Config } from './config.ts';
import { coreEntities } from './entities/index.ts';
import { coreMigrations } from './migration/index.ts';
import { releaseEntities } from './releases/entities/index.ts';
import { releaseMigrations } from './releases/migration/index.ts';

export const entities = [...coreEntities, ...releaseEntities];
export const migrations = [...coreMigrations, ...releaseMigrations];

/**
 * MariaDB through TypeORM. The schema comes only from the migrations (never synchronize); type
 * 'mariadb' rather than 'mysql' or the schema diff reports false changes (STACK.md).
 */
export function createDataSource(db: Config['db']): DataSource {
  return new DataSource({
    type: 'mariadb',
    host: db.host,
    port: db.port,
    username: db.user,
    password: db.password,
    database: db.database,
    charset: 'utf8mb4_unicode_ci',
    timezone: 'Z',
    entities,
    migrations,
    migrationsTableName: 'migrations',
    synchronize: false,
    migrationsRun: false,
    logging: false, // failed queries would print their parameters (hashes, e-mails); errors are logged by the API
    poolSize: db.poolSize,
    connectTimeout: db.connectTimeoutMs,
    extra: {
      // A killed server must fail requests quickly, not queue them forever: the API answers 503.
      waitForConnections: true,
      queueLimit: 500,
      enableKeepAlive: true,
      // No captured call-site stack per query: it costs an Error per query and never reaches a client.
      trace: false,
    },
  });
}

/** Run pending migrations inside one transaction per migration. */
export async function runMigrations(dataSource: DataSource): Promise<void> {
  await dataSource.runMigrations({ transaction: 'each' });
}

/** The instance the TypeORM CLI loads (migration:generate / migration:run), configured from the env. */
export const cliDataSource = createDataSource(loadConfig().db);
