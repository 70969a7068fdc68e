/**
 * `loopwright backup FILE` and `restore FILE`: the database named by LW_DB_* and the release file
 * store, which must be named (LW_FILE_STORE_DIR, or LW_DATA_DIR whose files/ it is): a backup that
 * guessed the folder could leave the release files out without anyone noticing.
 */
import { join } from 'node:path';
import { BackupRefused, createBackup } from '../backup/backup.ts';
import { MariaDbProgramError } from '../backup/mariadbPrograms.ts';
import { restoreBackup } from '../backup/restore.ts';
import { ConfigError, loadConfig, type Config } from '../config.ts';
import { isDatabaseUnavailable } from '../middleware/errors.ts';
import { FileStore } from '../storage/fileStore.ts';
import { toJson } from './commands.ts';
import { resolveUserPath, UsageError } from './input.ts';

function settings(env: NodeJS.ProcessEnv): { db: Config['db']; store: FileStore } {
  let config: Config;
  try {
    config = loadConfig(env);
  } catch (err) {
    if (err instanceof ConfigError) throw new UsageError(err.message.replace(/\s*\n\s*/g, ' '));
    throw err;
  }
  const storeDir = env.LW_FILE_STORE_DIR ?? (env.LW_DATA_DIR ? join(env.LW_DATA_DIR, 'files') : undefined);
  if (!storeDir) throw new UsageError("set LW_FILE_STORE_DIR (or LW_DATA_DIR) to the server's release file store, as the server runs with it");
  return { db: config.db, store: new FileStore(resolveUserPath(storeDir, env)) };
}

async function refusalsAsUsage<T>(db: Config['db'], work: () => Promise<T>): Promise<T> {
  try {
    return await work();
  } catch (err) {
    if (err instanceof BackupRefused || err instanceof MariaDbProgramError) throw new UsageError(err.message);
    if (isDatabaseUnavailable(err)) {
      throw new UsageError(`cannot reach database ${db.database} on ${db.host}:${db.port} (${(err as Error).message}); set LW_DB_HOST, LW_DB_PORT, LW_DB_USER, LW_DB_PASSWORD and LW_DB_NAME as the server runs with them`);
    }
    throw err;
  }
}

export async function backupCommand(file: string, env: NodeJS.ProcessEnv = process.env): Promise<string> {
  const { db, store } = settings(env);
  return toJson(await refusalsAsUsage(db, () => createBackup(db, store, resolveUserPath(file, env))));
}

export async function restoreCommand(file: string, env: NodeJS.ProcessEnv = process.env): Promise<string> {
  const { db, store } = settings(env);
  return toJson(await refusalsAsUsage(db, () => restoreBackup(db, store, resolveUserPath(file, env))));
}
